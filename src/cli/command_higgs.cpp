// `ember higgs`: RG running of the Standard Model couplings, the high-field potential, the
// stability verdict and the unseeded decay probability of our past light cone.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <functional>
#include <iostream>
#include <optional>

#include "command.hpp"
#include "ember/core/atomic_file.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/finite.hpp"
#include "ember/core/text.hpp"
#include "ember/higgs/stability.hpp"
#include "ember/tunnelling/unseeded.hpp"

namespace ember::cli {

namespace {

// log10 of the probability of at least one decay, P = 1 - e^{-N} (Poisson), from log10 N. For
// N < 1e-10, P = N to 1 part in 1e10; computed through expm1 otherwise.
std::optional<double> decay_probability(const std::optional<double>& log10_n) {
  if (!log10_n) return std::nullopt;
  if (*log10_n < -10) return *log10_n;
  return std::log10(-std::expm1(-std::pow(10.0, std::min(*log10_n, 300.0))));
}

using namespace ember::higgs;

struct HiggsOptions {
  Inputs inputs = default_inputs();
  std::string at = "1.22e19 GeV";
  double lambda6 = 0, lambda8 = 0;
  bool coleman_weinberg = false, json = false;
  std::string table;
};

nlohmann::ordered_json optional_json(const std::optional<double>& v) {
  return v ? nlohmann::ordered_json(*v) : nullptr;
}

std::string couplings_csv(const StandardModelPotential& pot) {
  const Running& run = pot.running();
  std::string out = fmt::format(
      "# Ember running couplings (MS-bar) and the effective quartic, {}\n"
      "# columns: mu_GeV, g1 (GUT-normalised), g2, g3, yt, lambda (MS-bar), Gamma (field anomalous-dimension "
      "integral), lambda_eff\n"
      "mu_GeV,g1,g2,g3,yt,lambda,Gamma,lambda_eff\n",
      pot.description());
  const double t0 = std::log(run.mu_min()), t1 = std::log(run.mu_max());
  const int rows = static_cast<int>(std::ceil((t1 - t0) / 0.1));
  for (int i = 0; i <= rows; ++i) {
    const double mu = std::exp(t0 + (t1 - t0) * i / rows);
    const Couplings c = run.couplings(mu);
    out += fmt::format("{:.10e},{:.10e},{:.10e},{:.10e},{:.10e},{:.10e},{:.10e},{:.10e}\n", mu, c.g1, c.g2, c.g3, c.yt,
                       c.lambda, run.gamma_integral(mu), pot.lambda_eff(mu));
  }
  return out;
}

// Everything `ember higgs` reports, computed once for the JSON and the text.
struct HiggsFacts {
  std::shared_ptr<const Running> running;
  StandardModelPotential pot;
  StabilityReport r;
  std::optional<double> critical, critical_effective;  // MS-bar and effective-potential criteria
  std::vector<std::string> warnings;
  Couplings c;
  double at = 0;
};

// One critical top mass, or a warning saying why there is none.
std::optional<double> critical_or_warning(const std::function<double()>& solve, const char* criterion,
                                          std::vector<std::string>& warnings) {
  try {
    return solve();
  } catch (const NumericalError& e) {
    warnings.push_back(fmt::format("no critical top mass ({}): {}", criterion, e.what()));
    return std::nullopt;
  }
}

HiggsFacts compute(const HiggsOptions& o) {
  o.inputs.validate();
  const double at = quantity_option("--at", o.at, units::energy);
  auto running = std::make_shared<const Running>(o.inputs);
  if (at < running->mu_min() || at > running->mu_max())
    throw InputError(fmt::format("--at {}: outside the running's range; expected between M_t and {:.3g} GeV", o.at,
                                 running->mu_max()));
  const StandardModelOptions so{o.coleman_weinberg, o.lambda6, o.lambda8};
  StandardModelPotential pot(running, so);
  // The operators on the bounce: first order on the Fubini family, the numerical bounce beyond.
  StabilityReport r = tunnelling::analyse_unseeded(pot);
  std::vector<std::string> warnings = fit_warnings(o.inputs);
  const auto critical = critical_or_warning([&] { return critical_top_mass(o.inputs); }, "MS-bar", warnings);
  const auto effective =
      critical_or_warning([&] { return critical_top_mass_effective(o.inputs, so); }, "effective potential", warnings);
  return {running, std::move(pot), std::move(r), critical, effective, std::move(warnings), couplings_at_top(o.inputs),
          at};
}

nlohmann::ordered_json unseeded_json(const StabilityReport& r) {
  const bool bounce = r.log10_expected_decays.has_value();
  const auto if_bounce = [&](double v) { return bounce ? nlohmann::ordered_json(v) : nullptr; };
  return {{"log10_expected_decays", optional_json(r.log10_expected_decays)},
          {"log10_decay_probability", optional_json(decay_probability(r.log10_expected_decays))},
          {"unseeded_method", name_of(r.unseeded_method)},
          {"bounce_scale_GeV", if_bounce(r.bounce_scale)},
          {"bounce_at_scan_edge", r.bounce_at_scan_edge},
          {"bounce_action", if_bounce(r.bounce_action)},
          {"bounce_action_error", if_bounce(r.bounce_action_error)},
          {"operator_action_first_order", if_bounce(r.operator_action)},
          {"operator_fraction_first_order", if_bounce(r.operator_fraction)},
          {"operators_first_order", r.operators_first_order}};
}

nlohmann::ordered_json facts_json(const HiggsOptions& o, const HiggsFacts& f) {
  const StabilityReport& r = f.r;
  nlohmann::ordered_json j = {
      {"inputs",
       {{"top_mass_GeV", o.inputs.top_mass},
        {"higgs_mass_GeV", o.inputs.higgs_mass},
        {"alpha_s", o.inputs.alpha_s},
        {"w_mass_GeV", o.inputs.w_mass},
        {"loops", o.inputs.loops},
        {"running", loop_order_name(o.inputs.loops)},
        {"lambda6", o.lambda6},
        {"lambda8", o.lambda8},
        {"operators", "lambda6 h^6/(6 Mbar^2) + lambda8 h^8/(8 Mbar^4), Mbar the reduced Planck mass"},
        {"coleman_weinberg", o.coleman_weinberg}}},
      {"couplings_at_top", {{"g1", f.c.g1}, {"g2", f.c.g2}, {"g3", f.c.g3}, {"yt", f.c.yt}, {"lambda", f.c.lambda}}},
      {"at_GeV", f.at},
      {"lambda_at", f.running->lambda(f.at)},
      {"lambda_eff_at", f.pot.lambda_eff(f.at)},
      {"instability_scale_GeV", optional_json(r.instability_scale)},
      {"lambda_min", r.lambda_min},
      {"lambda_min_scale_GeV", r.lambda_min_scale},
      {"lambda_eff_min", r.lambda_eff_min},
      {"lambda_eff_min_scale_GeV", r.lambda_eff_min_scale},
      {"quartic_min", r.quartic_min},
      {"quartic_min_scale_GeV", r.quartic_min_scale},
      {"verdict", name_of(r.verdict)}};
  j.update(unseeded_json(r));
  j["critical_top_mass_GeV"] = optional_json(f.critical);
  j["critical_top_mass_effective_GeV"] = optional_json(f.critical_effective);
  j["prescription"] = r.prescription;
  j["lambda_eff_interpolation_error"] = f.pot.interpolation_error();
  j["warnings"] = f.warnings;
  return j;
}

std::string unseeded_text(const StabilityReport& r) {
  if (!r.log10_expected_decays)
    return "log10 N (unseeded decays expected in the past light cone)  none: no flat-space bounce\n";
  std::string text = fmt::format(
      "log10 N (unseeded decays expected in the past light cone)  {:.1f} (bounce at mu = {:.3g} GeV{})\n",
      *r.log10_expected_decays, r.bounce_scale,
      r.bounce_at_scan_edge ? ", a lower bound: at the end of the scanned range or with the operators' share held"
                            : "");
  text += fmt::format("bounce action S                      {:.2f} +- {:.2g} ({})\n", r.bounce_action,
                      r.bounce_action_error, name_of(r.unseeded_method));
  if (r.operator_action != 0)
    text += fmt::format("operators on the bounce (1st order)  Delta S = {:+.2f}, {:.2g} of the Fubini action{}\n",
                        r.operator_action, r.operator_fraction,
                        r.operators_first_order ? ""
                        : r.unseeded_method == UnseededMethod::numerical_bounce
                            ? ": first order fails, so S is the numerical bounce's"
                            : ": first order fails, its share is held at the bound");
  return text;
}

std::string critical_text(const std::optional<double>& m, const char* criterion) {
  return m ? fmt::format("critical top mass, {}  {:.3f} GeV\n", criterion, *m)
           : fmt::format("critical top mass, {}  not found in [160, 185] GeV\n", criterion);
}

std::string facts_text(const HiggsFacts& f) {
  const StabilityReport& r = f.r;
  std::string text = fmt::format(
      "{}\n"
      "MS-bar couplings at mu = M_t (fits of Buttazzo et al. 2013):\n"
      "  g1 = {:.5f}  g2 = {:.5f}  g3 = {:.5f}  yt = {:.5f}  lambda = {:.5f}\n"
      "at mu = h = {:.4g} GeV:\n"
      "  lambda (MS-bar, running)      {:+.5f}\n"
      "  lambda_eff (in the potential) {:+.5f}\n",
      f.pot.description(), f.c.g1, f.c.g2, f.c.g3, f.c.yt, f.c.lambda, f.at, f.running->lambda(f.at),
      f.pot.lambda_eff(f.at));
  text += r.instability_scale ? fmt::format("instability scale (lambda_eff = 0)   {:.4g} GeV\n", *r.instability_scale)
                              : "instability scale                    none: lambda_eff stays positive\n";
  text += fmt::format("lambda_min (MS-bar, M_t to M_Pl)     {:+.5f} at {:.3g} GeV\n", r.lambda_min, r.lambda_min_scale);
  text += fmt::format("lambda_eff minimum                   {:+.5f} at {:.3g} GeV\n", r.lambda_eff_min,
                      r.lambda_eff_min_scale);
  text +=
      fmt::format("4V/h^4 minimum (the full potential)  {:+.5f} at {:.3g} GeV\n", r.quartic_min, r.quartic_min_scale);
  text += fmt::format("verdict                              {}\n", name_of(r.verdict));
  text += unseeded_text(r);
  text += critical_text(f.critical, "MS-bar criterion (lambda_min = 0, mu in [M_t, M_Pl])      ");
  text += critical_text(f.critical_effective, "effective-potential criterion (min 4V/h^4 = 0, h to mu_max)");
  text += fmt::format("decay prescription: {}\n", r.prescription);
  return text;
}

int higgs(const HiggsOptions& o) {
  const HiggsFacts f = compute(o);
  for (const auto& w : f.warnings) fmt::print(stderr, "ember: warning: {}\n", w);
  if (!o.table.empty()) {
    const std::string csv = couplings_csv(f.pot);
    require_finite_text(csv, o.table);
    write_file_atomically(o.table, csv);
  }
  if (o.json) {
    print_json(facts_json(o, f));
    return exit_ok;
  }
  std::string text = facts_text(f);
  if (!o.table.empty()) text += fmt::format("running couplings written to {}\n", o.table);
  std::cout << text;
  return exit_ok;
}

}  // namespace

Command add_higgs(CLI::App& parent) {
  auto o = std::make_shared<HiggsOptions>();
  CLI::App* app = parent.add_subcommand(
      "higgs",
      "Higgs potential at high field: RG running, instability scale, lambda_min, stability verdict, unseeded "
      "decay probability (Planck-suppressed operators on the bounce), critical top mass by the MS-bar and the "
      "effective-potential criteria.");
  app->add_option("--mt", o->inputs.top_mass,
                  "top-quark pole mass in GeV (default: PDG 2024, data/standard_model.yaml)");
  app->add_option("--mh", o->inputs.higgs_mass, "Higgs-boson pole mass in GeV");
  app->add_option("--alphas", o->inputs.alpha_s, "alpha_s(M_Z)");
  app->add_option("--mw", o->inputs.w_mass, "W-boson pole mass in GeV");
  app->add_option("--loops", o->inputs.loops, "renormalisation-group running: " + loop_order_choices());
  app->add_option("--at", o->at, "also report lambda and lambda_eff at this scale (default 1.22e19 GeV)");
  app->add_option("--lambda6", o->lambda6, "coefficient of h^6/(6 Mbar^2), Mbar the reduced Planck mass");
  app->add_option("--lambda8", o->lambda8, "coefficient of h^8/(8 Mbar^4), Mbar the reduced Planck mass");
  app->add_flag("--coleman-weinberg", o->coleman_weinberg, "add the one-loop top, W and Z terms (Landau gauge)");
  app->add_option("--table", o->table, "write the running couplings to this CSV file");
  app->add_flag("--json", o->json, "print one JSON object on stdout");
  return {app, [o] { return higgs(*o); }};
}

}  // namespace ember::cli
