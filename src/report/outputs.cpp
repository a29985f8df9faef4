#include "ember/report/outputs.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <cstdlib>

#include "band.hpp"
#include "ember/core/atomic_file.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/finite.hpp"
#include "ember/core/hash.hpp"
#include "ember/core/output_set.hpp"
#include "ember/core/text.hpp"
#include "ember/units/constants.hpp"
#include "ember/version.hpp"
#include "thresholds.hpp"
#include "verdict.hpp"

namespace ember::report {

namespace {

namespace u = ember::units;
using nlohmann::ordered_json;

ordered_json number_or_null(std::optional<double> v) {
  return v && std::isfinite(*v) ? ordered_json(*v) : ordered_json(nullptr);
}

std::string cell(std::optional<double> v) {
  return v && std::isfinite(*v) ? fmt::format("{:.8e}", *v) : std::string();
}

std::string csv_header(const scenario::LoadedScenario& l, const std::string& what,
                       const std::vector<std::string>& notes) {
  std::string out = fmt::format("# Ember {}: {}\n# scenario {} (hash {}), ember {}\n", what,
                                l.scenario.title.empty() ? l.source : l.scenario.title, l.source,
                                scenario::scenario_hash(l), version);
  for (const auto& n : notes) out += "# " + n + "\n";
  return out;
}

bool wants(const scenario::Scenario& s, const char* file) {
  return std::find(s.output.files.begin(), s.output.files.end(), file) != s.output.files.end();
}

// The lowest beta_max of any prescription, and where.
struct Tightest {
  std::string prescription;
  double mass = 0, beta = 0, f = 0;
  bool found = false;
};
Tightest tightest(const pipeline::JobResults& r) {
  Tightest t;
  for (const auto& o : r.outcomes)
    for (const auto& row : o.curve)
      if (row.beta_max && (!t.found || *row.beta_max < t.beta)) {
        t = {tunnelling::name_of(o.prescription), row.mass, *row.beta_max, row.f_max.value_or(0), true};
      }
  return t;
}

// The scenario itself on the constraint plot: its (characteristic) mass and beta there.
std::string scenario_point(const pipeline::JobResults& r) {
  for (const auto& o : r.outcomes)
    if (o.failure.empty() && o.counts.beta > 0 && !o.curve.empty())
      return fmt::format("scenario-point: {:.8e} {:.8e} (the scenario's own mass and beta)", r.spectrum_mass / u::gram,
                         o.counts.beta);
  return "scenario-point: none";
}

// constraint.csv's word on a flat band (or that it is not flat).
std::string flat_band_line(const pipeline::JobResults& r) {
  const auto note = detail::flat_band_note(r);
  return note ? *note : "the band is not flat: beta_max moves with the Higgs inputs";
}

std::string constraint_csv(const scenario::LoadedScenario& l, const pipeline::JobResults& r) {
  const bool mono = std::holds_alternative<scenario::Monochromatic>(l.scenario.population.spectrum);
  std::string out = csv_header(
      l, "constraint curves",
      {"units: masses in g; beta_max = largest allowed beta, the plain energy fraction in holes at formation; f_max "
       "= largest allowed f_PBH, the dark-matter fraction the holes would make today had none evaporated",
       mono ? "rows: formation mass of a monochromatic population"
            : "rows: characteristic mass (and width) of the extended spectrum (lognormal: peak_mass; power_law: "
              "max_mass; critical_collapse: cutoff_mass; table: the geometric mean of its range); beta_max quoted "
              "there",
       scenario_point(r),
       mono ? "x-axis: formation mass [g]"
            : "x-axis: characteristic mass of the spectrum [g] (lognormal: peak mass; power law: upper cutoff)",
       fmt::format("excluded when the expected decays in our past light cone exceed {}",
                   format_real(l.scenario.exclusion.max_decays)),
       fmt::format(
           "band: beta_max envelope over {} Higgs-input point(s); band_without counts points with no constraint",
           r.band.size()),
       "band1, band2: the envelope over the points within 1 and within 2 sigma of the central M_t, M_h and alpha_s "
       "(central operators); band.csv has every point",
       flat_band_line(r),
       "empty cell: no constraint there (no decays, or even beta = 1 gives fewer decays than the limit)",
       "failed_<prescription> = 1: a solver failed at this row (summary.json failed_points says why); its cells "
       "are empty"});
  out += "mass_g,width";
  for (const auto& o : r.outcomes) out += fmt::format(",beta_max_{0},f_max_{0}", tunnelling::name_of(o.prescription));
  for (const auto& o : r.outcomes)
    out += fmt::format(",band_low_{0},band_high_{0},band_without_{0}", tunnelling::name_of(o.prescription));
  for (const auto& o : r.outcomes)
    out +=
        fmt::format(",band1_low_{0},band1_high_{0},band2_low_{0},band2_high_{0}", tunnelling::name_of(o.prescription));
  for (const auto& o : r.outcomes) out += fmt::format(",failed_{}", tunnelling::name_of(o.prescription));
  out += "\n";
  const std::size_t rows = r.outcomes.empty() ? 0 : r.outcomes.front().curve.size();
  for (std::size_t i = 0; i < rows; ++i) {
    const auto& first = r.outcomes.front().curve[i];
    out += fmt::format("{:.8e},{}", first.mass / u::gram, first.width > 0 ? format_real(first.width) : "");
    for (const auto& o : r.outcomes) out += fmt::format(",{},{}", cell(o.curve[i].beta_max), cell(o.curve[i].f_max));
    for (const auto& o : r.outcomes)
      out += fmt::format(",{},{},{}", cell(o.curve[i].band_low), cell(o.curve[i].band_high), o.curve[i].band_without);
    for (const auto& o : r.outcomes)
      out += fmt::format(",{},{},{},{}", cell(o.curve[i].band1_low), cell(o.curve[i].band1_high),
                         cell(o.curve[i].band2_low), cell(o.curve[i].band2_high));
    for (const auto& o : r.outcomes) out += o.curve[i].failed ? ",1" : ",0";
    out += "\n";
  }
  return out;
}

// One decay.csv row: a formation mass under one prescription.
std::string decay_row(const pipeline::PrescriptionOutcome& o, std::size_t i, bool spinning) {
  const population::Response& resp = o.scan[i];
  const auto& d = resp.decay;
  const auto share = [](double part, double whole) {
    return whole > 0 ? std::optional<double>(std::clamp(1 - part / whole, 0.0, 1.0)) : std::nullopt;
  };
  std::string out = fmt::format("{:.8e},{:.8e},{:.8e},{},{},{}", resp.mass / u::gram, resp.formation.time / u::second,
                                d.lifetime / u::second, d.evaporated ? "true" : "false",
                                d.formed_below_floor ? "true" : "false", tunnelling::name_of(o.prescription));
  out += fmt::format(",{:.8e},{},{},{},{}", d.probability, cell(d.hazard), cell(d.hazard_in_time),
                     cell(d.crossover_mass ? std::optional<double>(*d.crossover_mass / u::gram) : std::nullopt),
                     d.probability > 0 ? cell(d.decay_time / u::second) : std::string());
  out += fmt::format(",{},{},{},{}", d.probability > 0 ? cell(d.plasma_at_decay) : std::string(),
                     d.crossover_mass ? cell(d.plasma_at_crossover) : std::string(),
                     cell(share(d.postponed.probability, d.counted.probability)),
                     cell(share(d.probability_semiclassical, d.probability)));
  out += "," + (i < o.dn_dlnm.size() ? cell(o.dn_dlnm[i]) : std::string());
  if (spinning)
    out += fmt::format(",{},{},{}", std::isfinite(d.gate_mass) ? cell(d.gate_mass / u::gram) : std::string(),
                       cell(d.spin_at_crossover), cell(resp.spinning_crossover_share));
  return out + "\n";
}

std::string decay_csv(const scenario::LoadedScenario& l, const pipeline::JobResults& r) {
  std::string out =
      csv_header(l, "decay along each mass-loss history",
                 {"units: masses in g, times in s (since the big bang), temperatures in GeV",
                  fmt::format("P_decay = 1 - exp(-int Gamma_D dt) with the hot era {} (tunnelling.hot_era); hazard "
                              "from the ln M integral; hazard_time the time integral of the whole hazard, hot era "
                              "counted (a cross-check); crossover = first mass with Gamma_D >= Gamma_H",
                              l.scenario.tunnelling.hot_era == population::HotEra::postpone
                                  ? "postponed until the plasma has cooled"
                                  : "counted as if the exterior were cold"),
                  "decay_time: the probability-weighted mean time of decay, resolved within each step of the "
                  "decay grid (prompt decays: 1/Gamma_D after formation)",
                  "plasma_T_decay, plasma_T_crossover: the plasma's temperature at the decay time and at the crossover",
                  "hot_era_share: the share of P_decay (hot era counted) that falls while the plasma is too hot for a "
                  "cold-exterior rate (hotter than the hole, or its thermal mass holds the bubble's field)",
                  fmt::format("low_action_share: the share of P_decay from points with B below minimum_action = {} "
                              "(no semiclassical meaning there)",
                              format_real(l.scenario.tunnelling.minimum_action)),
                  "dN_dlnM: the spectrum-weighted contribution to N per unit ln M at this formation mass "
                  "(extended spectra; it integrates to N over ln M); empty for a monochromatic population, whose "
                  "N all comes from its one mass",
                  "rows: one per prescription and formation mass (long form), prescription by prescription",
                  "empty cell: none (no crossover, or no decay)"});
  if (r.spinning)
    out.insert(out.rfind("# empty cell"),
               fmt::format("# spinning holes ({}): lifetimes and times on the Kerr rates; the seeded rate counts only "
                           "below spin_gate_mass_g, where a* has fallen to spin_limit = {}; hole_spin_at_crossover: a* "
                           "where Gamma_D first reaches Gamma_H; spinning_crossover_share: the share of the holes "
                           "whose crossover comes at a* above the limit (no prescription in Ember treats such seeds); "
                           "with several spins, P_decay and the hazards are means over them, lifetime and crossover "
                           "those of the median spin\n",
                           r.hole_spin, format_real(r.spin_limit)));
  out +=
      "formation_mass_g,formation_time_s,lifetime_s,evaporated,formed_below_floor,prescription,P_decay,hazard,"
      "hazard_time,crossover_mass_g,decay_time_s,plasma_T_decay_GeV,plasma_T_crossover_GeV,hot_era_share,"
      "low_action_share,dN_dlnM";
  out += r.spinning ? ",spin_gate_mass_g,hole_spin_at_crossover,spinning_crossover_share\n" : "\n";
  // Long (tidy) form: one row per prescription and formation mass, prescription by prescription.
  for (const auto& o : r.outcomes)
    for (std::size_t i = 0; i < o.scan.size(); ++i) out += decay_row(o, i, r.spinning);
  return out;
}

std::string rates_csv(const scenario::LoadedScenario& l, const pipeline::JobResults& r) {
  std::string out = csv_header(l, "decay against evaporation",
                               {"units: seed mass in g and Planck masses; ratio = Gamma_D / Gamma_H (the branching "
                                "ratio of decay is ratio / (1 + ratio))",
                                fmt::format("below_minimum_action = 1: B < {} there (no semiclassical meaning)",
                                            format_real(l.scenario.tunnelling.minimum_action))});
  out += "seed_mass_g,seed_mass_Mpl";
  for (const auto& o : r.outcomes) out += fmt::format(",ratio_{}", tunnelling::name_of(o.prescription));
  for (const auto& o : r.outcomes) out += fmt::format(",below_minimum_action_{}", tunnelling::name_of(o.prescription));
  out += "\n";
  for (std::size_t i = 0; i < r.plot_masses.size(); ++i) {
    out += fmt::format("{:.8e},{:.8e}", r.plot_masses[i] / u::gram, r.plot_masses[i] / u::planck_mass);
    for (const auto& o : r.outcomes) out += "," + (i < o.plot_ratio.size() ? cell(o.plot_ratio[i]) : std::string());
    for (const auto& o : r.outcomes) out += i < o.plot_low_action.size() ? (o.plot_low_action[i] ? ",1" : ",0") : ",";
    out += "\n";
  }
  return out;
}

std::string potential_csv(const scenario::LoadedScenario& l, const pipeline::JobResults& r) {
  std::string out = csv_header(l, "Higgs potential",
                               {"units: h in GeV; lambda is the running MS-bar coupling at mu = h, "
                                "lambda_eff = e^{4 Gamma} lambda the quartic in the potential"});
  out += "h_GeV,lambda,lambda_eff\n";
  for (std::size_t i = 0; i < r.plot_field.size(); ++i)
    out += fmt::format("{:.8e},{:.8e},{:.8e}\n", r.plot_field[i], r.plot_lambda[i], r.plot_lambda_eff[i]);
  return out;
}

}  // namespace

namespace {
bool born_spinning(const scenario::Scenario& s) {
  const auto* f = std::get_if<scenario::FixedSpin>(&s.population.hole_spin);
  return !f || f->value > 0;
}
}  // namespace

std::vector<std::string> cautions(const scenario::Scenario& s) {
  std::vector<std::string> names;
  for (const auto p : s.tunnelling.prescriptions) names.push_back(tunnelling::name_of(p));
  std::vector<std::string> out{
      fmt::format("These are semiclassical estimates under the named rate prescription(s): {}.",
                  join_alternatives(names, "and")),
      "The literature disagrees on the right prescription (the hole's quantum state; whether the enhancement is only a "
      "Boltzmann factor at the Hawking temperature); compare them side by side.",
      fmt::format(
          "Seeds below the semiclassical floor of {:.3g} Planck masses ({:.3g} g) are outside the validity of these "
          "results and are not counted.",
          s.tunnelling.semiclassical_floor / u::planck_mass, s.tunnelling.semiclassical_floor / u::gram),
      fmt::format("Every prescription assumes a cold exterior: decays while the plasma is hotter than the hole, or "
                  "while its thermal mass holds the bubble's field in the false vacuum, are {} (tunnelling.hot_era); "
                  "summary.json gives N both ways.",
                  s.tunnelling.hot_era == population::HotEra::postpone ? "not counted until the plasma has cooled"
                                                                       : "counted as if it were cold, and flagged"),
      fmt::format("Points with B below {} have no semiclassical meaning (e^-B is no suppression); summary.json "
                  "gives the share of N that rests on them.",
                  format_real(s.tunnelling.minimum_action)),
      "The constraint disappears if new physics stabilises the Higgs potential."};
  if (born_spinning(s))
    out.insert(out.end() - 1,
               fmt::format("No prescription in Ember treats spinning seeds: along a spinning hole's evaporation (Kerr "
                           "rates) the seeded rate for non-rotating seeds is counted only once a* has fallen to {} "
                           "(tunnelling.spin_limit); where decay would outrun evaporation at a higher a*, summary.json "
                           "gives the share of N from such points.",
                           format_real(s.tunnelling.spin_limit)));
  return out;
}

namespace {

double share_resting_on(double part_without, double whole) {
  return whole > 0 ? std::clamp(1 - part_without / whole, 0.0, 1.0) : 0.0;
}

// The thermal baseline is worth a caution once it is no longer far below one decay.
constexpr double thermal_caution_log10 = -3;

}  // namespace

// The scenario's own N at one band point, per prescription (null where its unit failed).
ordered_json band_counts(const pipeline::JobResults& r, const pipeline::BandPoint& b) {
  ordered_json n = ordered_json::object();
  for (std::size_t k = 0; k < r.outcomes.size() && k < b.lightcone.size(); ++k)
    n[tunnelling::name_of(r.outcomes[k].prescription)] = number_or_null(b.lightcone[k]);
  return n;
}

ordered_json summary_json(const scenario::LoadedScenario& l, const pipeline::JobResults& r) {
  ordered_json j;
  j["ember_version"] = version;
  j["scenario_file"] = l.source;
  j["scenario_hash"] = scenario::scenario_hash(l);
  j["title"] = l.scenario.title;
  j["prescriptions"] = nullptr;  // filled below; the verdict leads the file
  j["sensitivity"] = detail::sensitivity_json(r);
  j["warnings"] = r.warnings;
  j["definitions"] = {
      {"N_lightcone", "expected seeded decays in our past light cone"},
      {"N_hubble",
       "expected seeded decays per Hubble volume (4 pi/3) H^-3 at the time of decay (mass-weighted for an extended "
       "spectrum)"},
      {"excluded", fmt::format("N_lightcone > max_decays = {} (exclusion.max_decays, or -ln(1 - CL) for "
                               "exclusion.confidence_level: survival e^-N below 1 - CL)",
                               format_real(l.scenario.exclusion.max_decays))},
      {"beta", "the plain energy fraction in holes at formation, rho_PBH / rho_total (not a rescaled variant)"},
      {"f_pbh",
       "the fraction of the dark matter the holes would make today had none evaporated; for evaporated holes a "
       "measure of their number, not dark matter that exists"},
      {"characteristic_mass",
       "where beta of an extended spectrum is quoted: lognormal peak_mass (the peak of M psi), power_law max_mass, "
       "critical_collapse cutoff_mass, table the geometric mean of its mass range"}};
  j["scenario"] = scenario::resolved_json(l.resolved);
  j["cautions"] = cautions(l.scenario);
  j["potential"] = r.potential;
  j["spectrum"] = r.spectrum;
  j["greybody_table"] = r.greybody;
  if (r.spinning)
    j["hole_spin"] = {{"distribution", r.hole_spin},
                      {"kerr_table", r.kerr},
                      {"spin_limit", r.spin_limit},
                      {"note",
                       "lifetimes on the Kerr rates; the seeded rate (non-rotating seeds) counts only once a* has "
                       "fallen to spin_limit"}};
  if (r.stability) {
    const auto& st = *r.stability;
    j["higgs"] = {{"verdict", higgs::name_of(st.verdict)},
                  {"instability_scale_GeV", number_or_null(st.instability_scale)},
                  {"lambda_min", st.lambda_min},
                  {"lambda_min_scale_GeV", st.lambda_min_scale}};
    j["unseeded_baseline"] = {
        {"log10_expected_decays", number_or_null(st.log10_expected_decays)},
        {"note", "flat-space decay of our past light cone with no black holes: " + st.prescription}};
    if (r.thermal_baseline) {
      j["unseeded_baseline"]["log10_expected_decays_thermal"] =
          number_or_null(r.thermal_baseline->log10_expected_decays);
      j["unseeded_baseline"]["thermal_note"] = r.thermal_baseline->note;
      if (r.thermal_baseline->log10_expected_decays &&
          *r.thermal_baseline->log10_expected_decays > thermal_caution_log10)
        j["cautions"].push_back(fmt::format(
            "The unseeded thermal decay of the hot universe is not negligible (log10 N = {:.1f}): the plasma itself "
            "may have decayed, black holes or not.",
            *r.thermal_baseline->log10_expected_decays));
    }
  }
  j["no_constraint"] = r.no_constraint;
  if (r.no_constraint) j["no_constraint_reason"] = r.no_constraint_reason;
  ordered_json ps = ordered_json::object();
  for (std::size_t k = 0; k < r.outcomes.size(); ++k) {
    const pipeline::PrescriptionOutcome& o = r.outcomes[k];
    const double evaporated_share = o.counts.lightcone > 0 ? o.counts.from_evaporated / o.counts.lightcone : 0.0;
    ordered_json p = {{"N_lightcone", o.counts.lightcone}};
    p.update(detail::verdict_json(o, l.scenario.exclusion.max_decays));
    if (o.range90) p["where_from"] = detail::where_from_json(l.scenario, o);  // extended spectra with decays
    p.update(detail::prescription_thresholds_json(r, k));
    p.update(ordered_json{
        {"N_hubble", o.counts.hubble},
        {"survival_probability", o.survival},
        {"excluded", o.excluded},
        {"abundance", {{"beta", o.counts.beta}, {"f_pbh", o.counts.f_pbh}}},
        {"share_from_evaporated_holes", evaporated_share},
        {"hot_era",
         {{"treatment", population::name_of(l.scenario.tunnelling.hot_era)},
          {"N_lightcone_postponed", o.counts.lightcone_postponed},
          {"N_lightcone_counted", o.counts.lightcone_counted}}},
        {"share_of_N_below_minimum_action", share_resting_on(o.counts.lightcone_semiclassical, o.counts.lightcone)},
        {"assumptions", tunnelling::assumptions(o.prescription)},
        {"table", o.table_summary},
        {"failure", o.failure.empty() ? ordered_json(nullptr) : ordered_json(o.failure)}});
    if (r.spinning)
      p["share_of_N_from_spinning_crossovers"] =
          o.counts.lightcone > 0 ? o.counts.lightcone_spinning / o.counts.lightcone : 0.0;
    ps[tunnelling::name_of(o.prescription)] = std::move(p);
  }
  j["prescriptions"] = ps;
  const Tightest t = tightest(r);
  j["tightest_scan_bound"] =
      t.found ? ordered_json{{"prescription", t.prescription},
                             {"mass_g", t.mass / u::gram},
                             {"beta_max", t.beta},
                             {"f_max", t.f},
                             {"meaning",
                              "the lowest beta_max over the scan rows of constraint.csv, each row the scenario's "
                              "spectrum shape moved to that mass (monochromatic: a population at that mass); not the "
                              "scenario's own verdict, which is under prescriptions"}}
              : ordered_json(nullptr);
  ordered_json band = ordered_json::array();
  for (const auto& b : r.band)
    band.push_back({{"label", b.point.label},
                    {"top_mass_GeV", b.point.inputs.top_mass},
                    {"higgs_mass_GeV", b.point.inputs.higgs_mass},
                    {"alpha_s", b.point.inputs.alpha_s},
                    {"lambda6", b.point.lambda6},
                    {"lambda8", b.point.lambda8},
                    {"sigmas", b.point.sigmas},
                    {"verdict", higgs::name_of(b.verdict)},
                    {"constraint", b.constraint},
                    {"log10_unseeded_expected_decays", number_or_null(b.log10_unseeded)},
                    {"failed", b.failed},
                    {"N_lightcone", band_counts(r, b)}});
  j["band"] = band;
  if (const auto note = detail::flat_band_note(r)) j["band_note"] = *note;
  // Every point where a solver failed, with its reason; the rest of the scan went on without it.
  ordered_json failed = ordered_json::array();
  for (const auto& f : r.failures)
    failed.push_back({{"band_point", r.band[f.point].point.label},
                      {"prescription", f.prescription.empty() ? ordered_json(nullptr) : ordered_json(f.prescription)},
                      {"mass_g", f.mass ? ordered_json(*f.mass / u::gram) : ordered_json(nullptr)},
                      {"width", f.width ? ordered_json(*f.width) : ordered_json(nullptr)},
                      {"reason", f.reason}});
  j["failed_points"] = failed;
  j["survivors"] = {
      {"mass_g", r.survivors_mass / u::gram},
      {"note", std::string("holes formed heavier than this survive today; their constraint comes only from the "
                           "evaporated low-mass tail of an extended spectrum") +
                   (r.spinning ? " (for spinning holes the mass that ends today at the distribution's fastest spin: "
                                 "heavier ones survive at any spin)"
                               : "")}};
  j["timing"] = {{"seconds", r.seconds}};
  return j;
}

std::string summary_text(const scenario::LoadedScenario& l, const pipeline::JobResults& r) {
  std::string t =
      fmt::format("Ember run: {}\n  scenario {} (hash {})\n  population: {}\n  potential: {}\n  greybody table: {}\n",
                  l.scenario.title.empty() ? "(untitled)" : l.scenario.title, l.source, scenario::scenario_hash(l),
                  r.spectrum, r.potential, r.greybody);
  if (r.stability)
    t += fmt::format("  Higgs vacuum: {}{}; unseeded decays expected in the past light cone: log10 N = {}\n",
                     higgs::name_of(r.stability->verdict),
                     r.stability->instability_scale
                         ? fmt::format(", instability at {:.3g} GeV", *r.stability->instability_scale)
                         : "",
                     r.stability->log10_expected_decays ? fmt::format("{:.1f}", *r.stability->log10_expected_decays)
                                                        : std::string("none"));
  if (r.stability && r.stability->log10_expected_decays && *r.stability->log10_expected_decays > 0)
    t += fmt::format(
        "  warning: with no black holes at all the vacuum would already have decayed in our past light cone "
        "(log10 N = {:.1f}): these Standard Model inputs are excluded on their own, whatever the population\n",
        *r.stability->log10_expected_decays);
  if (r.thermal_baseline && r.thermal_baseline->log10_expected_decays) {
    const double n = *r.thermal_baseline->log10_expected_decays;
    t += fmt::format("  unseeded thermal decay of the hot universe (from {:.3g} GeV): log10 N = {:.1f}{}\n",
                     r.thermal_baseline->highest_temperature, n,
                     n > thermal_caution_log10 ? "  caution: not negligible; the plasma itself may decay" : "");
  }
  if (r.no_constraint) t += fmt::format("  no constraint: {}\n", r.no_constraint_reason);
  t += detail::verdict_text(r, l.scenario.exclusion.max_decays);
  t += detail::where_from_text(l.scenario, r);
  t += detail::thresholds_text(r);
  const bool postpone = l.scenario.tunnelling.hot_era == population::HotEra::postpone;
  t += fmt::format("  hot era ({}): N with the hot era {}:", postpone ? "postponed" : "counted",
                   postpone ? "counted instead" : "postponed instead");
  for (const auto& o : r.outcomes)
    t += fmt::format(" {} {:.4e};", tunnelling::name_of(o.prescription),
                     postpone ? o.counts.lightcone_counted : o.counts.lightcone_postponed);
  t += "\n";
  t += fmt::format("  share of N from points with B < {}:", format_real(l.scenario.tunnelling.minimum_action));
  for (const auto& o : r.outcomes)
    t += fmt::format(" {} {:.3g}%;", tunnelling::name_of(o.prescription),
                     100 * share_resting_on(o.counts.lightcone_semiclassical, o.counts.lightcone));
  t += "\n";
  if (r.spinning) {
    t += fmt::format("  hole spin: {}; Kerr table {}; seeded rate counted once a* <= {}\n", r.hole_spin, r.kerr,
                     format_real(r.spin_limit));
    t += fmt::format("  share of N from points where decay outruns evaporation at a* > {}:", format_real(r.spin_limit));
    for (const auto& o : r.outcomes)
      t += fmt::format(" {} {:.3g}%;", tunnelling::name_of(o.prescription),
                       o.counts.lightcone > 0 ? 100 * o.counts.lightcone_spinning / o.counts.lightcone : 0.0);
    t += "\n";
  }
  if (const auto note = detail::flat_band_note(r)) t += "  band: " + *note + "\n";
  if (!r.failures.empty())
    t += fmt::format("  failed points: {} (in summary.json failed_points; the rest of the scan went on); first: {}\n",
                     r.failures.size(), r.failures.front().reason);
  if (!std::holds_alternative<scenario::Monochromatic>(l.scenario.population.spectrum))
    t += fmt::format(
        "  survivors: holes formed above {:.3g} g survive today; for them the constraint comes only from the "
        "evaporated low-mass tail of the spectrum{}\n",
        r.survivors_mass / u::gram, r.spinning ? " (at any spin: the mass is the fastest spin's)" : "");
  const Tightest best = tightest(r);
  const char* moved = std::holds_alternative<scenario::Monochromatic>(l.scenario.population.spectrum)
                          ? "monochromatic populations at each scan mass"
                          : "this spectrum's shape moved to each scan mass";
  if (best.found)
    t += fmt::format("  tightest scan bound ({}): {} at {:.4g} g: beta_max = {:.4e} (f_max = {:.4e})\n", moved,
                     best.prescription, best.mass / u::gram, best.beta, best.f);
  else
    t += fmt::format("  tightest scan bound ({}): none (no bound below beta = 1 anywhere on the scan)\n", moved);
  for (const auto& c : cautions(l.scenario)) t += "  caution: " + c + "\n";
  return t;
}

Written write_outputs(const scenario::LoadedScenario& l, const pipeline::JobResults& r,
                      const std::filesystem::path& dir, const Figures& figures, ForeignFolder foreign) {
  Written w;
  const scenario::Scenario& s = l.scenario;
  // Every text is built and checked (no NaN or inf anywhere) before the first is written, so a
  // failure leaves no partial set of results.
  std::vector<std::pair<std::string, std::string>> texts;
  if (wants(s, "summary")) {
    const nlohmann::ordered_json summary = summary_json(l, r);
    require_finite_json(summary, "summary.json");
    // Invalid UTF-8 cannot reach here (the loader refuses it); replace rather than throw regardless.
    texts.emplace_back("summary.json", summary.dump(2, ' ', false, nlohmann::json::error_handler_t::replace) + "\n");
  }
  if (wants(s, "constraint")) texts.emplace_back("constraint.csv", constraint_csv(l, r));
  if (wants(s, "decay")) texts.emplace_back("decay.csv", decay_csv(l, r));
  if (wants(s, "band") && r.band.size() > 1)
    texts.emplace_back("band.csv",
                       detail::band_csv(l, r,
                                        csv_header(l, "the band, point by point",
                                                   {"units: masses in g; sigmas = the largest offset of M_t, M_h and "
                                                    "alpha_s from the central inputs, in their sigma",
                                                    "N_row: the scenario's abundance at this scan row (beta or "
                                                    "f_PBH measure) over its allowed value, times max_decays; "
                                                    "N_scenario: the scenario's own N at this point",
                                                    "empty cell: no constraint there, or not computed"})));
  if (wants(s, "sensitivity") && !r.thresholds.empty())
    texts.emplace_back(
        "sensitivity.csv",
        detail::sensitivity_csv(
            l, r,
            csv_header(
                l, "the scenario's N against one Standard Model input at a time",
                {"units: value in GeV for top_mass and higgs_mass, dimensionless for alpha_s; offset_sigma = "
                 "(value - central) / sigma",
                 "N_lightcone: the scenario's own expected decays in our past light cone at that value, the "
                 "other inputs at the scenario's values; max_decay_to_evaporation: the largest Gamma_D / "
                 "Gamma_H over the seed masses",
                 "refinement = 1: an evaluation of a root search (0: the window's grid); N_lightcone is empty on "
                 "the refinements of the outruns threshold (not needed there); failed = 1: a solver failed "
                 "there (empty cells)"})));
  if (wants(s, "resolved")) texts.emplace_back("resolved.yaml", scenario::resolved_yaml(l));
  if (wants(s, "plots")) {
    texts.emplace_back("rates.csv", rates_csv(l, r));
    if (!r.plot_field.empty()) texts.emplace_back("potential.csv", potential_csv(l, r));
  }
  for (const auto& [name, text] : texts)
    if (name != "summary.json" && name != "resolved.yaml") require_finite_text(text, name);
  // The set appears whole or not at all (core/output_set.hpp), summary.json last.
  OutputSet set(dir, "summary.json", foreign);
  for (const auto& [name, text] : texts) {
    set.add(name, text);
    w.files.push_back(name);
  }
  if (wants(s, "plots"))
    w.plots_note = figures ? figures(set.staging(), s.output.plot_formats) : "plot data written; no figures drawn";
  (void)set.commit();
  return w;
}

}  // namespace ember::report
