// The band over the Higgs inputs, point by point: band.csv, and whether the band is flat and why.
#pragma once

#include <optional>
#include <string>

#include "ember/pipeline/job.hpp"
#include "ember/scenario/load.hpp"

namespace ember::report::detail {

// One row per band point, prescription and scan row: the point's inputs and offset in sigma,
// beta_max, f_max and N for the scenario's abundance at that row.
std::string band_csv(const scenario::LoadedScenario& l, const pipeline::JobResults& r, const std::string& header);

// A band of more than one point whose beta_max is the same at every point: why, when every
// central decay is certain (P_decay = 1: beta_max then depends only on the light-cone count, not
// on the Higgs inputs); none when the band is not flat.
std::optional<std::string> flat_band_note(const pipeline::JobResults& r);

}  // namespace ember::report::detail
