#include "ember/tunnelling/flat_bounce.hpp"

#include <fmt/format.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_sf_bessel.h>
#include <gsl/gsl_sf_gamma.h>

#include <array>
#include <cmath>

#include "ember/core/errors.hpp"
#include "ember/core/odeint.hpp"
#include "ember/units/constants.hpp"

namespace ember::tunnelling {

void FlatBounceOptions::validate() const {
  if (dimensions != 3 && dimensions != 4)
    throw InputError(fmt::format("flat bounce options: dimensions = {}: must be 3 or 4", dimensions));
  if (!(relative_tolerance > 1e-15 && relative_tolerance < 1e-4))
    throw InputError(
        fmt::format("flat bounce options: relative_tolerance = {}: must lie in (1e-15, 1e-4)", relative_tolerance));
  if (!(shooting_tolerance > 1e-16 && shooting_tolerance < 1e-3))
    throw InputError(
        fmt::format("flat bounce options: shooting_tolerance = {}: must lie in (1e-16, 1e-3)", shooting_tolerance));
  if (!(scan_from >= 0)) throw InputError("flat bounce options: scan_from must be >= 0");
}

namespace {

using FlatState = std::array<double, 3>;  // phi, phi', int r^(d-1) phi'^2 dr

enum class FlatShot { overshoot, undershoot };

struct FlatShotResult {
  FlatShot kind;
  double kinetic;  // int r^(d-1) phi'^2 up to the stop
  double stop_radius;
  double stop_field;
  double wall_radius;
};

double sphere_area(int d) {
  return d == 3 ? 4 * units::pi : 2 * units::pi * units::pi;
}

// g(z) = Gamma(d/2) (2/z)^nu I_nu(z), nu = d/2 - 1, and ln of it via the scaled Bessel function.
double log_g(int d, double z) {
  const double nu = 0.5 * d - 1;
  return gsl_sf_lngamma(0.5 * d) + nu * std::log(2 / z) + std::log(gsl_sf_bessel_Inu_scaled(nu, z)) + z;
}
double dlog_g(int d, double z) {  // g'/g = I_{nu+1}/I_nu
  const double nu = 0.5 * d - 1;
  return gsl_sf_bessel_Inu_scaled(nu + 1, z) / gsl_sf_bessel_Inu_scaled(nu, z);
}

struct FlatShooter {
  const higgs::Potential& pot;
  int d;
  double rel;
  std::optional<double> phi_true;
  double mass_true = 0;
  double scale;  // field scale for the deep start and absolute tolerances
  double barrier_top;
  long evaluations = 0;

  // phi(0) for the shooting variable: phi_true - e^s near a true minimum, e^s for a runaway.
  double phi0_of(double s) const { return phi_true ? *phi_true - std::exp(s) : std::exp(s); }

  // Starting radius and state for a shot. delta = e^s is kept apart from phi_true, which it may
  // be far too small to change in double precision.
  std::pair<double, FlatState> start(double shoot) {
    const double phi0 = phi0_of(shoot);
    const double delta = phi_true ? std::exp(shoot) : 0.0;
    const double target = 1e-4 * scale;
    if (phi_true && mass_true > 0 && delta < target) {
      // Linearised solution around the true vacuum, out to where the deviation reaches `target`.
      double z_lo = 1e-8, z_hi = 1.0;
      while (std::log(delta) + log_g(d, z_hi) < std::log(target)) z_hi *= 2;
      for (int i = 0; i < 200 && z_hi - z_lo > 1e-14 * z_hi; ++i) {
        const double z = 0.5 * (z_lo + z_hi);
        (std::log(delta) + log_g(d, z) < std::log(target) ? z_lo : z_hi) = z;
      }
      const double z = z_hi, dev = std::exp(std::log(delta) + log_g(d, z));
      return {z / mass_true, {*phi_true - dev, -dev * dlog_g(d, z) * mass_true, 0.0}};
    }
    // Series at the centre: phi = phi0 + V'(phi0) r^2 / (2d).
    const double curvature = std::abs(pot.curvature(phi0)) + std::abs(pot.slope(phi0) / phi0);
    const double r0 = 1e-6 / std::sqrt(curvature > 0 ? curvature : 1.0);
    const double a = pot.slope(phi0) / (2 * d);
    return {r0, {phi0 + a * r0 * r0, 2 * a * r0, 0.0}};
  }

