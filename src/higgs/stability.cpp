#include "ember/higgs/stability.hpp"

#include <fmt/format.h>

#include <cmath>
#include <functional>

#include "ember/core/errors.hpp"
#include "ember/core/finite.hpp"
#include "ember/core/gsl_status.hpp"
#include "ember/core/gsl_tools.hpp"
#include "ember/higgs/fubini.hpp"

namespace ember::higgs {

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

}  // namespace

StabilityReport analyse_stability(const StandardModelPotential& pot, const StabilityOptions& o) {
  use_gsl_status_codes();
  const Running& run = pot.running();
  const double t0 = std::log(run.mu_min()), t1 = std::log(run.mu_max());
  const double t_pl = std::min(t1, std::log(o.scale_limit));
  StabilityReport r;

  const Fn lambda_t = [&](double t) { return run.lambda(std::exp(t)); };
  const Fn lambda_eff_t = [&](double t) { return pot.lambda_eff(std::exp(t)); };
  const auto [tm, lm] = refine_minimum(lambda_t, scan_min(lambda_t, t0, t_pl).t, t0, t_pl);
  r.lambda_min = lm;
  r.lambda_min_scale = std::exp(tm);
  const auto [te, le] = refine_minimum(lambda_eff_t, scan_min(lambda_eff_t, t0, t1).t, t0, t1);
  r.lambda_eff_min = le;
  r.lambda_eff_min_scale = std::exp(te);
  for (double t = t0; t + grid_step <= t1; t += grid_step)
    if (lambda_eff_t(t) > 0 && lambda_eff_t(t + grid_step) <= 0) {
      r.instability_scale = std::exp(refine_root(lambda_eff_t, t, t + grid_step));
      break;
    }

  // The full potential, Planck-suppressed operators included, decides stability.
  bool deeper = false;
  for (double t = t0; t <= t1 && !deeper; t += grid_step) deeper = pot.value(std::exp(t)) < 0;

  // Unseeded decay.
  const Fn minus_log10_p = [&](double t) {
    const double q = fubini_quartic(pot, std::exp(t));
    if (q >= 0) return 1e300;
    const double action = fubini_action(std::abs(q));
    return -(4 * (t - std::log(o.hubble_rate)) - action) / std::log(10.0);
  };
  const GridMin best = scan_min(minus_log10_p, t0, t_pl);
  if (best.value < 1e299) {
    const auto [tb, v] = refine_minimum(minus_log10_p, best.t, t0, t_pl);
    r.log10_expected_decays = -v;
    r.bounce_scale = std::exp(tb);
    r.bounce_at_scan_edge = tb - t0 < 2 * grid_step || t_pl - tb < 2 * grid_step;
  }
  r.verdict = !deeper                                                      ? Verdict::stable
              : (r.log10_expected_decays && *r.log10_expected_decays >= 0) ? Verdict::unstable
                                                                           : Verdict::metastable;
  r.prescription =
      "flat-space Fubini bounce, S = 8 pi^2 / (3 |q(mu)|) with the MS-bar quartic at mu = 1/R plus the "
      "Planck-suppressed "
      "operators at h = mu; expected decays N = max_mu (mu/H0)^4 e^{-S}";
  // Module boundary (no NaN leaves a module): the verdict's numbers leave the higgs module finite.
  const auto inputs = [&] { return pot.description(); };
  const char* hint = "fewer loops, or inputs nearer the measured values (data/standard_model.yaml)";
  require_finite(r.lambda_min, "higgs: stability", "lambda_min", inputs, hint);
  require_finite(r.lambda_eff_min, "higgs: stability", "lambda_eff_min", inputs, hint);
  if (r.instability_scale) require_finite(*r.instability_scale, "higgs: stability", "instability scale", inputs, hint);
  if (r.log10_expected_decays)
    require_finite(*r.log10_expected_decays, "higgs: stability", "log10 N (unseeded)", inputs, hint);
  return r;
}

double critical_top_mass(const Inputs& inputs, const RunOptions& run, const StabilityOptions& o) {
  const Fn lambda_min = [&](double mt) {
    Inputs in = inputs;
    in.top_mass = mt;
    const StandardModelPotential pot(std::make_shared<const Running>(in, run));
    return analyse_stability(pot, o).lambda_min;
  };
  const double lo = 160, hi = 185;
  const double f_lo = lambda_min(lo), f_hi = lambda_min(hi);
  if (!(f_lo > 0 && f_hi < 0))
    throw NumericalError(
        "critical top mass (GSL Brent)",
        fmt::format("lambda_min does not change sign over M_t in [{}, {}] GeV ({:.4g}, {:.4g})", lo, hi, f_lo, f_hi));
  // M_t to 1e-6 GeV, far below the inputs' own uncertainty.
  return brent_root(lambda_min, lo, hi, 1e-6, 100).x;
}

}  // namespace ember::higgs
