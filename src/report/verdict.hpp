// The scenario's own verdict per prescription, with its margin: N against the exclusion limit,
// and the largest abundance of this exact spectrum shape that is still allowed.
#pragma once

#include <nlohmann/json.hpp>
#include <optional>
#include <string>

#include "ember/pipeline/job.hpp"
#include "ember/scenario/scenario.hpp"

namespace ember::report::detail {

struct Margin {
  double ratio = 0;                   // N / max_decays
  std::optional<double> beta, f_pbh;  // the abundance scaled to N = max_decays; none: no bound below beta = 1
  std::string words;                  // "EXCLUDED by a factor 3.2e+04", "allowed, a factor 12 to spare", ...
};

// Counts are linear in the abundance (population/counts.hpp), so the largest allowed abundance
// is the scenario's own times max_decays / N.
Margin margin_of(const pipeline::PrescriptionOutcome& o, double max_decays);

std::string verdict_text(const pipeline::JobResults& r, double max_decays);

// Where the decays come from (extended spectra): the masses holding 90% of N, and for a lognormal
// how far below its peak, in widths, half of N lies. A median more than tail_widths below the
// peak means the verdict rests on the assumed shape far from where it is known.
inline constexpr double tail_widths = 2;
std::optional<double> widths_below_peak(const scenario::Scenario& s, const pipeline::PrescriptionOutcome& o);
nlohmann::ordered_json where_from_json(const scenario::Scenario& s, const pipeline::PrescriptionOutcome& o);
std::string where_from_text(const scenario::Scenario& s, const pipeline::JobResults& r);
nlohmann::ordered_json verdict_json(const pipeline::PrescriptionOutcome& o, double max_decays);

}  // namespace ember::report::detail
