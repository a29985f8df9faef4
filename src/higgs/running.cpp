#include "ember/higgs/running.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cmath>

#include "ember/core/errors.hpp"
#include "ember/core/gsl_tools.hpp"
#include "ember/core/odeint.hpp"

namespace ember::higgs {

void RunOptions::validate() const {
  if (!(mu_max > 1e3 && mu_max <= 1e30))
    throw InputError(fmt::format("running options: mu_max = {:.3g} GeV: must lie in (1e3, 1e30] GeV", mu_max));
  if (!(relative_tolerance > 1e-15 && relative_tolerance < 1e-4))
    throw InputError(
        fmt::format("running options: relative_tolerance = {}: must lie in (1e-15, 1e-4)", relative_tolerance));
  if (!(node_spacing > 1e-4 && node_spacing <= 1))
    throw InputError(fmt::format("running options: node_spacing = {}: must lie in (1e-4, 1]", node_spacing));
}

namespace {
using State = std::array<double, 6>;  // g1, g2, g3, yt, lambda, Gamma
Couplings couplings_of(const State& s) {
  return {s[0], s[1], s[2], s[3], s[4]};
}
}  // namespace

struct Running::Splines {
  double t0 = 0, t1 = 0;
  std::vector<Spline> of;  // one per state component, natural cubic in t = ln mu
  double eval(int i, double t) const { return of[static_cast<std::size_t>(i)].value(t); }
};

Running::Running(const Inputs& inputs, const RunOptions& options) : inputs_(inputs), options_(options) {
  inputs_.validate();
  options_.validate();
  namespace odeint = boost::numeric::odeint;
  const Couplings c0 = couplings_at_top(inputs_);
  State s{c0.g1, c0.g2, c0.g3, c0.yt, c0.lambda, 0.0};
  const double t0 = std::log(inputs_.top_mass), t1 = std::log(options_.mu_max);
  const int intervals = static_cast<int>(std::ceil((t1 - t0) / options_.node_spacing));
  // Nodes and midpoints together: even indices build the splines, odd ones check them.
  std::vector<double> times(static_cast<std::size_t>(2 * intervals + 1));
  for (std::size_t i = 0; i < times.size(); ++i) times[i] = t0 + (t1 - t0) * static_cast<double>(i) / (2.0 * intervals);
  std::vector<State> states;
  long evaluations = 0;
  const int loops = inputs_.loops;
  const auto rhs = [&](const State& x, State& dx, double) {
    ++evaluations;
    const Couplings c = couplings_of(x);
    const Couplings b = beta(c, loops);
    dx = {b.g1, b.g2, b.g3, b.yt, b.lambda, field_anomalous_dimension(c)};
  };
  auto stepper = odeint::make_dense_output(options_.relative_tolerance, options_.relative_tolerance,
                                           odeint::runge_kutta_dopri5<State>());
  summary_.steps = static_cast<long>(odeint::integrate_times(stepper, rhs, s, times.begin(), times.end(), 0.01,
                                                             [&](const State& x, double) { states.push_back(x); }));
  summary_.rhs_evaluations = evaluations;
  if (states.size() != times.size())
    throw NumericalError("RG running (Boost.Odeint dopri5)",
                         fmt::format("{} of {} sample points reached", states.size(), times.size()));
  for (const auto& x : states)
    for (double v : x)
      if (!std::isfinite(v))
        throw NumericalError(
            "RG running (Boost.Odeint dopri5)",
            fmt::format("a coupling left the finite range (Landau pole?) below {:.3g} GeV", options_.mu_max));

  auto sp = std::make_shared<Splines>();
  sp->t0 = t0;
  sp->t1 = t1;
  const std::size_t n = static_cast<std::size_t>(intervals) + 1;
  std::vector<double> t(n), y(n);
  for (int k = 0; k < 6; ++k) {
    for (std::size_t i = 0; i < n; ++i) {
      t[i] = times[2 * i];
      y[i] = states[2 * i][static_cast<std::size_t>(k)];
    }
    sp->of.emplace_back(Spline::Kind::cubic, t, y, "running couplings");
  }
  for (std::size_t i = 1; i < times.size(); i += 2)
    summary_.max_midpoint_error = std::max(summary_.max_midpoint_error, std::abs(sp->eval(4, times[i]) - states[i][4]));
  splines_ = sp;
  summary_.message = fmt::format("{} from {:.5g} to {:.3g} GeV: {} steps, {} evaluations; lambda spline error {:.1e}",
                                 loop_order_name(loops), inputs_.top_mass, options_.mu_max, summary_.steps, evaluations,
                                 summary_.max_midpoint_error);
}

double Running::t_of(double mu) const {
  if (!(mu > 0) || !std::isfinite(mu)) throw InputError(fmt::format("scale {} GeV: expected a finite scale > 0", mu));
  if (mu > options_.mu_max * (1 + 1e-12))
    throw InputError(fmt::format("scale {:.4g} GeV: above the running's upper end {:.3g} GeV", mu, options_.mu_max));
  return std::clamp(std::log(mu), splines_->t0, splines_->t1);
}

Couplings Running::couplings(double mu) const {
  const double t = t_of(mu);
  return {splines_->eval(0, t), splines_->eval(1, t), splines_->eval(2, t), splines_->eval(3, t), splines_->eval(4, t)};
}

double Running::lambda(double mu) const {
  return splines_->eval(4, t_of(mu));
}
double Running::gamma_integral(double mu) const {
  return splines_->eval(5, t_of(mu));
}

}  // namespace ember::higgs
