// Internal to the pipeline: the second stage. Every work item of the plan is computed, or read
// back from the checkpoint of an earlier run of the same job: the B(M) tables first (every
// process then gets every table: an MPI broadcast from rank 0), then the chunks of formation
// masses. Finished items are checkpointed as they complete.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "work_items.hpp"

namespace ember::pipeline::detail {

struct Executed {
  bool assembles = true;                     // false on MPI ranks that only computed (the rest is then empty)
  std::vector<std::string> texts;            // every item's record, in index order
  std::vector<TableRecord> records;          // every table's record
  Tables tables;                             // ... and the table itself, where there is one
  std::vector<std::size_t> computed_tables;  // tables computed by this run, not resumed
  int resumed = 0;                           // items read back from the checkpoint
  std::optional<std::string> checkpoint_warning;
};

// Sets the plan's table threads from the number of tables left to compute.
Executed execute(JobPlan& plan);

}  // namespace ember::pipeline::detail
