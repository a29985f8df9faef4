#include "ember/evaporation/trajectory.hpp"

#include <fmt/format.h>

#include <array>
#include <cmath>

#include "ember/core/errors.hpp"
#include "ember/core/gsl_tools.hpp"
#include "ember/core/odeint.hpp"
#include "ember/units/constants.hpp"

namespace ember::evaporation {

void TrajectoryOptions::validate() const {
  if (!(cutoff_mass >= units::planck_mass) || !std::isfinite(cutoff_mass))
    throw InputError(
        fmt::format("trajectory options: cutoff_mass = {:.4g} GeV: must be at least one Planck mass "
                    "({:.6g} GeV)",
                    cutoff_mass, units::planck_mass));
  if (!(relative_tolerance > 1e-15 && relative_tolerance < 1e-3))
    throw InputError(
        fmt::format("trajectory options: relative_tolerance = {}: must lie in (1e-15, 1e-3)", relative_tolerance));
}

namespace {
using State = std::array<double, 1>;
}  // namespace

Trajectory::Trajectory(const MassLoss& ml, double initial_mass, const TrajectoryOptions& options)
    : initial_mass_(initial_mass), cutoff_(options.cutoff_mass) {
  options.validate();
  if (!(initial_mass > 0) || !std::isfinite(initial_mass))
    throw InputError(fmt::format("trajectory: initial mass {} GeV; expected a finite mass > 0", initial_mass));
  // A hole lighter than the cutoff is all analytic tail, with alpha at its own mass (not at the
  // cutoff's, which would describe a different hole).
  cutoff_ = std::min(cutoff_, initial_mass_);
  alpha_cut_ = ml.alpha(cutoff_);
  tail_ = cutoff_ * cutoff_ * cutoff_ / (3 * alpha_cut_);
  if (initial_mass_ <= options.cutoff_mass) {  // all of it is the analytic tail
    summary_.message = fmt::format("initial mass at or below the cutoff {:.3g} g: analytic tail only",
                                   options.cutoff_mass / units::gram);
    return;
  }
  namespace odeint = boost::numeric::odeint;
  long evaluations = 0;
  const auto rhs = [&](const State& w, State& dw, double u) {
    ++evaluations;
    dw[0] = std::exp(3 * u - w[0]) / ml.alpha(std::exp(u));
  };
  auto stepper = odeint::make_dense_output(options.relative_tolerance, options.relative_tolerance,
                                           odeint::runge_kutta_dopri5<State>());
  State w{std::log(tail_)};
  const double u0 = std::log(cutoff_), u1 = std::log(initial_mass_);
  const auto observe = [&](const State& s, double u) {
    State d;
    rhs(s, d, u);
    u_.push_back(u);
    w_.push_back(s[0]);
    dw_.push_back(d[0]);
  };
  summary_.steps = static_cast<long>(odeint::integrate_adaptive(stepper, rhs, w, u0, u1, 0.01, observe));
  summary_.rhs_evaluations = evaluations;
  if (u_.empty() || u_.back() != u1 || !std::isfinite(w[0]))
    throw NumericalError("trajectory integrator (Boost.Odeint dopri5)",
                         fmt::format("stopped at ln M = {} of {}, ln tau = {}", u_.empty() ? u0 : u_.back(), u1, w[0]));
  summary_.message = fmt::format("{:.4g} g to the cutoff {:.3g} g in {} steps ({} evaluations); analytic tail {:.3g} s",
                                 initial_mass_ / units::gram, cutoff_ / units::gram, summary_.steps, evaluations,
                                 tail_ / units::second);
}

double Trajectory::w_at(double u) const {
  // Cubic Hermite interpolation between the dense-output nodes (fourth order, like dopri5's own).
  auto it = std::upper_bound(u_.begin(), u_.end(), u);
  std::size_t i = it == u_.begin() ? 0 : static_cast<std::size_t>(it - u_.begin()) - 1;
  if (i + 1 >= u_.size()) i = u_.size() - 2;
  const double h = u_[i + 1] - u_[i], t = (u - u_[i]) / h;
  const double h00 = (1 + 2 * t) * (1 - t) * (1 - t), h10 = t * (1 - t) * (1 - t), h01 = t * t * (3 - 2 * t),
               h11 = t * t * (t - 1);
  return h00 * w_[i] + h10 * h * dw_[i] + h01 * w_[i + 1] + h11 * h * dw_[i + 1];
}

double Trajectory::time_left(double mass) const {
  if (!(mass > 0)) return 0.0;
  if (mass <= cutoff_ || u_.size() < 2) return std::min(mass, initial_mass_) * mass * mass / (3 * alpha_cut_);
  return std::exp(w_at(std::log(std::min(mass, initial_mass_))));
}

double Trajectory::mass_at_time_left(double left) const {
  if (!(left > 0)) return 0.0;
  if (left >= lifetime()) return initial_mass_;
  if (left <= tail_ || u_.size() < 2) return std::cbrt(3 * alpha_cut_ * left);
  // w(u) increases with u: bisect on the nodes, then Newton on the Hermite segment.
  const double target = std::log(left);
  auto it = std::upper_bound(w_.begin(), w_.end(), target);
  std::size_t i = it == w_.begin() ? 0 : static_cast<std::size_t>(it - w_.begin()) - 1;
  if (i + 1 >= w_.size()) i = w_.size() - 2;
  double lo = u_[i], hi = u_[i + 1], u = lo + (hi - lo) * (target - w_[i]) / (w_[i + 1] - w_[i]);
  for (int k = 0; k < 60; ++k) {
    const double g = w_at(u) - target;
    if (g > 0)
      hi = u;
    else
      lo = u;
    if (hi - lo < 1e-15 * std::max(1.0, std::abs(u))) break;
    u = 0.5 * (lo + hi);
  }
  return std::exp(0.5 * (lo + hi));
}

std::vector<DecadeTime> Trajectory::decade_times() const {
  std::vector<DecadeTime> out;
  const double top_g = initial_mass_ / units::gram;
  for (int k = static_cast<int>(std::floor(std::log10(top_g))); k >= -6; --k) {
    const double lo = std::pow(10.0, k) * units::gram,
                 hi = std::min(std::pow(10.0, k + 1) * units::gram, initial_mass_);
    const double t = time_left(hi) - time_left(lo);
    out.push_back({lo, hi, t});
  }
  return out;
}

double mass_with_lifetime_of(const std::function<double(double)>& lifetime_of, double lifetime,
                             const std::string& hole) {
  if (!(lifetime > 0) || !std::isfinite(lifetime))
    throw InputError(fmt::format("lifetime {} GeV^-1: expected a finite time > 0", lifetime));
  const auto misfit = [&](double ln_m) { return std::log(lifetime_of(std::exp(ln_m)) / lifetime); };
  const double lo = std::log(1e-5 * units::gram), hi = std::log(1e40 * units::gram);
  if (misfit(lo) > 0 || misfit(hi) < 0)
    throw InputError(
        fmt::format("lifetime {:.4g} s{}: no mass between 1e-5 g and 1e40 g has it; expected a lifetime "
                    "between {:.3g} s and {:.3g} s",
                    lifetime / units::second, hole, lifetime_of(std::exp(lo)) / units::second,
                    lifetime_of(std::exp(hi)) / units::second));
  // ln M to 1e-13: the mass to about 1e-13 relative.
  const BrentResult r = brent_root(misfit, lo, hi, 1e-13);
  if (r.converged) return std::exp(r.x);
  throw NumericalError("lifetime root (GSL Brent)",
                       fmt::format("no convergence{}: ln M in [{}, {}] after 200 iterations", hole, r.lower, r.upper));
}

double mass_with_lifetime(const MassLoss& ml, double lifetime, const TrajectoryOptions& options) {
  return mass_with_lifetime_of([&](double m) { return Trajectory(ml, m, options).lifetime(); }, lifetime, "");
}

}  // namespace ember::evaporation
