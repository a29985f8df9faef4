#include "ember/tunnelling/static_instanton.hpp"

#include <fmt/format.h>

#include <cmath>
#include <optional>
#include <string>

#include "ember/core/errors.hpp"
#include "ember/tunnelling/landscape.hpp"
#include "static_shooter.hpp"

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
  if (!(linear_gap > 1e-14 && linear_gap < 1e-3))
    throw InputError(fmt::format("static instanton options: linear_gap = {}: must lie in (1e-14, 1e-3)", linear_gap));
  if (!(thinnest_gap >= -700 && thinnest_gap <= -30))
    throw InputError(fmt::format("static instanton options: thinnest_gap = {}: must lie in [-700, -30]", thinnest_gap));
}

namespace {

using detail::Aim;
using detail::Shooter;
using detail::Shot;
using detail::ShotResult;

struct Bracket {
  Aim under, over;
};

Aim field_aim(double ln_phi_h) {
  return {Aim::Kind::log_field, ln_phi_h};
}
Aim gap_aim(double ln_delta) {
  return {Aim::Kind::log_gap, ln_delta};
}

std::string seed_text(double mass) {
  return fmt::format("M = {:.4g} GeV ({:.4g} M_Pl)", mass, mass / units::planck_mass);
}

// Up from the escape point in ln phi_h by 1/2 until a shot overshoots. Returns nullopt when a
// true minimum exists and the first overshoot comes only at (or not even at) the cap just below
// it: the wall may be thinner than ln phi_h resolves, and the caller re-brackets in ln delta from
// `last_under`.
std::optional<Bracket> bracket_in_field(Shooter& sh, double s_escape, double s_top, bool has_minimum, double mass,
                                        double& last_under) {
  double s_under = s_escape, s_over = s_under;
  for (int i = 0;; ++i) {
    s_over = std::min(s_over + 0.5, s_top - 1e-12);
    const bool at_cap = s_over >= s_top - 1e-12;
    const bool over = sh.shoot(field_aim(s_over)).kind == Shot::overshoot;
    if (at_cap && has_minimum) {
      last_under = s_under;
      return std::nullopt;
    }
    if (over) return Bracket{field_aim(s_under), field_aim(s_over)};
    s_under = s_over;
    if (at_cap || i > 400)
      throw NumericalError("static instanton shooting",
                           fmt::format("no overshoot for phi_h up to {:.4g} GeV around {}: no static bubble at this "
                                       "mass",
                                       std::exp(s_over), seed_text(mass)));
  }
}

// Down in ln delta (delta = phi_t - phi_h) from the last undershoot, by 2 until a shot overshoots.
Bracket bracket_in_gap(Shooter& sh, const detail::TrueMinimum& t, double escape, double s_under, const StaticOptions& o,
                       double mass) {
  const double t_escape = std::log(t.phi - escape), t_thinnest = std::log(t.phi) + o.thinnest_gap;
  double t_under = std::min(std::log(-t.phi * std::expm1(s_under - std::log(t.phi))), t_escape);
  // Launched from the linearised interior this shot can differ from its ln phi_h twin: if it
  // overshoots, step back up toward the escape point (which undershoots).
  for (double t_over = t_under; sh.shoot(gap_aim(t_under)).kind == Shot::overshoot; t_over = t_under) {
    if (t_under >= t_escape)
      throw NumericalError(
          "static instanton shooting",
          fmt::format("the shot from the escape point overshoots in ln delta around {}", seed_text(mass)));
    t_under = std::min(t_under + 0.5, t_escape);
    if (sh.shoot(gap_aim(t_under)).kind == Shot::undershoot) return {gap_aim(t_under), gap_aim(t_over)};
  }
  for (double t_over = t_under - 2;; t_over -= 2) {
    if (t_over < t_thinnest)
      throw NumericalError("static instanton resolution",
                           fmt::format("no overshoot for phi_h up to phi_t - {:.3g} phi_t (phi_t = {:.4g} GeV) around "
                                       "{}: no static bubble with a wall we resolve",
                                       std::exp(t_over + 2) / t.phi, t.phi, seed_text(mass)));
    if (sh.shoot(gap_aim(t_over)).kind == Shot::overshoot) return {gap_aim(t_under), gap_aim(t_over)};
    t_under = t_over;
  }
}

struct Bisection {
  Aim under, over;
  ShotResult under_shot, over_shot;
  int steps = 0;
  bool closed = false;
};

// Known end shots (from a verification) are reused rather than shot again.
Bisection bisect(Shooter& sh, const Bracket& b, double tolerance, std::optional<ShotResult> under_known = std::nullopt,
                 std::optional<ShotResult> over_known = std::nullopt) {
  Bisection out{b.under, b.over, under_known.value_or(ShotResult{}), over_known.value_or(ShotResult{}), 0, false};
  bool have_over = over_known.has_value(), have_under = under_known.has_value();
  const auto wide = [&] {
    return std::abs(out.over.param - out.under.param) > tolerance * std::max(1.0, std::abs(out.over.param));
  };
  for (; out.steps < 400 && wide(); ++out.steps) {
    Aim mid = out.under;
    mid.param = 0.5 * (out.under.param + out.over.param);
    if (mid.param == out.under.param || mid.param == out.over.param) break;
    const ShotResult r = sh.shoot(mid);
    if (r.kind == Shot::overshoot) {
      out.over = mid;
      out.over_shot = r;
      have_over = true;
    } else {
      out.under = mid;
      out.under_shot = r;
      have_under = true;
    }
  }
  if (!have_over) out.over_shot = sh.shoot(out.over);
  if (!have_under) out.under_shot = sh.shoot(out.under);
  out.closed = !wide();
  return out;
}

// While the bracket is wide, a shot's verdict (over or under) does not need the full step
// tolerance: the first stretch of the bisection runs on a shooter `coarse_step_factor` times
// looser, down to a bracket `coarse_width` wide (relative, as shooting_tolerance). Its ends are
// then shot at full tolerance; an end the full shot contradicts becomes the other end, and the
// bracket is widened (doubling) toward the original one, whose ends full-tolerance shots found,
// until both ends hold. The full-tolerance bisection then closes the bracket under the same
// stopping rule as before, so only the cost changes: about a sixth of a solve.
constexpr double coarse_step_factor = 1e3, coarse_step_max = 1e-6, coarse_width = 1e-8;

struct Verified {
  Bracket bracket;
  ShotResult under, over;
  int coarse_steps = 0;
};

Verified narrow_coarsely(Shooter& coarse, Shooter& full, const Bracket& original) {
  const Bisection c = bisect(coarse, original, coarse_width);
  Verified v{{c.under, c.over}, {}, {}, c.steps};
  // The over end lies on this side of the under end (the parameter may fall or rise with phi_h).
  const double up = c.over.param > c.under.param ? 1.0 : -1.0;
  // Moves `end` by `step` (signed), no further than `limit`.
  const auto move = [](Aim& end, double step, const Aim& limit) {
    end.param += step;
    if ((end.param - limit.param) * step >= 0) end = limit;
  };
  double width = std::abs(c.over.param - c.under.param);
  bool over_checked = false;
  for (;;) {
    v.under = full.shoot(v.bracket.under);
    if (v.under.kind == Shot::undershoot) break;
    v.bracket.over = v.bracket.under;  // a full-tolerance overshoot: the solution lies beyond it
    v.over = v.under;
    over_checked = true;
    width *= 2;
    move(v.bracket.under, -up * width, original.under);
  }
  while (!over_checked) {
    v.over = full.shoot(v.bracket.over);
    if (v.over.kind == Shot::overshoot) break;
    v.bracket.under = v.bracket.over;
    v.under = v.over;
    width *= 2;
    move(v.bracket.over, up * width, original.over);
  }
  return v;
}

// The bisection on the launch parameter, bracketed and closed to the shooting tolerance (first
// with a coarse shooter where that tolerance is tight), with the coarse shooter's counts.
struct Shooting {
  Bisection bis;
  long coarse_evaluations = 0;
  int coarse_steps = 0;
};

Shooting shoot_bubble(const higgs::Potential& pot, const Landscape& L,
                      const std::optional<detail::TrueMinimum>& minimum, Shooter& sh, double mass, double r_h,
                      const StaticOptions& o) {
  // Bracket: the escape point should undershoot; go up until a shot overshoots. For very heavy
  // holes (about 1e13 M_Pl in the Standard Model) even the escape point overshoots and there is
  // nothing to bracket: say so rather than bisect onto a wrong end.
  const double s_escape = std::log(L.escape);
  if (sh.shoot(field_aim(s_escape)).kind == Shot::overshoot)
    throw NumericalError("static instanton shooting",
                         fmt::format("phi_h at the escape point {:.4g} GeV already overshoots around {}: the static "
                                     "bubble is not bracketed",
                                     L.escape, seed_text(mass)));
  double last_under = s_escape;
  const double s_top = std::log(L.true_minimum ? *L.true_minimum : pot.field_max());
  std::optional<Bracket> bracket = bracket_in_field(sh, s_escape, s_top, minimum.has_value(), mass, last_under);
  if (!bracket) bracket = bracket_in_gap(sh, *minimum, L.escape, last_under, o, mass);
  Shooting out;
  if (o.shooting_tolerance < coarse_width) {
    Shooter coarse(pot, r_h, o.back_reaction ? o.newton_G : 0.0,
                   std::min(coarse_step_max, coarse_step_factor * o.relative_tolerance), L.barrier_top, minimum);
    const Verified v = narrow_coarsely(coarse, sh, *bracket);
    out.bis = bisect(sh, v.bracket, o.shooting_tolerance, v.under, v.over);
    out.coarse_evaluations = coarse.evaluations();
    out.coarse_steps = v.coarse_steps;
  } else {
    out.bis = bisect(sh, *bracket, o.shooting_tolerance);
  }
  return out;
}

// B from the mass shift: back-reacted, B = 4 pi G (M_+ + M_-) Delta M (the difference of the
// horizon areas over 4G); probe, Delta M / T_H with T_H = 1 / (8 pi G M).
void set_action(StaticSolution& out, double mass, const StaticOptions& o) {
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
  if (!(out.action.value > 0) || !std::isfinite(out.action.value) || !std::isfinite(out.action.error))
    throw NumericalError("static instanton shooting",
                         fmt::format("B = {:.6g} +- {:.2g} around M = {:.4g} M_Pl (phi_h = {:.4g} GeV): expected a "
                                     "finite B > 0",
                                     out.action.value, out.action.error, mass / units::planck_mass, out.phi_horizon));
}

void summarise(StaticSolution& out, const Landscape& L, double mass, double r_h, int bisections, long evaluations,
               bool back_reaction) {
  out.summary.bisections = bisections;
  out.summary.rhs_evaluations = evaluations;
  const double rel_err = std::abs(out.action.error / out.action.value);
  out.summary.status =
      (rel_err < 1e-4 && !out.at_resolution_limit) ? SolveStatus::converged : SolveStatus::not_converged;
  out.summary.message = fmt::format(
      "{} static bubble around M = {:.6g} M_Pl: B = {:.8g} +- {:.2g}, Delta M / M = {:.4g}, phi_h = {:.6g} GeV, "
      "bubble at r = {:.4g} r_h{}; {} bisections, {} evaluations, {}",
      back_reaction ? "back-reacted" : "probe", mass / units::planck_mass, out.action.value, out.action.error,
      out.mass_shift.value / mass, out.phi_horizon, out.bubble_radius / r_h,
      out.horizon_gap ? fmt::format(" (phi_t - phi_h = {:.3g} phi_t)", *out.horizon_gap / *L.true_minimum) : "",
      bisections, evaluations,
      out.max_residual ? fmt::format("residual {:.1e}", *out.max_residual) : "residual not checked");
}

}  // namespace

