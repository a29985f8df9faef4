#include "ember/greybody/solver.hpp"

#include <fmt/format.h>

#include <array>
#include <cmath>
#include <complex>

#include "ember/core/errors.hpp"
#include "ember/core/odeint.hpp"
#include "ember/greybody/potentials.hpp"
#include "far_series.hpp"

namespace ember::greybody {

void SolverOptions::validate() const {
  const auto require = [](bool ok, const char* field, const char* rule, double value) {
    if (!ok) throw InputError(fmt::format("greybody solver options: {} = {}: {}", field, value, rule));
  };
  require(std::isfinite(ode_relative) && ode_relative > 1e-15 && ode_relative < 1e-3, "ode_relative",
          "must lie in (1e-15, 1e-3)", ode_relative);
  require(std::isfinite(check_factor) && check_factor > 1, "check_factor", "must be above 1", check_factor);
  require(std::isfinite(horizon_correction) && horizon_correction > 0 && horizon_correction < 1e-2,
          "horizon_correction", "must lie in (0, 1e-2)", horizon_correction);
  require(std::isfinite(series_truncation) && series_truncation > 0 && series_truncation < 1e-4, "series_truncation",
          "must lie in (0, 1e-4)", series_truncation);
}

namespace {

using cd = std::complex<double>;
using State = std::array<double, 4>;  // Re psi, Im psi, Re dpsi/dr*, Im dpsi/dr*

// d psi/dy = r dpsi/dr*, d(dpsi/dr*)/dy = r (V - w^2) psi, since dr*/dy = r.
struct RadialSystem {
  const Mode& mode;
  double omega2;
  long* evaluations;
  void operator()(const State& s, State& ds, double y) const {
    ++*evaluations;
    const Geometry g = geometry_at(y);
    const double k = g.r * (potential_at(mode, g) - omega2);
    ds[0] = g.r * s[2];
    ds[1] = g.r * s[3];
    ds[2] = k * s[0];
    ds[3] = k * s[1];
  }
};

struct HorizonStart {
  double y;
  State state;
  double correction;  // |delta|, the size of the first-order horizon term
};

// psi = e^{-i w r*} (1 + delta), delta = sum_t V_t / (kappa_t^2 - 2 i w kappa_t): the first Born
// term for pieces V_t ~ e^{kappa_t r*} (derived by substitution into u'' - 2 i w u' - V u = 0).
HorizonStart horizon_start(const Mode& mode, double omega, double limit) {
  for (double y = -16.0;; y -= 2.0) {
    cd delta = 0, ddelta = 0;
    for (const auto& t : horizon_terms(mode, y)) {
      const cd term = t.value / cd(t.kappa * t.kappa, -2.0 * omega * t.kappa);
      delta += term;
      ddelta += t.kappa * term;
    }
    if (std::abs(delta) < limit || y < -600.0) {
      const double rstar = geometry_at(y).tortoise;
      const cd phase = std::exp(cd(0.0, -omega * rstar));
      const cd psi = phase * (1.0 + delta);
      const cd dpsi = phase * (cd(0.0, -omega) * (1.0 + delta) + ddelta);
      return {y, {psi.real(), psi.imag(), dpsi.real(), dpsi.imag()}, std::abs(delta)};
    }
  }
}

double y_of(double r) {
  return std::log(r / 2.0 - 1.0);
}

struct Amplitudes {
  cd in, out;
  double series_error;
};

// Decompose (psi, dpsi/dr*) at radius r into A_in psi_in + A_out psi_out.
Amplitudes decompose(const std::vector<double>& u, double omega, double r, const State& s) {
  const Geometry g = geometry_at(y_of(r));
  const FarSolution far = ingoing_far_solution(u, omega, r);
  const cd phase_in = std::exp(cd(0.0, -omega * g.tortoise));
  const cd psi_in = phase_in * far.g;
  const cd dpsi_in = phase_in * (cd(0.0, -omega) * far.g + g.f * far.dg_dr);
  const cd psi_out = std::conj(psi_in), dpsi_out = std::conj(dpsi_in);  // real potential
  const cd psi(s[0], s[1]), dpsi(s[2], s[3]);
  const cd wronskian = psi_in * dpsi_out - psi_out * dpsi_in;  // 2 i w for exact solutions
  return {(psi * dpsi_out - dpsi * psi_out) / wronskian, (dpsi * psi_in - psi * dpsi_in) / wronskian,
          far.smallest_term};
}

// The smallest radius (doubling from a start outside the barrier) where the far series is
// accurate to `truncation`.
double matching_radius(const std::vector<double>& u, double omega, double truncation) {
  double r = std::max(24.0, 4.0 * std::sqrt(std::abs(u[2]) + 1.0) / omega);
  for (int i = 0; i < 60; ++i, r *= 2.0)
    if (ingoing_far_solution(u, omega, r).smallest_term < truncation) return r;
  throw NumericalError("greybody solver", fmt::format("far series did not reach {:.1e} by r = {:.3e} M at x = {:.6g}",
                                                      truncation, r, omega));
}

struct Pass {
  double gamma_near, gamma_far, reflection_far, series_error;
  long steps;
};

Pass integrate_pass(const Mode& mode, double omega, const std::vector<double>& u, double r_match,
                    const HorizonStart& start, double rel, long* evaluations) {
  namespace odeint = boost::numeric::odeint;
  using Checker = odeint::default_error_checker<double, odeint::array_algebra, odeint::default_operations>;
  odeint::controlled_runge_kutta<odeint::runge_kutta_fehlberg78<State>> stepper(
      Checker(rel * tolerance::ode_absolute_fraction, rel));
  const RadialSystem system{mode, omega * omega, evaluations};
  State s = start.state;
  const double y1 = y_of(r_match), y2 = y_of(2.0 * r_match);
  const double h0 = 0.01 / (1.0 + omega);
  long steps = odeint::integrate_adaptive(stepper, system, s, start.y, y1, h0);
  const Amplitudes a1 = decompose(u, omega, r_match, s);
  steps += odeint::integrate_adaptive(stepper, system, s, y1, y2, h0);
  const Amplitudes a2 = decompose(u, omega, 2.0 * r_match, s);
  const double in1 = std::norm(a1.in), in2 = std::norm(a2.in);
  return {1.0 / in1, 1.0 / in2, std::norm(a2.out) / in2, std::max(a1.series_error, a2.series_error), steps};
}

}  // namespace

Transmission solve_transmission(const Mode& mode, double x, const SolverOptions& options) {
  options.validate();
  if (!std::isfinite(x) || x <= 0)
    throw InputError(fmt::format("greybody: x = {}: expected a finite frequency x = G M omega / c^3 > 0", x));
  // Gamma ~ x^(2l+2) at small x: far below 1e-20 it underflows to zero, which would read as an
  // exact answer. The tables' low-frequency end uses the analytic limit instead.
  if (x < 1e-20)
    throw InputError(fmt::format("greybody: x = {:.4g}: below the solver's range; expected x >= 1e-20", x));
  if (x > tolerance::solver_max_x)
    throw InputError(
        fmt::format("greybody: x = {:.4g}: above the solver's range; expected x <= {:g} (far above the "
                    "barrier, Gamma = 1; the table lookup covers it)",
                    x, tolerance::solver_max_x));

  const std::vector<double> u = inverse_power_coefficients(mode, tolerance::series_max_terms + 2);
  const double r_match = matching_radius(u, x, options.series_truncation);
  const HorizonStart start = horizon_start(mode, x, options.horizon_correction);

  Transmission t;
  long evaluations = 0;
  const Pass fine = integrate_pass(mode, x, u, r_match, start, options.ode_relative, &evaluations);
  const Pass check =
      integrate_pass(mode, x, u, r_match, start, options.ode_relative * options.check_factor, &evaluations);

  t.gamma.value = fine.gamma_far;
  t.reflection = fine.reflection_far;
  t.flux_defect = std::abs(fine.gamma_far + fine.reflection_far - 1.0);
  // Honest error: tolerance dependence + matching-radius dependence + series truncation + the
  // neglected second-order horizon term, each a relative error on Gamma except the first two.
  const double relative_terms = 2.0 * fine.series_error + 2.0 * start.correction * start.correction;
  t.gamma.error = std::abs(fine.gamma_far - check.gamma_far) + std::abs(fine.gamma_far - fine.gamma_near) +
                  relative_terms * t.gamma.value;

  auto& s = t.summary;
  s.rhs_evaluations = evaluations;
  s.steps = fine.steps + check.steps;
  s.match_radius = r_match;
  s.start_y = start.y;
  if (!std::isfinite(t.gamma.value) || !std::isfinite(t.gamma.error) || !std::isfinite(t.reflection))
    throw NumericalError("greybody solver", fmt::format("{} at x = {:.6g}: non-finite result (Gamma = {}, error = {})",
                                                        describe(mode), x, t.gamma.value, t.gamma.error));
  const double relative_error = t.gamma.value > 0 ? t.gamma.error / t.gamma.value : INFINITY;
  s.status = relative_error < 1e-6 ? SolveStatus::converged : SolveStatus::not_converged;
  s.message = fmt::format(
      "{} at x = {:.6g}: Gamma = {:.10e} +- {:.2e} (relative {:.1e}); |R|^2 = {:.6e}, flux defect {:.1e}; "
      "start y = {:.0f}, matched at r = {:.4g} M; {} steps, {} evaluations",
      describe(mode), x, t.gamma.value, t.gamma.error, relative_error, t.reflection, t.flux_defect, start.y, r_match,
      s.steps, s.rhs_evaluations);
  return t;
}

}  // namespace ember::greybody
