// Direct solution of the Teukolsky radial equation for the transmission probability
// Gamma_{s,l,m}(x, a*) of a massless field on a Kerr hole (units of kerr_mode.hpp: M = 1).
//
// Method. lambda comes from the spheroidal eigenvalue (spheroidal.hpp). The solution that is
// purely ingoing at the horizon starts from its convergent series (kerr_series.hpp) a fraction of
// r_+ - r_- out, is integrated outward in t = ln(r - r_+) with Boost.Odeint, and is decomposed far
// out into the asymptotic ingoing and outgoing series, R = B_inc R_in + B_ref R_out.
//
// Which spin weight. The equation is solved for spin weight +|s|: there the ingoing wave
// dominates both at the horizon (Delta^-s) and far out (r^-1 against r^(-2s-1)), so the incident
// amplitude is read off without cancellation at any frequency. (For -|s| it is the subdominant
// wave far out, and 2|s| log10(r) digits are lost; the option `spin_weight = -1` does that, as an
// independent check at moderate frequency.)
//
// From amplitudes to Gamma. For s != 0 |B_inc|^2 and |B_t|^2 are not fluxes by themselves. The
// Wronskian of R_s with Delta^{-s} conj(R_{-s}) is conserved, and R_{+s} follows from R_{-s} by
// the Teukolsky-Starobinsky map D^{2s} (D = d/dr - i K/Delta); comparing leading asymptotic
// coefficients at both ends gives (derived; the structure matches Teukolsky & Press, ApJ 193
// (1974) 443, from memory)
//   s = +|s|:  Gamma = Re[ (K_H - i s d/2)/omega (2 i omega)^{2s} / conj(Pi) ] |B_t / B_inc|^2,
//   s = -|s|:  Gamma = Re[ (K_H - i s d/2)/omega Pi / (-2 i omega)^{2s} ] |B_t / B_inc|^2,
//   Pi = prod_{j=0}^{2s-1} [(s - j) d - 2 i K_H],   d = r_+ - r_-,   K_H = 2 r_+ omega - a m,
// that is Gamma = (K_H/omega)|B_t/B_inc|^2 (s = 0), |B_t/B_inc|^2 (1/2), (omega/K_H)|..|^2 (1) and
// omega^3 / (K_H (K_H^2 + d^2/4)) |..|^2 (2) for +|s|. Bosons have Gamma < 0 where K_H < 0, that
// is omega < m Omega_H: superradiance. Spin 1/2 has Gamma > 0 always.
#pragma once

#include <optional>
#include <string>

#include "ember/core/estimate.hpp"
#include "ember/core/solve_status.hpp"
#include "ember/greybody/kerr_mode.hpp"
#include "ember/greybody/tolerances.hpp"

namespace ember::greybody {

struct KerrSolverOptions {
  // Step-error control of the fine solve; the check solve runs `check_factor` times looser.
  double ode_relative = tolerance::ode_relative;
  double check_factor = tolerance::ode_check_factor;
  // Horizon series: summed until four terms in a row are below this fraction of the sum.
  double horizon_series = tolerance::kerr_horizon_series;
  // Far matching: double the radius until both asymptotic series' smallest terms are below this.
  double series_truncation = tolerance::series_truncation;
  // +1: solve for spin weight +|s| (the default, see above); -1: for -|s|, a check.
  int spin_weight = 1;

  // Throws InputError naming the field and the rule it broke.
  void validate() const;
};

struct KerrSolveSummary {
  SolveStatus status = SolveStatus::converged;
  std::string message;
  long rhs_evaluations = 0;
  long steps = 0;
  double match_radius = 0;  // r (units of M) of the first decomposition
  double start_z = 0;       // r - r_+ where the horizon series handed over
  int horizon_terms = 0;
};

struct KerrTransmission {
  Estimate gamma;                     // Gamma, negative in superradiant boson modes
  Estimate separation;                // lambda of the radial equation
  bool superradiant = false;          // omega < m Omega_H
  double horizon_frequency = 0;       // k = omega - m Omega_H
  std::optional<double> reflection;   // |B_ref/B_inc|^2, spin 0 only (a flux there)
  std::optional<double> flux_defect;  // |Gamma + |R|^2 - 1|, spin 0 only
  KerrSolveSummary summary;
};

// Throws InputError for a hole spin outside [0, 1), x outside the solver's range (as
// solve_transmission), or x within 1e-9 of the superradiant threshold m Omega_H of an integer
// spin (where the series has a logarithm; Gamma = 0 there). NumericalError ("Kerr greybody
// solver") when the horizon series or the far series cannot be brought to their tolerances or
// the result is not finite.
KerrTransmission solve_kerr_transmission(const KerrMode& mode, double x, double hole_spin,
                                         const KerrSolverOptions& options = {});

}  // namespace ember::greybody
