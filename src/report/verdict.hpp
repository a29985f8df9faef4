// The scenario's own verdict per prescription, with its margin: N against the exclusion limit,
// and the largest abundance of this exact spectrum shape that is still allowed.
#pragma once

#include <nlohmann/json.hpp>
#include <optional>
#include <string>

#include "ember/pipeline/job.hpp"

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
nlohmann::ordered_json verdict_json(const pipeline::PrescriptionOutcome& o, double max_decays);

}  // namespace ember::report::detail
