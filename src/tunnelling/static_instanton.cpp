#include "ember/tunnelling/static_instanton.hpp"

#include <fmt/format.h>

#include <array>
#include <cmath>

#include "ember/core/errors.hpp"
#include "ember/core/odeint.hpp"

namespace ember::tunnelling {

void StaticOptions::validate() const {
  if (!(newton_G >= 0) || !std::isfinite(newton_G))
    throw InputError(fmt::format("static instanton options: newton_G = {}: must be finite and >= 0", newton_G));
  if (!(relative_tolerance > 1e-15 && relative_tolerance < 1e-4))
    throw InputError(fmt::format("static instanton options: relative_tolerance = {}: must lie in (1e-15, 1e-4)",
                                 relative_tolerance));
  if (!(shooting_tolerance > 1e-16 && shooting_tolerance < 1e-3))
    throw InputError(fmt::format("static instanton options: shooting_tolerance = {}: must lie in (1e-16, 1e-3)",
                                 shooting_tolerance));
}

namespace {

using State = std::array<double, 3>;  // phi, psi = d phi/dx, DeltaM

enum class Shot { overshoot, undershoot };

struct ShotResult {
  Shot kind;
  double mass_shift;  // DeltaM at the stop (tail added later)
  double stop_x, stop_field;
  double wall_x;
  double max_residual;
};

struct Shooter {
  const higgs::Potential& pot;
  double r_h;
  double G;  // in the field equations and f (0 in the probe limit)
  double rel;
  double barrier_top;
  long evaluations = 0;

  double f_of(double x, double dm) const { return -std::expm1(-x) - 2 * G * dm / (r_h * std::exp(x)); }

  void rhs(const State& s, State& ds, double x) {
    ++evaluations;
    const double r = r_h * std::exp(x), r2 = r * r;
    const double v = pot.value(s[0]), dv = pot.slope(s[0]);
    const double f = f_of(x, s[2]);
    ds[0] = s[1];
    ds[1] = (r2 * dv - (1 - 8 * units::pi * G * r2 * v) * s[1]) / f;
    ds[2] = 4 * units::pi * r * (0.5 * f * s[1] * s[1] + r2 * v);
  }

  // The regular solution a short way off the horizon, to second order in x (derived from the
  // equations above by L'Hopital's rule at f = 0).
  std::pair<double, State> start(double phi_h) const {
    const double v = pot.value(phi_h), dv = pot.slope(phi_h), d2v = pot.curvature(phi_h);
    const double q = 1 - 8 * units::pi * G * r_h * r_h * v;
    const double psi_h = r_h * r_h * dv / q;
    const double n_x = 2 * r_h * r_h * dv + r_h * r_h * d2v * psi_h +
                       8 * units::pi * G * (2 * r_h * r_h * v + r_h * r_h * dv * psi_h) * psi_h;
    const double a = n_x / (2 * q);
    const double x0 = 1e-7;
    return {x0, {phi_h + psi_h * x0 + 0.5 * a * x0 * x0, psi_h + a * x0, 4 * units::pi * r_h * r_h * r_h * v * x0}};
  }

  ShotResult shoot(double ln_phi_h) {
    namespace odeint = boost::numeric::odeint;
    const double phi_h = std::exp(ln_phi_h);
    auto [x, s] = start(phi_h);
    using Checker = odeint::default_error_checker<double, odeint::array_algebra, odeint::default_operations>;
    // Absolute floor on each component: a tiny fraction of its natural scale.
    odeint::controlled_runge_kutta<odeint::runge_kutta_fehlberg78<State>> stepper(Checker(0.0, rel));
    const auto sys = [this](const State& a, State& b, double t) { rhs(a, b, t); };
    double h = 1e-7, wall = 0, worst = 0;  // worst: unused here, see field_residual
    // Near a true minimum psi is tiny and its rounding can flip its sign: an undershoot needs psi
    // to turn clearly positive, against the largest |psi| seen so far.
    double psi_scale = std::abs(s[1]);
    for (long steps = 0; steps < 500000; ++steps) {
      const State before = s;
      const double x_before = x;
      if (stepper.try_step(sys, s, x, h) == odeint::fail) {
        // Steps collapsing means f -> 0: a second horizon would form just outside the first, a
        // singular shot. Near the escape point, where this happens, it is an undershoot.
        if (h < 1e-14 * x || f_of(x, s[2]) <= 0) return {Shot::undershoot, s[2], x, s[0], wall, worst};
        continue;
      }
      if (wall == 0 && s[0] <= barrier_top) wall = x;
      if (s[0] < 0) {
        const double frac = before[0] / (before[0] - s[0]);
        return {
            Shot::overshoot, before[2] + frac * (s[2] - before[2]), x_before + frac * (x - x_before), 0.0, wall, worst};
      }
      psi_scale = std::max(psi_scale, std::abs(s[1]));
      if (s[1] > 1e-9 * psi_scale) return {Shot::undershoot, s[2], x, s[0], wall, worst};
      if (!std::isfinite(s[0]) || !std::isfinite(s[1]) || !std::isfinite(s[2]))
        return {Shot::overshoot, before[2], x_before, 0.0, wall, worst};
      if (x > 700) return {Shot::undershoot, s[2], x, s[0], wall, worst};
    }
    return {Shot::undershoot, s[2], x, s[0], wall, worst};
  }

