#include "ember/evaporation/kerr_trajectory.hpp"

#include <fmt/format.h>

#include <array>
#include <cmath>

#include "ember/core/errors.hpp"
#include "ember/core/odeint.hpp"
#include "ember/units/constants.hpp"

namespace ember::evaporation {

namespace {
// ln a* (the spin decays like a power of M, so its logarithm stays accurate to any smallness),
// and the age in units of t_unit.
using KerrState = std::array<double, 2>;
}  // namespace

KerrTrajectory::KerrTrajectory(const KerrMassLoss& ml, double initial_mass, double initial_spin,
                               const TrajectoryOptions& options) {
  options.validate();
  if (!(initial_mass > 0) || !std::isfinite(initial_mass))
    throw InputError(fmt::format("Kerr trajectory: initial mass {} GeV; expected a finite mass > 0", initial_mass));
  if (!(initial_spin > 0 && initial_spin <= ml.max_hole_spin()))
    throw InputError(
        fmt::format("Kerr trajectory: a* = {}: expected 0 < a* <= {} (the Kerr greybody table's range; "
                    "a* = 0 is the Schwarzschild trajectory)",
                    initial_spin, ml.max_hole_spin()));
  const double cutoff = std::min(options.cutoff_mass, initial_mass);
  // Ages in units of the initial mass's M^3 / alpha, so the state is of order one.
  const double t_unit = std::pow(initial_mass, 3) / ml.alpha(initial_mass, initial_spin);
  const double u0 = std::log(initial_mass), u1 = std::log(cutoff);
  points_.push_back({initial_mass, initial_spin, 0.0});
  long evaluations = 0;
  if (u1 < u0) {
    namespace odeint = boost::numeric::odeint;
    // s = u0 - u increases as the hole shrinks.
    const auto rhs = [&](const KerrState& y, KerrState& dy, double s) {
      ++evaluations;
      const double mass = std::exp(u0 - s), a = std::min(std::exp(y[0]), ml.max_hole_spin());
      dy[0] = -(ml.spin_ratio(mass, a) - 2.0);
      dy[1] = std::pow(mass, 3) / ml.alpha(mass, a) / t_unit;
    };
    auto stepper = odeint::make_dense_output(options.relative_tolerance, options.relative_tolerance,
                                             odeint::runge_kutta_dopri5<KerrState>());
    KerrState y{std::log(initial_spin), 0.0};
    const int n = std::max(2, static_cast<int>(std::ceil((u0 - u1) * nodes_per_e_fold)));
    std::vector<double> times;
    for (int i = 0; i <= n; ++i) times.push_back((u0 - u1) * i / n);
    odeint::integrate_times(stepper, rhs, y, times.begin(), times.end(), (u0 - u1) / n,
                            [&](const KerrState& state, double s) {
                              if (s == 0) return;
                              points_.push_back({std::exp(u0 - s), std::exp(state[0]), state[1] * t_unit});
                            });
  }
  const double a_cut = points_.back().hole_spin;
  alpha_cut_ = ml.alpha(cutoff, a_cut);
  tail_ = std::pow(cutoff, 3) / (3 * alpha_cut_);
  for (const auto& p : points_)
    if (!std::isfinite(p.hole_spin) || !std::isfinite(p.age))
      throw NumericalError("Kerr trajectory (Dormand-Prince 5(4))",
                           fmt::format("non-finite state at M = {:.6e} g from M_0 = {:.6e} g, a*_0 = {}",
                                       p.mass / units::gram, initial_mass / units::gram, initial_spin));
  message_ = fmt::format(
      "Kerr trajectory from {:.4e} g at a* = {} to {:.4e} g at a* = {:.3e}: {} points, {} rate evaluations; "
      "analytic tail below",
      initial_mass / units::gram, initial_spin, cutoff / units::gram, a_cut, points_.size(), evaluations);
}

std::size_t KerrTrajectory::bracket(double mass) const {
  if (!(mass <= points_.front().mass * (1 + 1e-12) && mass >= points_.back().mass * (1 - 1e-12)))
    throw InputError(
        fmt::format("Kerr trajectory: M = {:.6e} g: expected a mass between the cutoff {:.6e} g and the "
                    "initial {:.6e} g",
                    mass / units::gram, points_.back().mass / units::gram, points_.front().mass / units::gram));
  std::size_t i = 0;
  while (i + 2 < points_.size() && points_[i + 1].mass > mass) ++i;
  return i;
}

namespace {
double along(const KerrTrajectoryPoint& a, const KerrTrajectoryPoint& b, double mass, double KerrTrajectoryPoint::*f) {
  if (a.mass == b.mass) return a.*f;
  const double w = std::log(mass / a.mass) / std::log(b.mass / a.mass);
  return a.*f + w * (b.*f - a.*f);
}
}  // namespace

double KerrTrajectory::spin_at(double mass) const {
  if (points_.size() == 1) return points_.front().hole_spin;
  const std::size_t i = bracket(mass);
  return along(points_[i], points_[i + 1], mass, &KerrTrajectoryPoint::hole_spin);
}

double KerrTrajectory::age_at(double mass) const {
  if (points_.size() == 1) return 0.0;
  const std::size_t i = bracket(mass);
  return along(points_[i], points_[i + 1], mass, &KerrTrajectoryPoint::age);
}

double KerrTrajectory::mass_at_age(double age) const {
  if (!(age >= 0)) throw InputError(fmt::format("Kerr trajectory: age {} GeV^-1; expected an age >= 0", age));
  if (age >= lifetime()) return 0.0;
  if (age >= points_.back().age) return std::cbrt(3 * alpha_cut_ * (lifetime() - age));
  std::size_t i = 0;
  while (points_[i + 1].age < age) ++i;
  const auto &a = points_[i], &b = points_[i + 1];
  const double w = (age - a.age) / (b.age - a.age);
  return std::exp(std::log(a.mass) + w * std::log(b.mass / a.mass));
}

double KerrTrajectory::mass_at_spin(double spin) const {
  for (std::size_t i = 0; i + 1 < points_.size(); ++i) {
    const auto &a = points_[i], &b = points_[i + 1];
    if (a.hole_spin >= spin && b.hole_spin < spin) {
      const double w = (spin - a.hole_spin) / (b.hole_spin - a.hole_spin);
      return std::exp(std::log(a.mass) + w * std::log(b.mass / a.mass));
    }
  }
  return points_.front().hole_spin <= spin ? points_.front().mass : 0.0;
}

}  // namespace ember::evaporation
