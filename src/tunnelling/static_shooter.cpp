#include "static_shooter.hpp"

#include <algorithm>
#include <cmath>
#include <vector>

#include "ember/core/odeint.hpp"
#include "ember/units/constants.hpp"

namespace ember::tunnelling::detail {

namespace {
namespace odeint = boost::numeric::odeint;
using units::pi;
using Checker = odeint::default_error_checker<double, odeint::array_algebra, odeint::default_operations>;
template <class S>
auto rkf78_stepper(double rel) {
  // Error control relative to each component only: the components span many decades.
  return odeint::controlled_runge_kutta<odeint::runge_kutta_fehlberg78<S>>(Checker(0.0, rel));
}
using Near = std::array<double, 5>;  // eta = phi_t - phi, chi = d eta/dx, DeltaM, D, K
}  // namespace

Shooter::Shooter(const higgs::Potential& pot, double r_h, double G, double rel, double barrier_top,
                 std::optional<TrueMinimum> minimum)
    : pot_(pot), r_h_(r_h), G_(G), rel_(rel), barrier_top_(barrier_top), min_(minimum) {}

double Shooter::f_of(double x, double dm) const {
  return f_of(x, std::exp(x), dm);
}

// f = 1 - e^{-x} - 2 G DeltaM / r with e^x given. Near the horizon 1 - e^{-x} cancels and needs
// expm1; from x = 1/2 on, 1 - 1/e^x loses under two bits and saves a call in the hot loop.
double Shooter::f_of(double x, double exp_x, double dm) const {
  const double inverse = 1 / exp_x;
  const double outside = x < 0.5 ? -std::expm1(-x) : 1 - inverse;
  return G_ == 0 ? outside : outside - 2 * G_ * dm * inverse / r_h_;  // the probe limit: no back-reaction
}

void Shooter::rhs(const State& s, State& ds, double x) {
  ++evaluations_;
  const double exp_x = std::exp(x), r = r_h_ * exp_x, r2 = r * r;
  const auto [v, dv] = pot_.value_slope(s[0]);
  const double f = f_of(x, exp_x, s[2]);
  ds[0] = s[1];
  ds[1] = (r2 * dv - (1 - 8 * pi * G_ * r2 * v) * s[1]) / f;
  ds[2] = 4 * pi * r * (0.5 * f * s[1] * s[1] + r2 * v);
}

// The regular solution a short way off the horizon, to second order in x (derived from the
// equations by L'Hopital's rule at f = 0).
std::pair<double, State> Shooter::start(double phi_h) const {
  const double v = pot_.value(phi_h), dv = pot_.slope(phi_h), d2v = pot_.curvature(phi_h);
  const double q = 1 - 8 * pi * G_ * r_h_ * r_h_ * v;
  const double psi_h = r_h_ * r_h_ * dv / q;
  const double n_x = 2 * r_h_ * r_h_ * dv + r_h_ * r_h_ * d2v * psi_h +
                     8 * pi * G_ * (2 * r_h_ * r_h_ * v + r_h_ * r_h_ * dv * psi_h) * psi_h;
  const double a = n_x / (2 * q);
  const double x0 = 1e-7;
  return {x0, {phi_h + psi_h * x0 + 0.5 * a * x0 * x0, psi_h + a * x0, 4 * pi * r_h_ * r_h_ * r_h_ * v * x0}};
}

double Shooter::phi_horizon(const Aim& aim) const {
  if (aim.kind == Aim::Kind::log_field) return std::exp(aim.param);
  return min_->phi - std::exp(aim.param);
}

bool Shooter::linearised(const Aim& aim) const {
  return aim.kind == Aim::Kind::log_gap && std::exp(aim.param) < min_->linear_gap;
}

Launch Shooter::launch(const Aim& aim) {
  if (linearised(aim)) return launch_near_minimum(std::exp(aim.param));
  const auto [x, s] = start(phi_horizon(aim));
  return {x, s, 0.0, s[2]};  // K(x0) = 4 pi r_h^3 V x0 = DeltaM(x0) to first order, as below
}

// A thin wall's interior sits exponentially close to phi_t, closer than phi itself can express.
// There the field is carried as eta = phi_t - phi, linearised about the minimum (V = V_t +
// m^2 eta^2/2, V' = -m^2 eta; the dropped terms are of relative size eta / (phi_t - phi_top)),
// until eta reaches the linear gap; the same start as above to first order in delta (derived).
Launch Shooter::launch_near_minimum(double delta) {
  const TrueMinimum& t = *min_;
  const double rh2 = r_h_ * r_h_, q = 1 - 8 * pi * G_ * rh2 * t.value;
  const double psi_h = -rh2 * t.curvature * delta / q;
  const double a =
      (-2 * rh2 * t.curvature * delta + rh2 * t.curvature * psi_h + 16 * pi * G_ * rh2 * t.value * psi_h) / (2 * q);
  double x = 1e-7, h = 1e-7;
  const double k0 = 4 * pi * rh2 * r_h_ * t.value * x;
  Near s{delta - psi_h * x - 0.5 * a * x * x, -psi_h - a * x, k0, 0.0, k0};
  const auto sys = [&](const Near& e, Near& de, double y) {
    ++evaluations_;
    const double r = r_h_ * std::exp(y), r2 = r * r;
    const double v = t.value + 0.5 * t.curvature * e[0] * e[0];
    const double f = f_of(y, e[2]);
    de[0] = e[1];
    de[1] = (r2 * t.curvature * e[0] - (1 - 8 * pi * G_ * r2 * v) * e[1]) / f;
    de[2] = 4 * pi * r * (0.5 * f * e[1] * e[1] + r2 * v);
    de[3] = 4 * pi * G_ * e[1] * e[1];
    de[4] = 4 * pi * r2 * r * std::exp(e[3]) * v;
  };
  auto stepper = rkf78_stepper<Near>(rel_);
  for (long steps = 0; steps < 500000 && s[0] < t.linear_gap && x < 700; ++steps) {
    // eta grows like e^{m r}: at most a factor e^{1/2} per step, so the switch is not overrun.
    h = std::min(h, 0.5 * s[0] / std::max(s[1], 1e-300));
    (void)stepper.try_step(sys, s, x, h);
  }
  return {x, {t.phi - s[0], -s[1], s[2]}, s[3], s[4]};
}

ShotResult Shooter::shoot(const Aim& aim) {
  Launch l = launch(aim);
  double x = l.x;
  State s = l.s;
  auto stepper = rkf78_stepper<State>(rel_);
  const auto sys = [this](const State& a, State& b, double t) { rhs(a, b, t); };
  double h = 1e-7, wall = 0;
  ShotResult out;
  out.launch_x = l.x;
  const auto stop = [&](Shot kind, double dm, double at, double field) {
    out.kind = kind;
    out.mass_shift = dm;
    out.stop_x = at;
    out.stop_field = field;
    out.wall_x = wall;
    return out;
  };
  // Near a true minimum psi is tiny and its rounding can flip its sign: an undershoot needs psi
  // to turn clearly positive, against the largest |psi| seen so far.
  double psi_scale = std::abs(s[1]);
  for (long steps = 0; steps < 500000; ++steps) {
    const State before = s;
    const double x_before = x;
    if (stepper.try_step(sys, s, x, h) == odeint::fail) {
      // Steps collapsing means f -> 0: a second horizon would form just outside the first, a
      // singular shot. Near the escape point, where this happens, it is an undershoot.
      if (h < 1e-14 * x || f_of(x, s[2]) <= 0) return stop(Shot::undershoot, s[2], x, s[0]);
      continue;
    }
    if (wall == 0 && s[0] <= barrier_top_) wall = x;
    if (s[0] < 0) {
      const double frac = before[0] / (before[0] - s[0]);
      return stop(Shot::overshoot, before[2] + frac * (s[2] - before[2]), x_before + frac * (x - x_before), 0.0);
    }
    psi_scale = std::max(psi_scale, std::abs(s[1]));
    if (s[1] > 1e-9 * psi_scale) return stop(Shot::undershoot, s[2], x, s[0]);
    if (!std::isfinite(s[0]) || !std::isfinite(s[1]) || !std::isfinite(s[2]))
      return stop(Shot::overshoot, before[2], x_before, 0.0);
    if (x > 700) return stop(Shot::undershoot, s[2], x, s[0]);
  }
  return stop(Shot::undershoot, s[2], x, s[0]);
}

// Integrates D = int 4 pi G psi^2 dx (so delta = D - D_inf) and K = int 4 pi r^3 e^D V dx with
// the field, then forms the action (formula in static_instanton.hpp).
double Shooter::direct_action(const Aim& aim, double dm_total) {
  using Big = std::array<double, 5>;
  const Launch l = launch(aim);
  double x = l.x;
  Big s{l.s[0], l.s[1], l.s[2], l.d_integral, l.k_integral};
  const auto sys = [this](const Big& a, Big& b, double t) {
    State da;
    rhs({a[0], a[1], a[2]}, da, t);
    const double r = r_h_ * std::exp(t);
    b = {da[0], da[1], da[2], 4 * pi * G_ * a[1] * a[1], 4 * pi * r * r * r * std::exp(a[3]) * pot_.value(a[0])};
  };
  auto stepper = rkf78_stepper<Big>(rel_);
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
  const double m_minus = r_h_ / (2 * G_), m_plus = m_minus + dm_total, beta = 8 * pi * G_ * m_plus;
  const double v_h = linearised(aim) ? min_->value : pot_.value(phi_horizon(aim));
  const double b = 8 * pi * G_ * r_h_ * r_h_ * v_h;
  // deficit / 2 pi = 1 - (1 + DeltaM/M_-)(1 - b) e^{delta_h}, formed without cancellation.
  const double deficit = -2 * pi * std::expm1(std::log1p(dm_total / m_minus) + std::log1p(-b) - d_inf);
  const double area = 4 * pi * r_h_ * r_h_;
  return -beta * bulk - deficit * area / (8 * pi * G_);
}

// The solution is re-integrated with dense output (Dormand-Prince 5(4)), sampled evenly in x,
// and d psi/dx from a fourth-order central difference of the samples is compared with the
// right-hand side, relative to the larger of |d psi/dx| and |psi|. Only the last five samples
// are kept: each centre is checked as soon as its two neighbours on the right arrive.
double Shooter::field_residual(const Aim& aim, double x_end, int samples) {
  const Launch l = launch(aim);
  State s = l.s;
  if (!(x_end > l.x)) return 0;
  const double dx = (x_end - l.x) / samples;
  const auto sys = [this](const State& a, State& b, double t) { rhs(a, b, t); };
  auto stepper = odeint::make_dense_output(rel_, rel_, odeint::runge_kutta_dopri5<State>());
  std::array<State, 5> window{};
  std::array<double, 5> at{};
  long seen = 0;
  double worst = 0;
  // A shot so close to the bracket is very sensitive: a different integrator parts from the
  // solution somewhat earlier. The check stops where this trajectory over- or undershoots.
  struct Parted {};
  try {
    odeint::integrate_const(stepper, sys, s, l.x, x_end, dx, [&](const State& st, double t) {
      if (st[0] < 0 || st[1] > 0 || !std::isfinite(st[0])) throw Parted{};
      std::rotate(window.begin(), window.begin() + 1, window.end());
      std::rotate(at.begin(), at.begin() + 1, at.end());
      window[4] = st;
      at[4] = t;
      if (++seen < 5) return;
      const double d = (-window[4][1] + 8 * window[3][1] - 8 * window[1][1] + window[0][1]) / (12 * dx);
      State ds;
      rhs(window[2], ds, at[2]);
      const double scale = std::max(std::abs(ds[1]), std::abs(window[2][1])) + 1e-300;
      worst = std::max(worst, std::abs(d - ds[1]) / scale);
    });
  } catch (const Parted&) {
  }
  return worst;
}

}  // namespace ember::tunnelling::detail
