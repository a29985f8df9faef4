// Internal to the tunnelling module: single shots of the static Einstein-scalar equations out of
// a black hole's horizon, for solve_static (static_instanton.hpp states the equations and units).
#pragma once

#include <array>
#include <optional>
#include <utility>

#include "ember/higgs/potential.hpp"

namespace ember::tunnelling::detail {

using State = std::array<double, 3>;  // phi, psi = d phi/dx, DeltaM

// Where a shot starts. log_field: param = ln phi_h. log_gap: param = ln delta with phi_h =
// phi_t - delta, for walls so thin that phi_h lies closer to the true minimum phi_t than ln phi_h
// resolves (delta / phi_t below about 1e-12).
struct Aim {
  enum class Kind { log_field, log_gap } kind = Kind::log_field;
  double param = 0;
};

enum class Shot { overshoot, undershoot };

struct ShotResult {
  Shot kind = Shot::undershoot;
  double mass_shift = 0;  // DeltaM at the stop (tail added later)
  double stop_x = 0, stop_field = 0;
  double launch_x = 0;  // where the full equations take over (0+ unless launched near phi_t)
  double wall_x = 0;
};

// The state where the full equations start, with the direct action's integrals D and K so far.
struct Launch {
  double x = 0;
  State s{};
  double d_integral = 0, k_integral = 0;
};

// The true minimum, for log_gap shots: phi_t, V(phi_t), V''(phi_t), and the gap phi_t - phi below
// which the field is linearised about phi_t.
struct TrueMinimum {
  double phi = 0, value = 0, curvature = 0, linear_gap = 0;
};

class Shooter {
 public:
  // G is the constant in the field equations and f (0 in the probe limit); rel the step tolerance.
  Shooter(const higgs::Potential& pot, double r_h, double G, double rel, double barrier_top,
          std::optional<TrueMinimum> minimum);

  ShotResult shoot(const Aim& aim);
  // The direct Euclidean action along the shot (see StaticSolution::direct_action).
  double direct_action(const Aim& aim, double dm_total);
  // Largest relative residual of the field equation along the shot, from its launch to x_end.
  double field_residual(const Aim& aim, double x_end, int samples);
  double phi_horizon(const Aim& aim) const;
  long evaluations() const { return evaluations_; }

 private:
  const higgs::Potential& pot_;
  double r_h_, G_, rel_, barrier_top_;
  std::optional<TrueMinimum> min_;
  long evaluations_ = 0;

  double f_of(double x, double dm) const;
  double f_of(double x, double exp_x, double dm) const;
  void rhs(const State& s, State& ds, double x);
  std::pair<double, State> start(double phi_h) const;
  bool linearised(const Aim& aim) const;  // launched on the equations linearised about phi_t
  Launch launch(const Aim& aim);
  Launch launch_near_minimum(double delta);
};

}  // namespace ember::tunnelling::detail
