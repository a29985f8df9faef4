// The flat-space bounce of a scalar field with O(d) symmetry: O(4) for vacuum decay at zero
// temperature, O(3) for a thermal bubble (Coleman, PRD 15 (1977) 2929; Linde, Nucl. Phys. B216
// (1983) 421).
//
// Units: phi in GeV, r in GeV^-1. The O(4) action S4 is dimensionless; the O(3) action S3 is in
// GeV (the thermal exponent is S3/T).
//
//   phi'' + ((d-1)/r) phi' = V'(phi),  phi'(0) = 0,  phi(inf) = 0 (the false vacuum, V(0) = 0).
//
// Method: shooting by bisection on ln(phi_true - phi(0)) when V has a true minimum in range, or on
// ln phi(0) when it runs away. Overshoot: phi crosses the false vacuum; undershoot: phi' turns
// positive. Deep starts near a true minimum use the linearised solution
// phi_t - phi = delta Gamma(d/2) (2/z)^(d/2-1) I_(d/2-1)(z), z = m_t r (GSL Bessel functions),
// so walls far thinner than double precision would allow from r = 0 are reached. Integration:
// Boost.Odeint Runge-Kutta-Fehlberg 7(8). Action: the virial form S = (Omega_{d-1}/d) int r^(d-1)
// phi'^2 dr, which holds for a bounce (Derrick scaling) and needs no interior volume term; the
// tail beyond the last radius is added analytically for a massless false vacuum
// (phi ~ C r^(2-d) gives (Omega/d)(d-2) C^2 R^(2-d), derived).
#pragma once

#include <string>

#include "ember/core/estimate.hpp"
#include "ember/core/solve_status.hpp"
#include "ember/higgs/potential.hpp"
#include "ember/tunnelling/landscape.hpp"

namespace ember::tunnelling {

struct FlatBounceOptions {
  int dimensions = 4;  // 3 or 4
  // Step control of each shot: accept a step when its error is below this, relative.
  double relative_tolerance = 1e-10;
  // Stop bisecting when the bracket on the shooting variable is narrower than this.
  double shooting_tolerance = 1e-13;
  // The potential is scanned for its barrier from this field upward (GeV); 0: field_max * 1e-40.
  double scan_from = 0;

  void validate() const;  // throws InputError naming the field and the rule
};

struct BounceSummary {
  SolveStatus status = SolveStatus::converged;
  int bisections = 0;
  long rhs_evaluations = 0;
  std::string message;
};

struct FlatBounce {
  Estimate action;          // S4, or S3 in GeV
  double center_field = 0;  // phi(0)
  double wall_radius = 0;   // r where phi passes the barrier top
  Landscape landscape;
  BounceSummary summary;
};

// Throws InputError for a potential without a decaying false vacuum, NumericalError naming the
// "flat bounce shooting" solver if no bracket is found.
FlatBounce solve_flat_bounce(const higgs::Potential& potential, const FlatBounceOptions& options = {});

}  // namespace ember::tunnelling
