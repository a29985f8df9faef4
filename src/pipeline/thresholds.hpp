// Internal to the pipeline: after the main job, where the scenario's verdict flips as one
// Standard Model input moves (the others at the scenario's values), per prescription.
//
// For each input of scan.thresholds the scenario's own N is evaluated across a window around its
// value (`points` evaluations, every prescription), which draws the sensitivity figure and
// brackets the roots; each bracket nearest the scenario's value is then refined by Brent's
// method (GSL) to the stated tolerance. Two roots per prescription:
//   exclusion: log10 N = log10 max_decays (the verdict flips);
//   outruns:   log10 max_M Gamma_D/Gamma_H = 0 over the seed masses (below it, in the usual
//              direction, seeded decay never outruns evaporation and the seeded constraint is gone).
// N = 0 (no bubble, a stable potential) counts as log10 N = -400, below any double: the roots are
// then where the bubble appears, which Brent's bracket still closes on. Each evaluation builds
// the B(M) table at that point (kept in the table cache) and the scenario's responses, exactly as
// the main job does at the central point, so the evaluation at the scenario's own value gives the
// main N.
//
// Units: internal natural units (GeV), as job.hpp.
#pragma once

#include <vector>

#include "plan.hpp"

namespace ember::pipeline::detail {

// Empty unless the scenario's potential is built from the Standard Model inputs.
std::vector<InputThresholds> find_thresholds(const JobPlan& plan);

}  // namespace ember::pipeline::detail