  FlatShotResult shoot(double shoot_variable) {
    namespace odeint = boost::numeric::odeint;
    auto [r, s] = start(shoot_variable);
    const auto rhs = [&](const FlatState& x, FlatState& dx, double rr) {
      ++evaluations;
      dx[0] = x[1];
      dx[1] = pot.slope(x[0]) - (d - 1) / rr * x[1];
      dx[2] = std::pow(rr, d - 1) * x[1] * x[1];
    };
    using Checker = odeint::default_error_checker<double, odeint::array_algebra, odeint::default_operations>;
    odeint::controlled_runge_kutta<odeint::runge_kutta_fehlberg78<FlatState>> stepper(
        Checker(rel * 1e-10 * scale, rel));
    double h = r * 0.1;
    double wall = 0;
    for (long steps = 0; steps < 2000000; ++steps) {
      const FlatState before = s;
      const double r_before = r;
      if (stepper.try_step(rhs, s, r, h) == odeint::fail) continue;
      if (wall == 0 && s[0] <= barrier_top) wall = r;
      if (s[0] < 0) {  // crossed the false vacuum
        const double frac = before[0] / (before[0] - s[0]);
        const double rc = r_before + frac * (r - r_before);
        return {FlatShot::overshoot, before[2] + frac * (s[2] - before[2]), rc, 0.0, wall};
      }
      if (s[1] > 0) return {FlatShot::undershoot, s[2], r, s[0], wall};
      if (!std::isfinite(s[0]) || !std::isfinite(s[1]))
        return {FlatShot::overshoot, before[2], r_before, before[0], wall};
    }
    return {FlatShot::undershoot, s[2], r, s[0], wall};
  }
};

}  // namespace

namespace {

FlatBounce solve_once(const higgs::Potential& pot, const FlatBounceOptions& o) {
  FlatBounce out;
  out.landscape = analyse_landscape(pot, o.scan_from > 0 ? o.scan_from : pot.field_max() * 1e-40);
  const Landscape& L = out.landscape;
  FlatShooter sh{pot, o.dimensions, o.relative_tolerance, L.true_minimum, 0.0, 0.0, L.barrier_top};
  sh.scale = L.true_minimum ? *L.true_minimum : L.escape;
  if (L.true_minimum) sh.mass_true = std::sqrt(std::max(0.0, pot.curvature(*L.true_minimum)));

  // The shooting variable s: phi0 = phi_true - e^s (true minimum) or phi0 = e^s (runaway).
  const auto phi0_of = [&](double s) { return sh.phi0_of(s); };
  double s_over, s_under;
  if (L.true_minimum) {
    s_under = std::log(*L.true_minimum - L.escape);  // phi0 at the escape point: undershoot
    s_over = std::log(*L.true_minimum) - 700;        // as close to the minimum as doubles allow
    if (sh.shoot(s_over).kind != FlatShot::overshoot)
      throw NumericalError("flat bounce shooting",
                           fmt::format("no overshoot even from phi(0) = phi_true (1 - e^-700); true minimum at {:.6g}",
                                       *L.true_minimum));
  } else {
    s_under = std::log(L.escape);
    s_over = s_under + 1.0;
    int tries = 0;
    while (sh.shoot(s_over).kind != FlatShot::overshoot) {
      s_over += 1.0;
      if (++tries > 100 || phi0_of(s_over) > pot.field_max())
        throw NumericalError(
            "flat bounce shooting",
            fmt::format("no overshoot up to phi(0) = {:.4g} GeV (escape point {:.4g} GeV)", phi0_of(s_over), L.escape));
    }
  }
  FlatShotResult over{}, under{};
  int n = 0;
  for (; n < 400 && std::abs(s_over - s_under) > o.shooting_tolerance * std::max(1.0, std::abs(s_over)); ++n) {
    const double mid = 0.5 * (s_over + s_under);
    const FlatShotResult r = sh.shoot(mid);
    (r.kind == FlatShot::overshoot ? s_over : s_under) = mid;
    (r.kind == FlatShot::overshoot ? over : under) = r;
  }
  if (over.stop_radius == 0) over = sh.shoot(s_over);
  if (under.stop_radius == 0) under = sh.shoot(s_under);

  const int d = o.dimensions;
  const double omega = sphere_area(d) / d;
  const auto action_of = [&](const FlatShotResult& u, const FlatShotResult& v) {
    double tail = 0;
    if (L.false_mass_squared <= 0 || std::sqrt(std::max(0.0, L.false_mass_squared)) * u.stop_radius < 3) {
      const double c = u.stop_field * std::pow(u.stop_radius, d - 2);
      tail = (d - 2) * c * c * std::pow(u.stop_radius, 2 - d);
    }
    return std::pair{omega * (u.kinetic + tail), omega * v.kinetic};
  };
  const auto [s_low, s_high] = action_of(under, over);
  const double value = 0.5 * (s_low + s_high);
  out.action = {value, 0.5 * std::abs(s_high - s_low) + o.relative_tolerance * value};
  out.center_field = phi0_of(0.5 * (s_over + s_under));
  out.wall_radius = under.wall_radius;
  out.summary.bisections = n;
  out.summary.rhs_evaluations = sh.evaluations;
  const double rel_err = out.action.error / out.action.value;
  out.summary.status = rel_err < 1e-4 ? SolveStatus::converged : SolveStatus::not_converged;
  out.summary.message = fmt::format(
      "O({}) bounce: S = {:.10g} +- {:.2g} (relative {:.1e}); phi(0) = {:.6g}, wall at r = {:.4g}; {} bisections, {} "
      "evaluations",
      d, out.action.value, out.action.error, rel_err, out.center_field, out.wall_radius, n, sh.evaluations);
  return out;
}

}  // namespace

FlatBounce solve_flat_bounce(const higgs::Potential& pot, const FlatBounceOptions& o) {
  o.validate();
  FlatBounce out = solve_once(pot, o);
  // The integration error, measured: the whole solve again at a 100 times looser step tolerance.
  // S moves linearly with the tolerance (measured: thin-wall O(4) bounces at eps = 0.1 and 0.02,
  // tolerances 1e-6 to 1e-12), so the error at ours is the difference / 99. The tolerance alone
  // (rel * S) underestimates it up to 12-fold for thin walls (measured), so it is only a floor.
  FlatBounceOptions loose = o;
  loose.relative_tolerance = std::min(1e-4, 100 * o.relative_tolerance);
  if (!(loose.relative_tolerance > 2 * o.relative_tolerance)) return out;  // already as loose as it goes
  FlatBounce check;
  try {
    check = solve_once(pot, loose);
  } catch (const NumericalError& e) {  // the looser solve found no bracket: keep the floor, say so
    out.summary.message +=
        fmt::format("; the error check at tolerance {:.0e} failed ({})", loose.relative_tolerance, e.what());
    return out;
  }
  // Doubled: at the loosest tolerances S(tol) is not yet linear (measured: 1.9x at 1e-6).
  const double integration =
      2 * std::abs(check.action.value - out.action.value) / (loose.relative_tolerance / o.relative_tolerance - 1);
  out.action.error += std::max(0.0, integration - o.relative_tolerance * out.action.value);
  out.summary.rhs_evaluations += check.summary.rhs_evaluations;
  const double rel_err = out.action.error / out.action.value;
  out.summary.status = rel_err < 1e-4 ? SolveStatus::converged : SolveStatus::not_converged;
  out.summary.message += fmt::format("; error includes a re-solve at tolerance {:.0e} (S = {:.10g})",
                                     loose.relative_tolerance, check.action.value);
  return out;
}

}  // namespace ember::tunnelling
