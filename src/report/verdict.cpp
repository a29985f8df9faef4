#include "verdict.hpp"

#include <fmt/format.h>

#include "ember/core/text.hpp"

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

}  // namespace ember::report::detail
