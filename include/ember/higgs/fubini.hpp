// The O(4) bounce of a pure negative quartic, V = -|lambda| phi^4 / 4, in flat space.
//
// Units: phi in GeV, r in GeV^-1; the action is dimensionless.
//
// Analytic (Fubini, Nuovo Cim. A34 (1976) 521; Lipatov 1977): phi = sqrt(8/|lambda|) R/(r^2 + R^2)
// for any R, with S = 8 pi^2 / (3 |lambda|). The numerical solve integrates
//   phi'' + (3/r) phi' = V'(phi) = -|lambda| phi^3,  phi(0) = phi0, phi'(0) = 0,
// with Boost.Odeint (Runge-Kutta-Fehlberg 7(8)) together with S = 2 pi^2 int r^3 (phi'^2/2 + V) dr,
// adding the tail beyond the last radius analytically (phi ~ C/r^2 contributes C^2/R^2 (derived)).
#pragma once

#include "ember/core/estimate.hpp"
#include "ember/higgs/potential.hpp"

namespace ember::higgs {

double fubini_action(double lambda_abs);

// The quartic the unseeded Fubini bounce of size R sees, at mu = 1/R: the MS-bar lambda(mu) plus
// the Planck-suppressed operators evaluated at h = mu,
//   q = lambda(mu) + (2/3) lambda6 mu^2/Mbar^2 + (1/2) lambda8 mu^4/Mbar^4,
// so that V = q h^4/4 there (potential.hpp's operator normalisation).
double fubini_quartic(const StandardModelPotential& potential, double mu);

struct QuarticBounce {
  Estimate action;
  double radius = 0;  // R from phi0 = sqrt(8/|lambda|)/R
  long steps = 0;
};

QuarticBounce solve_quartic_bounce(double lambda_abs, double phi0, double relative_tolerance = 1e-12);

}  // namespace ember::higgs