StaticSolution solve_static(const higgs::Potential& pot, double mass, const StaticOptions& o) {
  o.validate();
  if (!(mass > 0) || !std::isfinite(mass))
    throw InputError(fmt::format("static instanton: mass {} GeV; expected a finite mass > 0", mass));
  const Landscape L = analyse_landscape(pot, o.scan_from > 0 ? o.scan_from : pot.field_max() * 1e-40);
  const double r_h = 2 * o.newton_G * mass;
  std::optional<detail::TrueMinimum> minimum;
  if (L.true_minimum) {
    const double t = *L.true_minimum;
    minimum = detail::TrueMinimum{t, pot.value(t), pot.curvature(t), o.linear_gap * (t - L.barrier_top)};
  }
  Shooter sh(pot, r_h, o.back_reaction ? o.newton_G : 0.0, o.relative_tolerance, L.barrier_top, minimum);
  const Shooting shot = shoot_bubble(pot, L, minimum, sh, mass, r_h, o);
  const Bisection& bis = shot.bis;
  const ShotResult &under = bis.under_shot, &over = bis.over_shot;

  StaticSolution out;
  // Unresolved: the bracket did not close before double precision ran out.
  out.at_resolution_limit = !bis.closed;
  // Tail of the undershoot: phi ~ C/r beyond its stop, 2 pi C^2 / R (f ~ 1 there).
  const double r_stop = r_h * std::exp(under.stop_x), c = under.stop_field * r_stop;
  const double tail = 2 * units::pi * c * c / r_stop;
  const double dm_low = under.mass_shift + tail, dm_high = over.mass_shift;
  out.mass_shift = {0.5 * (dm_low + dm_high),
                    0.5 * std::abs(dm_high - dm_low) + o.relative_tolerance * std::abs(dm_low)};
  Aim mid = bis.under;
  mid.param = 0.5 * (bis.under.param + bis.over.param);
  out.phi_horizon = sh.phi_horizon(mid);
  if (mid.kind == Aim::Kind::log_gap) out.horizon_gap = std::exp(mid.param);
  out.bubble_radius = r_h * std::exp(under.wall_x);
  // Checked from the launch up to where the two ends of the bracket part (beyond, the shot is not
  // the solution).
  const double x_check = under.launch_x + 0.95 * (std::min(under.stop_x, over.stop_x) - under.launch_x);
  if (o.residual_check) out.max_residual = sh.field_residual(bis.under, x_check, 20000);
  set_action(out, mass, o);
  if (o.direct_action && o.back_reaction) out.direct_action = sh.direct_action(bis.under, out.mass_shift.value);
  summarise(out, L, mass, r_h, shot.coarse_steps + bis.steps, sh.evaluations() + shot.coarse_evaluations,
            o.back_reaction);
  return out;
}

bool no_static_solution(const NumericalError& e) {
  return e.solver() == "static instanton shooting" || wall_beyond_resolution(e);
}

bool wall_beyond_resolution(const NumericalError& e) {
  return e.solver() == "static instanton resolution";
}

}  // namespace ember::tunnelling
