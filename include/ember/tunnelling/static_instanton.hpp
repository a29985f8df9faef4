// Static Euclidean solutions of the Einstein-scalar equations around a black hole: the bubble of
// true vacuum a hole can nucleate (Burda, Gregory & Moss, PRL 115 (2015) 071303; JHEP 06 (2016)
// 025).
//
// Units: internal natural units (GeV); G = 1/M_Pl^2 unless options say otherwise.
//
//   ds^2 = f e^{2 delta} dtau^2 + dr^2/f + r^2 dOmega^2,  f = 1 - 2 G mu(r)/r,
//   mu' = 4 pi r^2 (f phi'^2/2 + V),  delta' = 4 pi G r phi'^2,
//   (r^2 e^delta f phi')' / (r^2 e^delta) = V'(phi).
// With x = ln(r/r_h), psi = d phi/dx and Delta M = mu - M_-, eliminating delta (derived):
//   d phi/dx = psi,
//   d psi/dx = [r^2 V'(phi) - (1 - 8 pi G r^2 V(phi)) psi] / f,
//   d DeltaM/dx = 4 pi r (f psi^2/2 + r^2 V),
//   f = (1 - e^{-x}) - 2 G DeltaM / r.
// At the horizon r_h = 2 G M_- regularity fixes psi_h = r_h^2 V'(phi_h) / (1 - 8 pi G r_h^2 V(phi_h)),
// i.e. phi'(r_h) = V'/(1/r_h - 8 pi G r_h V). Integrating DeltaM itself keeps the small mass change
// exact when back-reaction is weak; B = 4 pi G (M_+ + M_-) DeltaM = (A_+ - A_-)/(4 G), the drop in
// horizon entropy. In the probe limit (no back-reaction) the same equations hold with G = 0 except
// in r_h, the field's energy is E = DeltaM, and B = E / T_H = 8 pi G M E.
//
// Shooting on ln phi_h by bisection: overshoot when phi crosses the false vacuum, undershoot
// when psi turns positive. The tail phi ~ C/r beyond the last radius adds 2 pi C^2 / R to the
// energy (derived, f ~ 1 there). A thin wall's interior sits exponentially close to the true
// minimum phi_t, closer than ln phi_h resolves: when the shots reach phi_t (1 - 1e-12) without
// overshooting, the bracket is redone in ln delta, delta = phi_t - phi_h, and those shots leave
// the horizon on the equations linearised about phi_t until phi_t - phi reaches linear_gap.
#pragma once

#include <optional>
#include <string>

#include "ember/core/errors.hpp"
#include "ember/core/estimate.hpp"
#include "ember/higgs/potential.hpp"
#include "ember/tunnelling/flat_bounce.hpp"
#include "ember/units/constants.hpp"

namespace ember::tunnelling {

struct StaticOptions {
  // Gravitational back-reaction (the entropy-drop instanton) or a fixed Schwarzschild background
  // (the probe limit).
  bool back_reaction = true;
  // Newton's constant in GeV^-2; changeable only to test the G -> 0 limit.
  double newton_G = units::newton_G;
  // Step control: accept a step when its error is below this, relative.
  double relative_tolerance = 1e-10;
  // Stop bisecting on ln phi_h (or ln delta) when the bracket is narrower than this, relative to
  // max(1, |parameter|).
  double shooting_tolerance = 1e-13;
  // Linearise about the true minimum while phi_t - phi is below this fraction of phi_t - phi_top
  // (the neglected terms are of that relative size; below it phi itself carries too few digits).
  double linear_gap = 1e-8;
  // Give up re-bracketing in ln delta when delta / phi_t falls below e^thinnest_gap: a wall that
  // thin is reported as no static bubble we resolve.
  double thinnest_gap = -400;
  // The barrier is searched from this field upward (GeV); 0: field_max * 1e-40.
  double scan_from = 0;
  // Also evaluate the Euclidean action directly (back-reaction only), as a check of the area
  // formula: see direct_action below.
  bool direct_action = false;
  // Re-integrate the solution with dense output and measure the field equation's residual along
  // it (StaticSolution::max_residual): a check, about a fifth of a solve, that never changes B.
  bool residual_check = true;

  void validate() const;
};

struct StaticSolution {
  double remnant_mass = 0;             // M_- (GeV); the background mass in the probe limit
  double seed_mass = 0;                // M_+ = M_- + DeltaM; equal to M_- in the probe limit
  Estimate mass_shift;                 // DeltaM (GeV), or the field energy E in the probe limit
  Estimate action;                     // B
  double phi_horizon = 0;              // GeV
  std::optional<double> horizon_gap;   // phi_t - phi_h (GeV), when shot from the true minimum
  double bubble_radius = 0;            // where phi passes the barrier top (GeV^-1)
  std::optional<double> max_residual;  // largest relative residual of the field equation; none: not checked
  bool at_resolution_limit = false;    // the bracket reached double precision before converging
  // The Euclidean action computed directly, relative to the Schwarzschild hole of mass M_+ at the
  // same temperature (derived; Gregory, Moss & Withers 2014 for the method): with the on-shell
  // bulk Lagrangian -V (from R = 8 pi G ((d phi)^2 + 4V)), beta = 8 pi G M_+, the asymptotic
  // boundary terms of both cancelling, and the conical deficit 2 pi - beta f'(r_h) e^{delta_h}/2 at
  // the remnant horizon, which contributes -(deficit) A_-/(8 pi G):
  //   B_direct = -beta int 4 pi r^2 e^delta V dr - (2 pi - beta f'_h e^{delta_h}/2) A_- / (8 pi G).
  // It must equal 4 pi G (M_+^2 - M_-^2).
  std::optional<double> direct_action;
  BounceSummary summary;
};

// Solves for the static bubble around a hole of mass `mass` (M_- with back-reaction, the
// background mass in the probe limit). Throws NumericalError ("static instanton resolution") when
// the shots reach e^thinnest_gap of the true minimum without bracketing (a wall too thin to
// resolve), and NumericalError ("static instanton shooting") when
// no bracket is found: then no static solution exists at this mass.
StaticSolution solve_static(const higgs::Potential& potential, double mass, const StaticOptions& options = {});

// Whether an error from solve_static says there is no static solution (either kind above), as
// opposed to a failure of the solver itself.
bool no_static_solution(const NumericalError& e);
// Whether it says the wall is too thin to resolve (the first kind).
bool wall_beyond_resolution(const NumericalError& e);

}  // namespace ember::tunnelling