  // The direct Euclidean action along the shot from ln phi_h (see the header): integrates
  // D = int 4 pi G psi^2 dx (so delta = D - D_inf) and K = int 4 pi r^3 e^D V dx with the field.
  double direct_action(double ln_phi_h, double dm_total) {
    namespace odeint = boost::numeric::odeint;
    using Big = std::array<double, 5>;
    const double phi_h = std::exp(ln_phi_h);
    auto [x, s0] = start(phi_h);
    Big s{s0[0], s0[1], s0[2], 0.0, 0.0};
    const auto sys = [this](const Big& a, Big& b, double t) {
      State da;
      rhs({a[0], a[1], a[2]}, da, t);
      const double r = r_h * std::exp(t);
      b = {da[0], da[1], da[2], 4 * units::pi * G * a[1] * a[1],
           4 * units::pi * r * r * r * std::exp(a[3]) * pot.value(a[0])};
    };
    using Checker = odeint::default_error_checker<double, odeint::array_algebra, odeint::default_operations>;
    odeint::controlled_runge_kutta<odeint::runge_kutta_fehlberg78<Big>> stepper(Checker(0.0, rel));
    double h = 1e-7;
    for (long steps = 0; steps < 2000000; ++steps) {
      const Big before = s;
      if (stepper.try_step(sys, s, x, h) == odeint::fail) continue;
      if (s[0] < 0 || s[1] > 0 || !std::isfinite(s[4])) {
        s = before;
        break;
      }
    }
    const double d_inf = s[3], bulk = std::exp(-d_inf) * s[4];
    const double m_minus = r_h / (2 * G), m_plus = m_minus + dm_total, beta = 8 * units::pi * G * m_plus;
    const double b = 8 * units::pi * G * r_h * r_h * pot.value(phi_h);
    // deficit / 2 pi = 1 - (1 + DeltaM/M_-)(1 - b) e^{delta_h}, formed without cancellation.
    const double deficit = -2 * units::pi * std::expm1(std::log1p(dm_total / m_minus) + std::log1p(-b) - d_inf);
    const double area = 4 * units::pi * r_h * r_h;
    return -beta * bulk - deficit * area / (8 * units::pi * G);
  }

