// Direct solution of the radial wave equation for the transmission probability Gamma_{s,l}(x).
//
// Units: G = c = hbar = M = 1, x = M omega (see mode.hpp).
//
// Method: start just outside the horizon with the purely ingoing wave psi = e^{-i x r*} (plus its
// first-order correction), integrate outward in y = ln(r/2 - 1) with Boost.Odeint, and decompose
// the solution far out into the asymptotic series solutions e^{-+i x r*} sum c_n r^-n. With unit
// amplitude at the horizon, Gamma = 1/|A_in|^2 and |R|^2 = |A_out|^2/|A_in|^2: neither is formed
// as 1 - |R|^2, which would cancel away the digits of a small Gamma.
#pragma once

#include <string>

#include "ember/core/estimate.hpp"
#include "ember/core/solve_status.hpp"
#include "ember/greybody/mode.hpp"
#include "ember/greybody/tolerances.hpp"

namespace ember::greybody {

struct SolverOptions {
  // Step-error control: accept a step when err < rel |state| + rel * abs_fraction.
  double ode_relative = tolerance::ode_relative;
  // The check solve runs this many times looser; the two differ by about the fine solve's error.
  double check_factor = tolerance::ode_check_factor;
  // Horizon start: move inward until the first-order horizon correction is below this.
  double horizon_correction = tolerance::horizon_correction;
  // Far matching: double the radius until the asymptotic series' smallest term is below this.
  double series_truncation = tolerance::series_truncation;

  // Throws InputError naming the field and the rule it broke.
  void validate() const;
};

struct SolveSummary {
  SolveStatus status = SolveStatus::converged;
  std::string message;       // what was done, with the numbers
  long rhs_evaluations = 0;  // right-hand-side calls, all solves together
  long steps = 0;            // accepted ODE steps
  double match_radius = 0;   // r where the far solution was decomposed (units of M)
  double start_y = 0;        // y = ln(r/2 - 1) at the start
};

struct Transmission {
  Estimate gamma;          // Gamma, with an estimated absolute error
  double reflection = 0;   // |R|^2, computed from the outgoing amplitude
  double flux_defect = 0;  // |Gamma + |R|^2 - 1|, a check of the integration
  SolveSummary summary;
};

// Throws InputError for x <= 0 or non-finite, NumericalError ("greybody solver") when the far
// series cannot be matched or the result is not finite.
Transmission solve_transmission(const Mode& mode, double x, const SolverOptions& options = {});

}  // namespace ember::greybody
