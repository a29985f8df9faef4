#include "verdict.hpp"

#include <fmt/format.h>

#include <cmath>

#include "ember/core/text.hpp"
#include "ember/units/constants.hpp"

namespace ember::report::detail {

Margin margin_of(const pipeline::PrescriptionOutcome& o, double max_decays) {
  Margin m;
  const double n = o.counts.lightcone;
  m.ratio = n / max_decays;
  if (!o.failure.empty()) {
    m.words = "FAILED";
    return m;
  }
  if (n > 0) {
    const double scale = max_decays / n;
    if (o.counts.beta * scale < 1) {
      m.beta = o.counts.beta * scale;
      m.f_pbh = o.counts.f_pbh * scale;
    }
  }
  if (o.excluded)
    m.words = fmt::format("EXCLUDED by a factor {:.3g}", m.ratio);
  else if (n > 0)
    m.words = fmt::format("allowed, a factor {:.3g} to spare", 1 / m.ratio);
  else
    m.words = "allowed (no decays at all)";
  return m;
}

std::string verdict_text(const pipeline::JobResults& r, double max_decays) {
  std::string t = fmt::format("  verdict for this scenario (excluded when N_lightcone > max_decays = {}):\n",
                              format_real(max_decays));
  t += fmt::format("  {:<14} {:>14} {:>15} {:>16}  {}\n", "prescription", "N_lightcone", "N / max_decays",
                   "survival e^-N", "verdict");
  for (const auto& o : r.outcomes) {
    const Margin m = margin_of(o, max_decays);
    t += fmt::format("  {:<14} {:>14.4e} {:>15.4e} {:>16.4e}  {}\n", tunnelling::name_of(o.prescription),
                     o.counts.lightcone, m.ratio, o.survival, m.words);
  }
  t += "  largest allowed abundance of this spectrum (its shape kept, scaled to N = max_decays):\n";
  for (const auto& o : r.outcomes) {
    const Margin m = margin_of(o, max_decays);
    t += fmt::format("    {:<14} {}\n", tunnelling::name_of(o.prescription),
                     m.beta ? fmt::format("beta <= {:.4e}, f_PBH <= {:.4e}", *m.beta, *m.f_pbh)
                            : std::string(o.failure.empty() ? "no bound (even beta = 1 gives at most max_decays)"
                                                            : "not computed (a solver failed)"));
  }
  return t;
}

nlohmann::ordered_json verdict_json(const pipeline::PrescriptionOutcome& o, double max_decays) {
  const Margin m = margin_of(o, max_decays);
  const auto value = [](std::optional<double> v) { return v ? nlohmann::ordered_json(*v) : nlohmann::ordered_json(); };
  return {{"N_over_max_decays", m.ratio},
          {"verdict", m.words},
          {"largest_allowed",
           {{"beta", value(m.beta)},
            {"f_pbh", value(m.f_pbh)},
            {"meaning",
             "the scenario's abundance scaled until N = max_decays, the spectrum's shape kept; beta quoted at the "
             "characteristic mass for an extended spectrum; null: no bound below beta = 1"}}}};
}

std::optional<double> widths_below_peak(const scenario::Scenario& s, const pipeline::PrescriptionOutcome& o) {
  const auto* l = std::get_if<scenario::Lognormal>(&s.population.spectrum);
  if (!l || !o.range90) return std::nullopt;
  return std::log(l->peak_mass / o.range90->median) / l->width;
}

nlohmann::ordered_json where_from_json(const scenario::Scenario& s, const pipeline::PrescriptionOutcome& o) {
  if (!o.range90) return nullptr;
  const auto below = widths_below_peak(s, o);
  return {{"range_90_percent_g", {o.range90->low / units::gram, o.range90->high / units::gram}},
          {"median_g", o.range90->median / units::gram},
          {"median_widths_below_peak", below ? nlohmann::ordered_json(*below) : nlohmann::ordered_json()},
          {"rests_on_low_tail", below && *below > tail_widths},
          {"per_mass", "decay.csv, column dN_dlnM (rows of this prescription)"}};
}

std::string where_from_text(const scenario::Scenario& s, const pipeline::JobResults& r) {
  std::string t;
  for (const auto& o : r.outcomes) {
    if (!o.range90) continue;
    t += fmt::format("    {:<14} 90% of N from {:.3g} g to {:.3g} g (median {:.3g} g)\n",
                     tunnelling::name_of(o.prescription), o.range90->low / units::gram, o.range90->high / units::gram,
                     o.range90->median / units::gram);
    if (const auto below = widths_below_peak(s, o); below && *below > tail_widths)
      t += fmt::format(
          "      warning: half of N comes from more than {:.1f} widths below the spectrum's peak: the verdict rests on "
          "the assumed shape far from the peak (population.cut_below shows how much)\n",
          *below);
  }
  return t.empty() ? t : "  where the decays come from (extended spectrum):\n" + t;
}

}  // namespace ember::report::detail