  // Residual of the field equation along the shot from ln phi_h: the solution is re-integrated
  // with dense output (Dormand-Prince 5(4)), sampled every `dx`, and d psi/dx from a fourth-order
  // central difference of the samples is compared with the right-hand side, relative to the
  // larger of |d psi/dx| and |psi|.
  double field_residual(double ln_phi_h, double x_end, double dx) {
    namespace odeint = boost::numeric::odeint;
    auto [x0, s] = start(std::exp(ln_phi_h));
    const auto sys = [this](const State& a, State& b, double t) { rhs(a, b, t); };
    auto stepper = odeint::make_dense_output(rel, rel, odeint::runge_kutta_dopri5<State>());
    std::vector<State> samples;
    std::vector<double> xs;
    // A shot so close to the bracket is very sensitive: a different integrator parts from the
    // solution somewhat earlier. The check stops where this trajectory over- or undershoots.
    struct Parted {};
    try {
      odeint::integrate_const(stepper, sys, s, x0, x_end, dx, [&](const State& st, double t) {
        if (st[0] < 0 || st[1] > 0 || !std::isfinite(st[0])) throw Parted{};
        samples.push_back(st);
        xs.push_back(t);
      });
    } catch (const Parted&) {
    }
    double worst = 0;
    for (std::size_t i = 2; i + 2 < samples.size(); ++i) {
      const double d =
          (-samples[i + 2][1] + 8 * samples[i + 1][1] - 8 * samples[i - 1][1] + samples[i - 2][1]) / (12 * dx);
      State ds;
      rhs(samples[i], ds, xs[i]);
      const double scale = std::max(std::abs(ds[1]), std::abs(samples[i][1])) + 1e-300;
      worst = std::max(worst, std::abs(d - ds[1]) / scale);
    }
    return worst;
  }
};

}  // namespace

StaticSolution solve_static(const higgs::Potential& pot, double mass, const StaticOptions& o) {
  o.validate();
  if (!(mass > 0) || !std::isfinite(mass))
    throw InputError(fmt::format("static instanton: mass {} GeV; expected a finite mass > 0", mass));
  const Landscape L = analyse_landscape(pot, o.scan_from > 0 ? o.scan_from : pot.field_max() * 1e-40);
  const double r_h = 2 * o.newton_G * mass;
  Shooter sh{pot, r_h, o.back_reaction ? o.newton_G : 0.0, o.relative_tolerance, L.barrier_top};

  // Bracket ln phi_h: the escape point should undershoot; go up until a shot overshoots.
  double s_under = std::log(L.escape), s_over = s_under;
  const double s_top = std::log(L.true_minimum ? *L.true_minimum : pot.field_max());
  // For very heavy holes (about 1e13 M_Pl in the Standard Model) even the escape point overshoots
  // and there is nothing to bracket: say so rather than bisect onto a wrong end.
  if (sh.shoot(s_under).kind == Shot::overshoot)
    throw NumericalError("static instanton shooting",
                         fmt::format("phi_h at the escape point {:.4g} GeV already overshoots around M = {:.4g} GeV "
                                     "({:.4g} M_Pl): the static bubble is not bracketed",
                                     L.escape, mass, mass / units::planck_mass));
  for (int i = 0;; ++i) {
    s_over = std::min(s_over + 0.5, s_top - 1e-12);
    if (sh.shoot(s_over).kind == Shot::overshoot) break;
    s_under = s_over;
    if (s_over >= s_top - 1e-12 || i > 400)
      throw NumericalError(
          "static instanton shooting",
          fmt::format("no overshoot for phi_h up to {:.4g} GeV around M = {:.4g} GeV ({:.4g} M_Pl): no static "
                      "bubble at this mass",
                      std::exp(s_over), mass, mass / units::planck_mass));
  }
  ShotResult over{}, under{};
  bool have_over = false, have_under = false;
  int n = 0;
  for (; n < 400 && s_over - s_under > o.shooting_tolerance * std::max(1.0, std::abs(s_over)); ++n) {
    const double mid = 0.5 * (s_over + s_under);
    if (mid == s_over || mid == s_under) break;
    const ShotResult r = sh.shoot(mid);
    if (r.kind == Shot::overshoot) {
      s_over = mid;
      over = r;
      have_over = true;
    } else {
      s_under = mid;
      under = r;
      have_under = true;
    }
  }
  if (!have_over) over = sh.shoot(s_over);
  if (!have_under) under = sh.shoot(s_under);

  StaticSolution out;
  // Unresolved: the bracket did not close, or the solution lies closer to the true minimum than
  // ln phi_h can resolve (the overshoot end never left the cap just below phi_true).
  const bool capped = !have_over && s_over >= s_top - 2e-12;
  out.at_resolution_limit = capped || s_over - s_under > o.shooting_tolerance * std::max(1.0, std::abs(s_over));
  // Tail of the undershoot: phi ~ C/r beyond its stop, 2 pi C^2 / R (f ~ 1 there).
  const double r_stop = r_h * std::exp(under.stop_x), c = under.stop_field * r_stop;
  const double tail = 2 * units::pi * c * c / r_stop;
  const double dm_low = under.mass_shift + tail, dm_high = over.mass_shift;
  out.mass_shift = {0.5 * (dm_low + dm_high),
                    0.5 * std::abs(dm_high - dm_low) + o.relative_tolerance * std::abs(dm_low)};
  out.phi_horizon = std::exp(0.5 * (s_over + s_under));
  out.bubble_radius = r_h * std::exp(under.wall_x);
  // Checked up to where the two ends of the bracket part (beyond, the shot is not the solution).
  const double x_check = std::min(under.stop_x, over.stop_x) * 0.95;
  out.max_residual = sh.field_residual(s_under, x_check, x_check / 20000);
  if (o.back_reaction) {
    out.remnant_mass = mass;
    out.seed_mass = mass + out.mass_shift.value;
    const double k = 4 * units::pi * o.newton_G * (out.seed_mass + mass);
    out.action = {k * out.mass_shift.value, k * out.mass_shift.error};
  } else {
    out.remnant_mass = out.seed_mass = mass;
    const double k = 8 * units::pi * o.newton_G * mass;  // 1 / T_H
    out.action = {k * out.mass_shift.value, k * out.mass_shift.error};
  }
  if (o.direct_action && o.back_reaction) out.direct_action = sh.direct_action(s_under, out.mass_shift.value);
  if (!(out.action.value > 0) || !std::isfinite(out.action.value) || !std::isfinite(out.action.error))
    throw NumericalError("static instanton shooting",
                         fmt::format("B = {:.6g} +- {:.2g} around M = {:.4g} M_Pl (phi_h = {:.4g} GeV): expected a "
                                     "finite B > 0",
                                     out.action.value, out.action.error, mass / units::planck_mass, out.phi_horizon));
  out.summary.bisections = n;
  out.summary.rhs_evaluations = sh.evaluations;
  const double rel_err = std::abs(out.action.error / out.action.value);
  out.summary.status =
      (rel_err < 1e-4 && !out.at_resolution_limit) ? BounceStatus::converged : BounceStatus::not_converged;
  out.summary.message = fmt::format(
      "{} static bubble around M = {:.6g} M_Pl: B = {:.8g} +- {:.2g}, Delta M / M = {:.4g}, phi_h = {:.6g} GeV, "
      "bubble at r = {:.4g} r_h; {} bisections, {} evaluations, residual {:.1e}",
      o.back_reaction ? "back-reacted" : "probe", mass / units::planck_mass, out.action.value, out.action.error,
      out.mass_shift.value / mass, out.phi_horizon, out.bubble_radius / r_h, n, sh.evaluations, out.max_residual);
  return out;
}

}  // namespace ember::tunnelling
