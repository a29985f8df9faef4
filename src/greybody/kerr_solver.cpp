#include "ember/greybody/kerr_solver.hpp"

#include <fmt/format.h>

#include <array>
#include <cmath>
#include <complex>

#include "ember/core/errors.hpp"
#include "ember/core/odeint.hpp"
#include "ember/greybody/spheroidal.hpp"
#include "kerr_series.hpp"

namespace ember::greybody {

void KerrSolverOptions::validate() const {
  const auto require = [](bool ok, const char* field, const char* rule, double value) {
    if (!ok) throw InputError(fmt::format("Kerr greybody solver options: {} = {}: {}", field, value, rule));
  };
  require(std::isfinite(ode_relative) && ode_relative > 1e-15 && ode_relative < 1e-3, "ode_relative",
          "must lie in (1e-15, 1e-3)", ode_relative);
  require(std::isfinite(check_factor) && check_factor > 1, "check_factor", "must be above 1", check_factor);
  require(std::isfinite(horizon_series) && horizon_series >= 1e-18 && horizon_series < 1e-6, "horizon_series",
          "must lie in [1e-18, 1e-6)", horizon_series);
  require(std::isfinite(series_truncation) && series_truncation > 0 && series_truncation < 1e-4, "series_truncation",
          "must lie in (0, 1e-4)", series_truncation);
  require(spin_weight == 1 || spin_weight == -1, "spin_weight", "must be +1 or -1", spin_weight);
}

namespace {

using cd = std::complex<double>;
using KerrState = std::array<double, 4>;  // Re R, Im R, Re dR/dt, Im dR/dt, t = ln(r - r_+)

// dR/dt = P, dP/dt = [1 - (s+1)(2z+d)/(z+d)] P - [(K^2 - i s Delta' K)/(z+d)^2 + z (4 i s w r - lambda)/(z+d)] R
// (the polynomial form of kerr_series.hpp with d/dr = e^-t d/dt, derived).
struct KerrRadialSystem {
  const TeukolskyRadial& eq;
  long* evaluations;
  void operator()(const KerrState& y, KerrState& dy, double t) const {
    ++*evaluations;
    const double z = std::exp(t), d = eq.hole.r_plus - eq.hole.r_minus, r = eq.hole.r_plus + z;
    const double k = eq.omega * (r * r + eq.hole.a * eq.hole.a) - eq.hole.a * eq.m;
    const cd is(0.0, eq.s);
    const double zd = z + d;
    const cd potential =
        (k * k - is * (2.0 * r - 2.0) * k) / (zd * zd) + z * (4.0 * is * eq.omega * r - eq.lambda) / zd;
    const cd big_r(y[0], y[1]), p(y[2], y[3]);
    const cd dp = (1.0 - (eq.s + 1.0) * (2.0 * z + d) / zd) * p - potential * big_r;
    dy = {y[2], y[3], dp.real(), dp.imag()};
  }
};

struct KerrHorizonStart {
  double t;
  KerrState state;      // normalised to max |component| = 1
  double log_scale;     // ln of the factor removed (real part of nu ln z plus the normalisation)
  double series_error;  // relative
  int terms;
};

KerrHorizonStart kerr_horizon_start(const TeukolskyRadial& eq, double relative) {
  const double d = eq.hole.r_plus - eq.hole.r_minus;
  double z = tolerance::kerr_start_fraction * d;
  for (int i = 0; i <= tolerance::kerr_start_halvings; ++i, z *= 0.5) {
    bool converged = false;
    const HorizonSeries h = horizon_series(eq, z, relative, tolerance::kerr_series_terms, &converged);
    if (!converged) continue;
    // R = z^nu sum, dR/dt = z^nu log_sum; the phase of z^nu is kept, its modulus moved to the scale.
    const cd phase = std::exp(cd(0.0, h.nu.imag() * std::log(z)));
    const cd rv = phase * h.sum, pv = phase * h.log_sum;
    const double norm = std::max({std::abs(rv.real()), std::abs(rv.imag()), std::abs(pv.real()), std::abs(pv.imag())});
    return {std::log(z),
            {rv.real() / norm, rv.imag() / norm, pv.real() / norm, pv.imag() / norm},
            h.nu.real() * std::log(z) + std::log(norm),
            h.last_term,
            h.terms};
  }
  throw NumericalError("Kerr greybody solver",
                       fmt::format("horizon series did not converge to {:.1e} in {} terms down to z = {:.3e} (a* = {}, "
                                   "omega = {:.6g}, m = {}, s = {})",
                                   relative, tolerance::kerr_series_terms, z, eq.hole.a, eq.omega, eq.m, eq.s));
}

struct KerrAmplitudes {
  cd in, out;  // times exp(log_scale)
  double series_error;
};

KerrAmplitudes kerr_decompose(const TeukolskyRadial& eq, double r, const KerrState& y) {
  const FarWave win = far_wave(eq, -1, r, tolerance::series_max_terms);
  const FarWave wout = far_wave(eq, +1, r, tolerance::series_max_terms);
  const double z = r - eq.hole.r_plus;
  const cd rv(y[0], y[1]), dr = cd(y[2], y[3]) / z;
  const cd w = win.value * wout.derivative - wout.value * win.derivative;
  return {(rv * wout.derivative - dr * wout.value) / w, (win.value * dr - win.derivative * rv) / w,
          std::max(win.smallest_term, wout.smallest_term)};
}

double kerr_matching_radius(const TeukolskyRadial& eq, double truncation) {
  double r = std::max(24.0, 4.0 * std::sqrt(std::abs(eq.lambda) + 1.0) / eq.omega) + eq.hole.r_plus;
  for (int i = 0; i < 60; ++i, r *= 2.0) {
    const double e = std::max(far_wave(eq, -1, r, tolerance::series_max_terms).smallest_term,
                              far_wave(eq, +1, r, tolerance::series_max_terms).smallest_term);
    if (e < truncation) return r;
  }
  throw NumericalError(
      "Kerr greybody solver",
      fmt::format("far series did not reach {:.1e} by r = {:.3e} M at x = {:.6g}", truncation, r, eq.omega));
}

struct KerrPass {
  KerrAmplitudes near, far;  // at the matching radius and at twice it
  double log_near, log_far;  // the accumulated scale at each
  long steps;
};

// Integrates in pieces of unit length in t, renormalising between them so that the absolute part
// of the error control keeps its meaning (|R| changes by many decades on the way out).
KerrPass kerr_integrate(const TeukolskyRadial& eq, const KerrHorizonStart& start, double r_match, double rel,
                        long* evaluations) {
  namespace odeint = boost::numeric::odeint;
  using Checker = odeint::default_error_checker<double, odeint::array_algebra, odeint::default_operations>;
  odeint::controlled_runge_kutta<odeint::runge_kutta_fehlberg78<KerrState>> stepper(
      Checker(rel * tolerance::ode_absolute_fraction, rel));
  const KerrRadialSystem system{eq, evaluations};
  KerrState y = start.state;
  double scale = start.log_scale, t = start.t;
  long steps = 0;
  const auto advance = [&](double t_end) {
    while (t < t_end) {
      const double t_next = std::min(t_end, t + 1.0);
      const double z = std::exp(t);
      const double h0 = 0.05 / (1.0 + eq.omega * z + std::abs(eq.omega * 2.0 * eq.hole.r_plus - eq.hole.a * eq.m));
      steps += odeint::integrate_adaptive(stepper, system, y, t, t_next, h0);
      t = t_next;
      const double norm = std::max({std::abs(y[0]), std::abs(y[1]), std::abs(y[2]), std::abs(y[3])});
      for (auto& v : y) v /= norm;
      scale += std::log(norm);
    }
  };
  KerrPass pass{};
  advance(std::log(r_match - eq.hole.r_plus));
  pass.near = kerr_decompose(eq, r_match, y);
  pass.log_near = scale;
  advance(std::log(2.0 * r_match - eq.hole.r_plus));
  pass.far = kerr_decompose(eq, 2.0 * r_match, y);
  pass.log_far = scale;
  pass.steps = steps;
  return pass;
}

// The factor Gamma / |B_t/B_inc|^2 (see kerr_solver.hpp), with |B_t| = d^s from the series.
double flux_factor(const KerrMode& mode, double s, double omega, double k_h, double d) {
  const int two_s = mode.twice_spin;
  const double abs_s = 0.5 * two_s;
  cd pi = 1.0;
  for (int j = 0; j < two_s; ++j) pi *= cd((abs_s - j) * d, -2.0 * k_h);
  const cd lead = cd(k_h, -abs_s * d / 2.0) / omega;
  const cd value = s >= 0 ? lead * std::pow(cd(0.0, 2.0 * omega), two_s) / std::conj(pi)
                          : lead * pi / std::pow(cd(0.0, -2.0 * omega), two_s);
  // The combination is real by construction (flux conservation); a residue is rounding.
  return value.real() * std::pow(d, 2.0 * s);
}

void check_kerr_inputs(const KerrMode& mode, double x, double hole_spin) {
  if (!std::isfinite(x) || x <= 0)
    throw InputError(fmt::format("Kerr greybody: x = {}: expected a finite frequency x = G M omega / c^3 > 0", x));
  if (x < 1e-20)
    throw InputError(fmt::format("Kerr greybody: x = {:.4g}: below the solver's range; expected x >= 1e-20", x));
  if (x > tolerance::solver_max_x)
    throw InputError(fmt::format("Kerr greybody: x = {:.4g}: above the solver's range; expected x <= {:g}", x,
                                 tolerance::solver_max_x));
  const KerrHole h = make_kerr_hole(hole_spin);
  const double k_h = x * 2.0 * h.r_plus - h.a * mode.m();
  if (mode.twice_spin % 2 == 0 && std::abs(k_h) < tolerance::kerr_threshold_gap)
    throw InputError(
        fmt::format("Kerr greybody: x = {:.12g}: at the superradiant threshold m Omega_H = {:.12g} "
                    "(Gamma = 0 there); expected x at least {:.0e} away",
                    x, mode.m() * h.angular_velocity, tolerance::kerr_threshold_gap));
}

}  // namespace

KerrTransmission solve_kerr_transmission(const KerrMode& mode, double x, double hole_spin,
                                         const KerrSolverOptions& options) {
  options.validate();
  check_kerr_inputs(mode, x, hole_spin);
  const KerrHole hole = make_kerr_hole(hole_spin);
  const double s = options.spin_weight * mode.spin();
  const double c = hole.a * x;
  const SpheroidalEigenvalue angular = spheroidal_eigenvalue(s, mode.l(), mode.m(), c);
  const Estimate lambda = radial_separation_constant(angular.separation, mode.m(), c);
  const TeukolskyRadial eq{hole, s, x, mode.m(), lambda.value};
  const double d = hole.r_plus - hole.r_minus;
  const double k_h = x * 2.0 * hole.r_plus - hole.a * mode.m();

  const KerrHorizonStart start = kerr_horizon_start(eq, options.horizon_series);
  const double r_match = kerr_matching_radius(eq, options.series_truncation);
  long evaluations = 0;
  const KerrPass fine = kerr_integrate(eq, start, r_match, options.ode_relative, &evaluations);
  const KerrPass check = kerr_integrate(eq, start, r_match, options.ode_relative * options.check_factor, &evaluations);

  const double factor = flux_factor(mode, s, x, k_h, d);
  const auto gamma_of = [&](const KerrAmplitudes& a, double log_scale) {
    return factor / std::norm(a.in) * std::exp(-2.0 * log_scale);
  };
  KerrTransmission t;
  t.separation = lambda;
  t.superradiant = k_h < 0;
  t.horizon_frequency = x - mode.m() * hole.angular_velocity;
  t.gamma.value = gamma_of(fine.far, fine.log_far);
  const double near = gamma_of(fine.near, fine.log_near), loose = gamma_of(check.far, check.log_far);
  const double series = std::max(fine.near.series_error, fine.far.series_error);
  // Honest error: tolerance dependence, matching-radius dependence, both series' truncation.
  t.gamma.error = std::abs(t.gamma.value - loose) + std::abs(t.gamma.value - near) +
                  (2.0 * series + 2.0 * start.series_error) * std::abs(t.gamma.value);
  if (mode.twice_spin == 0) {
    t.reflection = std::norm(fine.far.out / fine.far.in);
    t.flux_defect = std::abs(t.gamma.value + *t.reflection - 1.0);
  }

  auto& sm = t.summary;
  sm.rhs_evaluations = evaluations;
  sm.steps = fine.steps + check.steps;
  sm.match_radius = r_match;
  sm.start_z = std::exp(start.t);
  sm.horizon_terms = start.terms;
  if (!std::isfinite(t.gamma.value) || !std::isfinite(t.gamma.error))
    throw NumericalError("Kerr greybody solver",
                         fmt::format("{} at x = {:.6g}, a* = {}: non-finite result (Gamma = {}, error = {})",
                                     describe(mode), x, hole_spin, t.gamma.value, t.gamma.error));
  const double relative_error = t.gamma.value != 0 ? t.gamma.error / std::abs(t.gamma.value) : INFINITY;
  sm.status = relative_error < 1e-6 ? SolveStatus::converged : SolveStatus::not_converged;
  sm.message = fmt::format(
      "{} at x = {:.6g}, a* = {}{}: Gamma = {:.10e} +- {:.2e} (relative {:.1e}); lambda = {:.12g}; "
      "horizon series {} terms from z = {:.3g}, matched at r = {:.4g} M; {} steps, {} evaluations",
      describe(mode), x, hole_spin, t.superradiant ? " (superradiant)" : "", t.gamma.value, t.gamma.error,
      relative_error, lambda.value, start.terms, sm.start_z, r_match, sm.steps, sm.rhs_evaluations);
  return t;
}

}  // namespace ember::greybody
