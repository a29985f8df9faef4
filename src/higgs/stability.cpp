#include "ember/higgs/stability.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <functional>

#include "ember/core/errors.hpp"
#include "ember/core/finite.hpp"
#include "ember/core/gsl_status.hpp"
#include "ember/core/gsl_tools.hpp"
#include "ember/core/text.hpp"
#include "ember/higgs/fubini.hpp"

namespace ember::higgs {

std::string name_of(UnseededMethod m) {
  switch (m) {
    case UnseededMethod::fubini_first_order: return "fubini_first_order";
    case UnseededMethod::numerical_bounce: return "numerical_bounce";
  }
  return "";
}

std::string name_of(Verdict v) {
  switch (v) {
    case Verdict::stable: return "stable";
    case Verdict::metastable: return "metastable";
    case Verdict::unstable: return "unstable";
  }
  return "";
}

namespace {

using units::pi;
constexpr double grid_step = 0.01;  // scan in ln mu before refining

using Fn = std::function<double(double)>;

// Minimum of f(t) near the grid minimum t_grid, refined by Brent's minimiser within one step, to
// 1e-10 in ln mu.
std::pair<double, double> refine_minimum(const Fn& f, double t_grid, double lo, double hi) {
  const double a = std::max(lo, t_grid - grid_step), b = std::min(hi, t_grid + grid_step);
  if (!(f(t_grid) < f(a) && f(t_grid) < f(b))) return {t_grid, f(t_grid)};  // at an end of the range
  const double t = brent_minimum(f, t_grid, a, b, 1e-10).x;
  return {t, f(t)};
}

// A sign change of f, to 1e-12 in ln mu.
double refine_root(const Fn& f, double a, double b) {
  return brent_root(f, a, b, 1e-12).x;
}

struct GridMin {
  double t, value;
};
GridMin scan_min(const Fn& f, double lo, double hi) {
  GridMin best{lo, f(lo)};
  for (double t = lo; t <= hi; t += grid_step)
    if (const double v = f(t); v < best.value) best = {t, v};
  return best;
}

// The Fubini family's action at mu = 1/R: the quartic part with the MS-bar lambda(mu), and the
// operators on the profile to first order. None where lambda(mu) >= 0 (no bounce).
struct FamilyAction {
  double fubini = 0, operators = 0;
};
std::optional<FamilyAction> family_action(const StandardModelPotential& pot, double mu) {
  const double l = pot.running().lambda(mu);
  if (!(l < 0)) return std::nullopt;
  const StandardModelOptions& so = pot.options();
  return FamilyAction{fubini_action(-l), operator_action(-l, mu, so.lambda6, so.lambda8)};
}

// The minima of lambda (up to M_Pl), lambda_eff and the full quartic 4V/h^4 (up to mu_max), and
// where lambda_eff first turns negative.
void find_minima(const StandardModelPotential& pot, double t_pl, StabilityReport& r) {
  const Running& run = pot.running();
  const double t0 = std::log(run.mu_min()), t1 = std::log(run.mu_max());
  const Fn lambda_t = [&](double t) { return run.lambda(std::exp(t)); };
  const Fn lambda_eff_t = [&](double t) { return pot.lambda_eff(std::exp(t)); };
  const Fn quartic_t = [&](double t) { return pot.quartic(std::exp(t)); };
  const auto [tm, lm] = refine_minimum(lambda_t, scan_min(lambda_t, t0, t_pl).t, t0, t_pl);
  r.lambda_min = lm;
  r.lambda_min_scale = std::exp(tm);
  const auto [te, le] = refine_minimum(lambda_eff_t, scan_min(lambda_eff_t, t0, t1).t, t0, t1);
  r.lambda_eff_min = le;
  r.lambda_eff_min_scale = std::exp(te);
  const auto [tq, lq] = refine_minimum(quartic_t, scan_min(quartic_t, t0, t1).t, t0, t1);
  r.quartic_min = lq;
  r.quartic_min_scale = std::exp(tq);
  for (double t = t0; t + grid_step <= t1; t += grid_step)
    if (lambda_eff_t(t) > 0 && lambda_eff_t(t + grid_step) <= 0) {
      r.instability_scale = std::exp(refine_root(lambda_eff_t, t, t + grid_step));
      break;
    }
}

std::string first_order_prescription() {
  return "Fubini bounce family, S(mu) = 8 pi^2/(3 |lambda(mu)|) with the MS-bar quartic at mu = 1/R, plus the "
         "Planck-suppressed operators integrated over the bounce profile to first order; expected decays "
         "N = max_mu (mu/H0)^4 e^{-S}";
}

// The operators' share of S at one scale: first order, or, with `clip`, first order held within
// +- operator_first_order_bound of the Fubini action (restrict_unseeded_to_first_order).
double operator_share(const FamilyAction& a, const StabilityOptions& o, bool clip) {
  const double cap = o.operator_first_order_bound * a.fubini;
  return clip ? std::clamp(a.operators, -cap, cap) : a.operators;
}

// The unseeded decay along the Fubini family (the header's prescription).
void unseeded_first_order(const StandardModelPotential& pot, const StabilityOptions& o, double t_pl, bool clip,
                          StabilityReport& r) {
  const double t0 = std::log(pot.running().mu_min());
  const Fn minus_log10_n = [&](double t) {
    const auto a = family_action(pot, std::exp(t));
    if (!a) return 1e300;
    return -(4 * (t - std::log(o.hubble_rate)) - (a->fubini + operator_share(*a, o, clip))) / std::log(10.0);
  };
  r.prescription = first_order_prescription();
  r.log10_expected_decays.reset();
  const GridMin best = scan_min(minus_log10_n, t0, t_pl);
  if (!(best.value < 1e299)) return;
  const auto [tb, v] = refine_minimum(minus_log10_n, best.t, t0, t_pl);
  const FamilyAction a = *family_action(pot, std::exp(tb));
  const double share = operator_share(a, o, clip);
  r.log10_expected_decays = -v;
  r.bounce_scale = std::exp(tb);
  r.bounce_at_scan_edge = tb - t0 < 2 * grid_step || t_pl - tb < 2 * grid_step;
  r.bounce_action = a.fubini + share;
  r.operator_action = a.operators;
  r.operator_fraction = a.operators / a.fubini;
  r.operators_first_order = std::abs(r.operator_fraction) <= o.operator_first_order_bound;
  // Second order, from the measured 0.65 (Delta S/S) Delta S, rounded up to 1; the maximum itself
  // is found to 1e-10 in ln mu. A clipped share is uncertain by all it left out.
  r.bounce_action_error = share * share / a.fubini + std::abs(a.operators - share) + 1e-10 * r.bounce_action;
  if (r.operators_first_order) return;
  if (!clip) {
    r.prescription += fmt::format(
        "; first order fails here (|Delta S_ops|/S = {:.3g} > {}): the numerical bounce of the full potential "
        "(tunnelling) is needed",
        std::abs(r.operator_fraction), format_real(o.operator_first_order_bound));
    return;
  }
  // Beyond the bound first order overstates |Delta S_ops| (measured), and the truth lies beyond the
  // clipped share: operators that lower V make N a lower bound, operators that raise it an upper one.
  r.bounce_at_scan_edge = r.bounce_at_scan_edge || a.operators < 0;
  r.prescription += fmt::format(
      "; first order fails at the maximum (|Delta S_ops|/S = {:.3g}), so the operators' share is held at {} of S "
      "there: N is {} bound",
      std::abs(r.operator_fraction), format_real(o.operator_first_order_bound),
      a.operators < 0 ? "a lower" : "an upper");
}

}  // namespace

Verdict verdict_of(double quartic_min, const std::optional<double>& log10_n) {
  if (quartic_min >= 0) return Verdict::stable;
  return log10_n && *log10_n >= 0 ? Verdict::unstable : Verdict::metastable;
}

StabilityReport analyse_stability(const StandardModelPotential& pot, const StabilityOptions& o) {
  use_gsl_status_codes();
  const Running& run = pot.running();
  const double t_pl = std::min(std::log(run.mu_max()), std::log(o.scale_limit));
  StabilityReport r;
  find_minima(pot, t_pl, r);
  unseeded_first_order(pot, o, t_pl, false, r);
  // The full potential, Planck-suppressed operators included, decides stability.
  r.verdict = verdict_of(r.quartic_min, r.log10_expected_decays);
  if (!r.log10_expected_decays && r.quartic_min < 0)
    r.prescription +=
        "; lambda stays positive up to M_Pl, so there is no Fubini bounce: the region below the false vacuum that the "
        "operators (or the Coleman-Weinberg terms) open is not reached by this estimate";
  // Module boundary (no NaN leaves a module): the verdict's numbers leave the higgs module finite.
  const auto inputs = [&] { return pot.description(); };
  const char* hint = "fewer loops, or inputs nearer the measured values (data/standard_model.yaml)";
  require_finite(r.lambda_min, "higgs: stability", "lambda_min", inputs, hint);
  require_finite(r.lambda_eff_min, "higgs: stability", "lambda_eff_min", inputs, hint);
  require_finite(r.quartic_min, "higgs: stability", "minimum of 4V/h^4", inputs, "smaller lambda6 and lambda8");
  if (r.instability_scale) require_finite(*r.instability_scale, "higgs: stability", "instability scale", inputs, hint);
  if (r.log10_expected_decays) {
    require_finite(*r.log10_expected_decays, "higgs: stability", "log10 N (unseeded)", inputs, hint);
    require_finite(r.bounce_action_error, "higgs: stability", "bounce action error", inputs, hint);
  }
  return r;
}

void restrict_unseeded_to_first_order(const StandardModelPotential& pot, const StabilityOptions& o,
                                      StabilityReport& r) {
  const double t_pl = std::min(std::log(pot.running().mu_max()), std::log(o.scale_limit));
  unseeded_first_order(pot, o, t_pl, true, r);
  r.unseeded_method = UnseededMethod::fubini_first_order;
  r.verdict = verdict_of(r.quartic_min, r.log10_expected_decays);
  if (r.log10_expected_decays)
    require_finite(
        *r.log10_expected_decays, "higgs: stability", "log10 N (unseeded, first order)",
        [&] { return pot.description(); }, "smaller lambda6 and lambda8");
}

namespace {
// The M_t in [160, 185] GeV where criterion(M_t) = 0, to 1e-6 GeV, far below the inputs' own
// uncertainty. `what` names the criterion in the error.
double critical_top_mass_by(const Fn& criterion, const char* what) {
  const double lo = 160, hi = 185;
  const double f_lo = criterion(lo), f_hi = criterion(hi);
  if (!(f_lo > 0 && f_hi < 0))
    throw NumericalError("critical top mass (GSL Brent)",
                         fmt::format("{} does not change sign from + to - over M_t in [{}, {}] GeV ({:.4g}, {:.4g})",
                                     what, lo, hi, f_lo, f_hi));
  return brent_root(criterion, lo, hi, 1e-6, 100).x;
}
}  // namespace

double critical_top_mass(const Inputs& inputs, const RunOptions& run, const StabilityOptions& o) {
  const Fn lambda_min = [&](double mt) {
    Inputs in = inputs;
    in.top_mass = mt;
    const StandardModelPotential pot(std::make_shared<const Running>(in, run));
    return analyse_stability(pot, o).lambda_min;
  };
  return critical_top_mass_by(lambda_min, "lambda_min (MS-bar)");
}

double critical_top_mass_effective(const Inputs& inputs, const StandardModelOptions& potential, const RunOptions& run,
                                   const StabilityOptions& o) {
  const Fn quartic_min = [&](double mt) {
    Inputs in = inputs;
    in.top_mass = mt;
    const StandardModelPotential pot(std::make_shared<const Running>(in, run), potential);
    return analyse_stability(pot, o).quartic_min;
  };
  return critical_top_mass_by(quartic_min, "the minimum of 4V/h^4");
}

}  // namespace ember::higgs
