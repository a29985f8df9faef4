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
                               const TrajectoryOptions& options, double stop_spin) {
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
  points_.push_back({initial_mass, initial_spin, 0.0, std::pow(initial_mass, 3) / ml.alpha(initial_mass, initial_spin),
                     ml.spin_ratio(initial_mass, initial_spin) - 2.0});
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
    // One recorded interval at a time, so a stop spin ends the integration where it is reached.
    const double ds = (u0 - u1) / n, log_stop = stop_spin > 0 ? std::log(stop_spin) : -HUGE_VAL;
    for (int i = 1; i <= n && y[0] > log_stop; ++i) {
      odeint::integrate_adaptive(stepper, rhs, y, ds * (i - 1), ds * i, ds);
      const double mass = std::exp(u0 - ds * i), a = std::exp(y[0]);
      points_.push_back({mass, a, y[1] * t_unit, std::pow(mass, 3) / ml.alpha(mass, std::min(a, ml.max_hole_spin())),
                         ml.spin_ratio(mass, std::min(a, ml.max_hole_spin())) - 2.0});
    }
    stopped_ = y[0] <= log_stop;
  }
  const double a_cut = points_.back().hole_spin, m_end = points_.back().mass;
  alpha_cut_ = ml.alpha(m_end, a_cut);
  tail_ = std::pow(m_end, 3) / (3 * alpha_cut_);
  for (const auto& p : points_)
    if (!std::isfinite(p.hole_spin) || !std::isfinite(p.age))
      throw NumericalError("Kerr trajectory (Dormand-Prince 5(4))",
                           fmt::format("non-finite state at M = {:.6e} g from M_0 = {:.6e} g, a*_0 = {}",
                                       p.mass / units::gram, initial_mass / units::gram, initial_spin));
  message_ = fmt::format(
      "Kerr trajectory from {:.4e} g at a* = {} to {:.4e} g at a* = {:.3e}: {} points, {} rate evaluations; "
      "{}",
      initial_mass / units::gram, initial_spin, m_end / units::gram, a_cut, points_.size(), evaluations,
      stopped_ ? "stopped at the stop spin" : "analytic tail below");
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
// Cubic Hermite in u = ln M between two recorded points, from values and slopes (derived).
double hermite(double y0, double d0, double y1, double d1, double h, double w) {
  const double w2 = w * w, w3 = w2 * w;
  return (2 * w3 - 3 * w2 + 1) * y0 + (w3 - 2 * w2 + w) * h * d0 + (-2 * w3 + 3 * w2) * y1 + (w3 - w2) * h * d1;
}
// Age and ln a* at u between points a and b: d age/du = -M^3/alpha, d ln a*/du = q - 2.
double age_between(const KerrTrajectoryPoint& a, const KerrTrajectoryPoint& b, double u) {
  const double ua = std::log(a.mass), h = std::log(b.mass) - ua;
  if (h == 0) return a.age;
  return hermite(a.age, -a.age_rate, b.age, -b.age_rate, h, (u - ua) / h);
}
double log_spin_between(const KerrTrajectoryPoint& a, const KerrTrajectoryPoint& b, double u) {
  const double ua = std::log(a.mass), h = std::log(b.mass) - ua;
  if (h == 0) return std::log(a.hole_spin);
  return hermite(std::log(a.hole_spin), a.spin_exponent, std::log(b.hole_spin), b.spin_exponent, h, (u - ua) / h);
}
}  // namespace

double KerrTrajectory::spin_at(double mass) const {
  if (points_.size() == 1) return points_.front().hole_spin;
  const std::size_t i = bracket(mass);
  return std::exp(log_spin_between(points_[i], points_[i + 1], std::log(mass)));
}

double KerrTrajectory::age_at(double mass) const {
  if (points_.size() == 1) return 0.0;
  const std::size_t i = bracket(mass);
  return age_between(points_[i], points_[i + 1], std::log(mass));
}

double KerrTrajectory::time_left(double mass) const {
  if (mass < points_.back().mass) return std::pow(mass, 3) / (3 * alpha_cut_);
  return lifetime() - age_at(mass);
}

double KerrTrajectory::mass_at_age(double age) const {
  if (!(age >= 0)) throw InputError(fmt::format("Kerr trajectory: age {} GeV^-1; expected an age >= 0", age));
  if (age >= lifetime()) return 0.0;
  if (age >= points_.back().age) return std::cbrt(3 * alpha_cut_ * (lifetime() - age));
  std::size_t i = 0;
  while (points_[i + 1].age < age) ++i;
  // The Hermite age is monotone between the points (its slopes share a sign): bisection in ln M.
  const auto &a = points_[i], &b = points_[i + 1];
  double hi = std::log(a.mass), lo = std::log(b.mass);
  for (int k = 0; k < 100 && hi - lo > 1e-15 * std::max(1.0, std::abs(hi)); ++k) {
    const double mid = 0.5 * (hi + lo);
    (age_between(a, b, mid) < age ? hi : lo) = mid;
  }
  return std::exp(0.5 * (hi + lo));
}

double KerrTrajectory::mass_at_spin(double spin) const {
  for (std::size_t i = 0; i + 1 < points_.size(); ++i) {
    const auto &a = points_[i], &b = points_[i + 1];
    if (a.hole_spin >= spin && b.hole_spin < spin) {  // bisection on the Hermite ln a* in ln M
      double hi = std::log(a.mass), lo = std::log(b.mass);
      for (int k = 0; k < 100 && hi - lo > 1e-15 * std::max(1.0, std::abs(hi)); ++k) {
        const double mid = 0.5 * (hi + lo);
        (log_spin_between(a, b, mid) >= std::log(spin) ? hi : lo) = mid;
      }
      return std::exp(0.5 * (hi + lo));
    }
  }
  return points_.front().hole_spin <= spin ? points_.front().mass : 0.0;
}

}  // namespace ember::evaporation
