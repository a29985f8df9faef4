// The O(4) bounce of a pure negative quartic, V = -|lambda| phi^4 / 4, in flat space, and the
// first-order action of the Planck-suppressed operators on it.
//
// Units: phi in GeV, r in GeV^-1, mu in GeV; the action is dimensionless.
//
// Analytic (Fubini, Nuovo Cim. A34 (1976) 521; Lipatov 1977): phi = sqrt(8/|lambda|) R/(r^2 + R^2)
// for any R, with S = 8 pi^2 / (3 |lambda|). The numerical solve integrates
//   phi'' + (3/r) phi' = V'(phi) = -|lambda| phi^3,  phi(0) = phi0, phi'(0) = 0,
// with Boost.Odeint (Runge-Kutta-Fehlberg 7(8)) together with S = 2 pi^2 int r^3 (phi'^2/2 + V) dr,
// adding the tail beyond the last radius analytically (phi ~ C/r^2 contributes C^2/R^2 (derived)).
#pragma once

#include "ember/core/estimate.hpp"

namespace ember::higgs {

double fubini_action(double lambda_abs);

// The operators lambda6 h^6/(6 Mbar^2) + lambda8 h^8/(8 Mbar^4) (Mbar the reduced Planck mass,
// potential.hpp's normalisation) integrated over the Fubini profile of size R = 1/mu, which
// reaches h = sqrt(8/|lambda|) mu at its centre: their first-order addition to the action
// (derived in fubini.cpp),
//   Delta S = (64 pi^2/15) lambda6 mu^2/(Mbar^2 |lambda|^3) + (256 pi^2/21) lambda8 mu^4/(Mbar^4 |lambda|^4).
double operator_action(double lambda_abs, double mu, double lambda6, double lambda8);

struct QuarticBounce {
  Estimate action;
  double radius = 0;  // R from phi0 = sqrt(8/|lambda|)/R
  long steps = 0;
};

QuarticBounce solve_quartic_bounce(double lambda_abs, double phi0, double relative_tolerance = 1e-12);

}  // namespace ember::higgs
