#include "ember/tunnelling/unseeded.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <vector>

#include "ember/core/errors.hpp"
#include "ember/core/finite.hpp"
#include "ember/core/text.hpp"
#include "ember/units/constants.hpp"

namespace ember::tunnelling {

namespace {
constexpr double unseeded_mbar2 = units::reduced_planck_mass * units::reduced_planck_mass;
}  // namespace

// The running's own nodes (evenly spaced in ln mu, running.cpp), so this natural cubic is the
// running's lambda spline itself, now with derivatives for the shooting.
FubiniScalePotential::FubiniScalePotential(const higgs::StandardModelPotential& sm, double kappa)
    : base_description_(sm.description()),
      base_identity_(sm.identity()),
      kappa_(kappa),
      ln_kappa_(std::log(kappa)),
      lambda6_(sm.options().lambda6),
      lambda8_(sm.options().lambda8) {
  if (!(kappa >= 1) || !std::isfinite(kappa))
    throw InputError(fmt::format("Fubini-scale potential: kappa = {}; expected a finite kappa >= 1", kappa));
  const higgs::Running& run = sm.running();
  const double t0 = std::log(run.mu_min()), t1 = std::log(run.mu_max());
  const int intervals = static_cast<int>(std::ceil((t1 - t0) / run.options().node_spacing));
  std::vector<double> y(static_cast<std::size_t>(intervals) + 1);
  for (int i = 0; i <= intervals; ++i)
    y[static_cast<std::size_t>(i)] = run.lambda(std::min(run.mu_max(), std::exp(t0 + (t1 - t0) * i / intervals)));
  lambda_ = std::make_shared<const UniformCubic>(t0, t1, y);
  field_max_ = kappa * run.mu_max();
}

UniformCubic::Point FubiniScalePotential::lambda_at(double h) const {
  const double t = std::log(h) - ln_kappa_;
  const bool inside = t > lambda_->x0() && t < lambda_->x1();
  UniformCubic::Point p = lambda_->at(std::clamp(t, lambda_->x0(), lambda_->x1()));
  if (!inside) p.first = p.second = 0;  // held constant outside the running's range
  return p;
}

higgs::ValueSlope FubiniScalePotential::value_slope(double h) const {
  const UniformCubic::Point p = lambda_at(h);
  const double h2 = h * h, h3 = h2 * h, h4 = h2 * h2;
  // d/dh [l(ln h) h^4/4] = h^3 (l + l'/4), l' = dl/d ln h.
  return {p.value * h4 / 4 + lambda6_ * h4 * h2 / (6 * unseeded_mbar2) +
              lambda8_ * h4 * h4 / (8 * unseeded_mbar2 * unseeded_mbar2),
          h3 * (p.value + p.first / 4) + lambda6_ * h3 * h2 / unseeded_mbar2 +
              lambda8_ * h4 * h3 / (unseeded_mbar2 * unseeded_mbar2)};
}

double FubiniScalePotential::curvature(double h) const {
  const UniformCubic::Point p = lambda_at(h);
  const double h2 = h * h;
  // d/dh [h^3 (l + l'/4)] = h^2 (3 l + 3 l'/4 + l' + l''/4).
  return h2 * (3 * p.value + 1.75 * p.first + p.second / 4) + 5 * lambda6_ * h2 * h2 / unseeded_mbar2 +
         7 * lambda8_ * h2 * h2 * h2 / (unseeded_mbar2 * unseeded_mbar2);
}

std::string FubiniScalePotential::description() const {
  return fmt::format("{}; MS-bar lambda at mu = h/kappa, kappa = {}", base_description_, format_real(kappa_));
}

std::string FubiniScalePotential::identity() const {
  return fmt::format("fubini_scale kappa {:a} {}", kappa_, base_identity_);
}

UnseededBounce solve_unseeded_bounce(const higgs::StandardModelPotential& sm, double kappa) {
  const FubiniScalePotential pot(sm, kappa);
  UnseededBounce u;
  u.bounce = solve_flat_bounce(pot, {});
  u.kappa = kappa;
  u.scale = u.bounce.center_field / kappa;
  return u;
}

namespace {

std::string numerical_prescription(const higgs::StabilityReport& first, double kappa, const FlatBounce& b) {
  return fmt::format(
      "numerical O(4) bounce of the full potential V = lambda(mu = h/kappa) h^4/4 + lambda6 h^6/(6 Mbar^2) + "
      "lambda8 h^8/(8 Mbar^4) (Mbar the reduced Planck mass), kappa = sqrt(8/|lambda_min|) = {:.4g}, bounce scale "
      "mu_b = phi(0)/kappa; N = (mu_b/H0)^4 e^{{-S}}; used because the operators' first order fails "
      "(|Delta S_ops|/S = {:.3g} on the Fubini family); {}",
      kappa, std::abs(first.operator_fraction), b.summary.message);
}

}  // namespace

higgs::StabilityReport analyse_unseeded(const higgs::StandardModelPotential& sm, const higgs::StabilityOptions& o) {
  higgs::StabilityReport r = higgs::analyse_stability(sm, o);
  // No Fubini bounce at all (lambda >= 0 up to M_Pl) leaves kappa undefined: the family's "none"
  // stands, and so does a first order that holds.
  if (r.operators_first_order || !r.log10_expected_decays || !(r.lambda_min < 0)) return r;
  const double kappa = std::sqrt(8 / std::abs(r.lambda_min));
  UnseededBounce u;
  try {
    u = solve_unseeded_bounce(sm, kappa);
  } catch (const InputError& e) {
    // The operators lift the full potential above the false vacuum everywhere (near-critical
    // inputs: small |lambda_min| puts the field at kappa mu, far out). The family with the
    // operators' share held at the bound then bounds N from above.
    higgs::restrict_unseeded_to_first_order(sm, o, r);
    r.prescription += fmt::format("; the full potential has no bounce ({})", e.what());
    return r;
  } catch (const NumericalError& e) {
    // No bounce of the full potential: with V falling faster than h^4 (lambda6 < 0, say) a
    // solution from phi(0) never reaches the false vacuum (4D is supercritical beyond phi^4:
    // the action has no minimum over the bounce size). The family with the operators' share held
    // at the bound then bounds N, from below for such operators (the prescription says which).
    higgs::restrict_unseeded_to_first_order(sm, o, r);
    r.prescription += fmt::format("; the numerical bounce of the full potential was not found ({})", e.what());
    return r;
  }
  r.unseeded_method = higgs::UnseededMethod::numerical_bounce;
  r.bounce_action = u.bounce.action.value;
  r.bounce_action_error = u.bounce.action.error;
  r.bounce_scale = u.scale;
  r.bounce_at_scan_edge = false;  // no scan: the bounce fixes its own scale
  r.log10_expected_decays = (4 * std::log(u.scale / o.hubble_rate) - r.bounce_action) / std::log(10.0);
  r.prescription = numerical_prescription(r, kappa, u.bounce);
  if (u.scale > o.scale_limit)
    r.prescription +=
        fmt::format("; the bounce scale {:.3g} GeV lies above {:.3g} GeV, where gravity cannot be left out", u.scale,
                    o.scale_limit);
  r.verdict = higgs::verdict_of(r.quartic_min, r.log10_expected_decays);
  // Module boundary (no NaN leaves a module).
  require_finite(
      *r.log10_expected_decays, "tunnelling: unseeded bounce", "log10 N", [&] { return sm.description(); },
      "smaller lambda6 and lambda8");
  return r;
}

}  // namespace ember::tunnelling
