// The thresholds of the scenario's verdict in the Standard Model inputs (pipeline: thresholds),
// for summary.json, the printed summary and sensitivity.csv.
#pragma once

#include <nlohmann/json.hpp>
#include <string>

#include "ember/pipeline/job.hpp"
#include "ember/scenario/load.hpp"

namespace ember::report::detail {

// Per prescription (index k of JobResults::outcomes), keys containing "threshold": for each input
// searched, `<input>_threshold_GeV` (alpha_s: `alpha_s_threshold`, dimensionless) where the
// verdict flips, `<input>_outruns_threshold_GeV` where seeded decay stops outrunning evaporation,
// each with a `_note` saying which side is which, or why there is none (null value).
nlohmann::ordered_json prescription_thresholds_json(const pipeline::JobResults& r, std::size_t k);

// The searches themselves: window, tolerance, the critical top mass beside them, where the samples are.
nlohmann::ordered_json sensitivity_json(const pipeline::JobResults& r);

std::string thresholds_text(const pipeline::JobResults& r);

// One row per evaluation: input, value, offset in sigma, prescription, N, the largest
// Gamma_D / Gamma_H, whether it refined a root; the comment lines carry each threshold for the figure.
std::string sensitivity_csv(const scenario::LoadedScenario& l, const pipeline::JobResults& r,
                            const std::string& header);

}  // namespace ember::report::detail
