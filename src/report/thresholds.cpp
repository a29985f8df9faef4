#include "thresholds.hpp"

#include <fmt/format.h>

#include <cmath>

#include "ember/core/text.hpp"

namespace ember::report::detail {

namespace {

using nlohmann::ordered_json;
using scenario::ThresholdInput;

// Masses in GeV carry the unit in their keys; alpha_s is dimensionless.
std::string unit_suffix(ThresholdInput i) {
  return i == ThresholdInput::alpha_s ? "" : "_GeV";
}
std::string unit_words(ThresholdInput i) {
  return i == ThresholdInput::alpha_s ? "" : " GeV";
}

ordered_json value_or_null(const std::optional<double>& v) {
  return v ? ordered_json(*v) : ordered_json(nullptr);
}

std::string value_text(const pipeline::InputThresholds& in, const pipeline::Threshold& t) {
  if (!t.value) return t.note;
  return fmt::format("{:.6g}{} ({})", *t.value, unit_words(in.input), t.note);
}

std::string sample_cell(const std::optional<double>& v) {
  return v && std::isfinite(*v) ? fmt::format("{:.8e}", *v) : std::string();
}

}  // namespace

ordered_json prescription_thresholds_json(const pipeline::JobResults& r, std::size_t k) {
  ordered_json j = ordered_json::object();
  for (const auto& in : r.thresholds) {
    if (k >= in.prescriptions.size()) continue;
    const std::string name = scenario::name_of(in.input), unit = unit_suffix(in.input);
    const auto& t = in.prescriptions[k];
    j[name + "_threshold" + unit] = value_or_null(t.exclusion.value);
    j[name + "_threshold_note"] = t.exclusion.note;
    j[name + "_outruns_threshold" + unit] = value_or_null(t.outruns.value);
    j[name + "_outruns_threshold_note"] = t.outruns.note;
  }
  return j;
}

ordered_json sensitivity_json(const pipeline::JobResults& r) {
  ordered_json j = ordered_json::object();
  for (const auto& in : r.thresholds) {
    const std::string unit = unit_suffix(in.input);
    ordered_json e = {{"central" + unit, in.central},
                      {"sigma" + unit, in.sigma},
                      {"window" + unit, {in.from, in.to}},
                      {"root_tolerance" + unit, in.tolerance},
                      {"method",
                       "the scenario's own N evaluated across the window (the other inputs at the scenario's values), "
                       "then Brent's method on log10 N - log10 max_decays and on log10 max Gamma_D/Gamma_H in the "
                       "bracket nearest the scenario's value"},
                      {"samples", "sensitivity.csv"}};
    if (in.input == ThresholdInput::top_mass) {
      e["critical_top_mass_GeV"] = value_or_null(in.critical_top_mass);
      e["critical_top_mass_note"] =
          in.critical_top_mass ? "absolute stability below it (effective-potential criterion), no seeded decay at all"
                               : in.critical_note;
    }
    j[scenario::name_of(in.input)] = std::move(e);
  }
  return j;
}

std::string thresholds_text(const pipeline::JobResults& r) {
  std::string t;
  for (const auto& in : r.thresholds) {
    t += fmt::format(
        "  thresholds in {} (the other inputs at the scenario's values; window {:.6g} to {:.6g}{}, "
        "roots to {:.2g}{}):\n",
        scenario::name_of(in.input), in.from, in.to, unit_words(in.input), in.tolerance, unit_words(in.input));
    if (in.input == ThresholdInput::top_mass)
      t += in.critical_top_mass
               ? fmt::format("    absolutely stable below the critical top mass {:.6g} GeV\n", *in.critical_top_mass)
               : fmt::format("    critical top mass not found: {}\n", in.critical_note);
    for (std::size_t k = 0; k < r.outcomes.size() && k < in.prescriptions.size(); ++k) {
      const auto& p = in.prescriptions[k];
      t += fmt::format("    {:<14} verdict flips: {}\n", tunnelling::name_of(r.outcomes[k].prescription),
                       value_text(in, p.exclusion));
      t += fmt::format("    {:<14} decay outruns evaporation: {}\n", "", value_text(in, p.outruns));
    }
  }
  return t;
}

std::string sensitivity_csv(const scenario::LoadedScenario& l, const pipeline::JobResults& r,
                            const std::string& header) {
  std::string out = header;
  for (const auto& in : r.thresholds) {
    const std::string name = scenario::name_of(in.input);
    out += fmt::format("# central {}: {:.8g}; sigma {:.8g}; window {:.8g} {:.8g}\n", name, in.central, in.sigma,
                       in.from, in.to);
    if (in.critical_top_mass) out += fmt::format("# critical top_mass: {:.8g}\n", *in.critical_top_mass);
    for (std::size_t k = 0; k < r.outcomes.size() && k < in.prescriptions.size(); ++k) {
      const std::string p = tunnelling::name_of(r.outcomes[k].prescription);
      if (const auto& v = in.prescriptions[k].exclusion.value)
        out += fmt::format("# threshold {} {}: {:.8g}\n", name, p, *v);
      if (const auto& v = in.prescriptions[k].outruns.value)
        out += fmt::format("# outruns-threshold {} {}: {:.8g}\n", name, p, *v);
    }
  }
  out += fmt::format("# max_decays: {}\n", format_real(l.scenario.exclusion.max_decays));
  out += "input,value,offset_sigma,prescription,N_lightcone,max_decay_to_evaporation,refinement,failed\n";
  for (const auto& in : r.thresholds)
    for (const auto& s : in.samples)
      out +=
          fmt::format("{},{:.10g},{:.6g},{},{},{},{},{}\n", scenario::name_of(in.input), s.value,
                      (s.value - in.central) / in.sigma, tunnelling::name_of(r.outcomes[s.prescription].prescription),
                      sample_cell(s.lightcone), sample_cell(s.max_ratio), s.grid ? 0 : 1, s.failure.empty() ? 0 : 1);
  return out;
}

}  // namespace ember::report::detail
