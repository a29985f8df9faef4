// Internal to the pipeline: the third stage. The executed items become the job's results: each
// (Higgs point, prescription) from its table and chunks, the central point's outcome per
// prescription, every band point's verdict and failures, and the band envelope per row.
#pragma once

#include "execute.hpp"

namespace ember::pipeline::detail {

void assemble(const JobPlan& plan, const Executed& done, JobResults& out);

}  // namespace ember::pipeline::detail
