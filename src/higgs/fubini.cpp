#include "ember/higgs/fubini.hpp"

#include <fmt/format.h>

#include <array>
#include <cmath>

#include "ember/core/errors.hpp"
#include "ember/core/odeint.hpp"
#include "ember/units/constants.hpp"

namespace ember::higgs {

double fubini_action(double lambda_abs) {
  return 8 * units::pi * units::pi / (3 * lambda_abs);
}

// Derivation (first order in the operators). On phi(r) = sqrt(8/|lambda|) R/(r^2 + R^2), with
// u = r^2 and the Beta function B(2, n - 2) = 1/((n - 1)(n - 2)),
//   int d^4x phi^n = 2 pi^2 (8/|lambda|)^(n/2) R^n int_0^inf r^3 dr/(r^2 + R^2)^n
//                  = 2 pi^2 (8/|lambda|)^(n/2) R^(4-n) / (2 (n - 1)(n - 2)).
// n = 4 checks the normalisation: int phi^4 = 32 pi^2/(3 lambda^2), so int V = -8 pi^2/(3 |lambda|),
// and with the virial relation (kinetic = -2 int V) S = 8 pi^2/(3 |lambda|), Fubini's action.
// n = 6: int phi^6 = 128 pi^2/(5 |lambda|^3 R^2); times lambda6/(6 Mbar^2) gives the first term.
// n = 8: int phi^8 = 2048 pi^2/(21 |lambda|^4 R^4); times lambda8/(8 Mbar^4) gives the second.
// The Fubini profile extremises the quartic action, so to first order the operators change S by
// their integral over the unperturbed profile; R is held fixed (it is the collective coordinate
// the unseeded rate is maximised over). Second order is measured in tests/test_tunnelling.cpp
// against numerical bounces: the first-order Delta S is off by 0.65 Delta S / S relative.
double operator_action(double lambda_abs, double mu, double lambda6, double lambda8) {
  const double pi2 = units::pi * units::pi;
  const double x = mu * mu / (units::reduced_planck_mass * units::reduced_planck_mass);
  const double l2 = lambda_abs * lambda_abs, l3 = l2 * lambda_abs;
  return 64 * pi2 / 15 * lambda6 * x / l3 + 256 * pi2 / 21 * lambda8 * x * x / (l3 * lambda_abs);
}

QuarticBounce solve_quartic_bounce(double lambda_abs, double phi0, double rel) {
  if (!(lambda_abs > 0) || !(phi0 > 0))
    throw InputError(fmt::format("quartic bounce: |lambda| = {}, phi0 = {}; expected both > 0", lambda_abs, phi0));
  namespace odeint = boost::numeric::odeint;
  using State = std::array<double, 3>;  // phi, phi', action integrand accumulated (without 2 pi^2)
  const double R = std::sqrt(8 / lambda_abs) / phi0;
  // Start off r = 0 with the regular series phi = phi0 + phi0'' r^2/2, phi0'' = V'(phi0)/4.
  const double r0 = 1e-4 * R, c2 = -lambda_abs * phi0 * phi0 * phi0 / 8;
  State s{phi0 + c2 * r0 * r0, 2 * c2 * r0, 0.0};
  const auto rhs = [&](const State& x, State& dx, double r) {
    dx[0] = x[1];
    dx[1] = -3 / r * x[1] - lambda_abs * x[0] * x[0] * x[0];
    dx[2] = r * r * r * (0.5 * x[1] * x[1] - 0.25 * lambda_abs * x[0] * x[0] * x[0] * x[0]);
  };
  const auto integrate = [&](double tolerance, State& state) {
    using Checker = odeint::default_error_checker<double, odeint::array_algebra, odeint::default_operations>;
    odeint::controlled_runge_kutta<odeint::runge_kutta_fehlberg78<State>> stepper(
        Checker(tolerance * 1e-12 * phi0, tolerance));
    return odeint::integrate_adaptive(stepper, rhs, state, r0, 1e4 * R, 1e-3 * R);
  };
  State fine = s, coarse = s;
  QuarticBounce b;
  b.steps = static_cast<long>(integrate(rel, fine) + integrate(rel * 1e3, coarse));
  const double r_end = 1e4 * R;
  const auto total = [&](const State& x) {
    const double c = x[0] * r_end * r_end;  // phi ~ C / r^2 far out
    return 2 * units::pi * units::pi * (x[2] + c * c / (r_end * r_end));
  };
  b.action = {total(fine), std::abs(total(fine) - total(coarse)) + 1e-12 * total(fine)};
  b.radius = R;
  if (!std::isfinite(b.action.value))
    throw NumericalError("quartic bounce (Boost.Odeint rkf78)",
                         fmt::format("non-finite action for |lambda| = {}", lambda_abs));
  return b;
}

}  // namespace ember::higgs
