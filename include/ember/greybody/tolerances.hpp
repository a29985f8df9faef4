// Every tolerance of the greybody module, in one place, with the rule it enforces.
// Units: G = c = hbar = M = 1 (see mode.hpp).
#pragma once

namespace ember::greybody::tolerance {

// ODE integration (Boost.Odeint, Runge-Kutta-Fehlberg 7(8)): a step is accepted when its error
// estimate is below abs + rel * |state|, componentwise. The fine solve uses `ode_relative`, the
// check solve 100 times looser; their difference is part of the reported error.
inline constexpr double ode_relative = 1e-11;
inline constexpr double ode_check_factor = 100.0;
inline constexpr double ode_absolute_fraction = 1e-3;  // abs = rel * this (|psi| starts at 1)

// Start of integration near the horizon: the first-order correction delta = V/(kappa^2 - 2 i omega
// kappa) is included, so the start is moved inward until |delta| < this; the neglected
// second-order term is then ~ delta^2.
inline constexpr double horizon_correction = 1e-8;

// Matching to the asymptotic series e^{+-i omega r*} sum c_n r^-n far out: the matching radius is
// doubled until the smallest term of the series is below this (its truncation error).
inline constexpr double series_truncation = 1e-13;
inline constexpr int series_max_terms = 80;

// Tabulation: an (s, l) mode is tabulated up to the x where 1 - Gamma < this (Gamma = 1 beyond),
inline constexpr double unit_transmission = 1e-14;
// and partial waves are added until a further l adds less than this fraction of the total power.
inline constexpr double power_fraction_cut = 1e-6;
// Interpolated values must match direct solves to this relative accuracy over the table's range.
inline constexpr double interpolation_relative = 1e-4;

// Highest x the direct solver takes. The wave oscillates ~x times per M of r*, so the step count
// grows as x (6e5 steps at x = 1e3, measured); far above the barrier Gamma = 1 to within
// |R|^2 ~ 1e-27 already at x = 100 (measured), which the tables use instead.
inline constexpr double solver_max_x = 1e3;

// Spin-weighted spheroidal separation constants (spheroidal.hpp): the truncated spectral basis
// starts at the mode's index + |c| + `spheroidal_initial_terms` and grows by
// `spheroidal_step_terms` until the eigenvalue changes by less than
// `spheroidal_change` * max(1, |A|) (or by less than its rounding floor); a basis that would pass
// `spheroidal_max_terms` is a failure. The coefficients fall off faster than geometrically once
// the basis is past |c| (common practice), so the last change bounds what is left.
inline constexpr double spheroidal_change = 1e-12;
inline constexpr int spheroidal_initial_terms = 8;
inline constexpr int spheroidal_step_terms = 4;
inline constexpr int spheroidal_max_terms = 400;
// Rounding floor of a symmetric eigensolve: this many machine epsilons times the matrix's
// infinity norm (backward stability of the QR iteration, common practice).
inline constexpr double spheroidal_rounding_epsilons = 8.0;

// Kerr radial solver (kerr_solver.hpp): the horizon series is summed until four terms in a row
// fall below this fraction of the sum; it starts at z = r - r_+ = `kerr_start_fraction` (r_+ - r_-),
// halved (at most `kerr_start_halvings` times) until the series converges in `kerr_series_terms`.
// Starting well inside the series' radius (r_+ - r_-) keeps the growth of the outgoing solution's
// share, (d / z)^s, small; a start closer in costs digits for s > 0.
inline constexpr double kerr_horizon_series = 1e-16;
inline constexpr double kerr_start_fraction = 0.25;
inline constexpr int kerr_start_halvings = 12;
inline constexpr int kerr_series_terms = 400;
// Closer than this to omega = m Omega_H (in |K_H|) the horizon series of an integer spin has a
// logarithm; the solver refuses such x (Gamma vanishes there).
inline constexpr double kerr_threshold_gap = 1e-9;

// Kerr emission integrals (kerr_emission.hpp): GSL QAGS to this relative accuracy, with this many
// subintervals at most, up to x = max(m Omega_H, 0) + `kerr_thermal_cut` T_H, where the thermal
// factor is e^-72 ~ 5e-32 of its value at the threshold (the Schwarzschild integrals stop at
// 8 pi x = 69, alike).
inline constexpr double kerr_quadrature_relative = 1e-9;
inline constexpr int kerr_quadrature_intervals = 200;
inline constexpr double kerr_thermal_cut = 72.0;
// A Kerr table row is accepted when its solve's error is below this relative share of Gamma (the
// solver itself calls 1e-6 converged; at x ~ 1e-3 on a spinning hole the far match lies at
// r ~ 1e6 M and a few rows come out at 1e-6 to 1e-5), ten times below the interpolation target.
inline constexpr double kerr_table_solve_relative = 1e-5;

}  // namespace ember::greybody::tolerance
