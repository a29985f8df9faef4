// The one entry point that runs a loaded scenario: the command line, ember-mpi and library
// callers all come through here. It settles how the job runs (threads, the cache, the checkpoint
// and its identity) and runs it (job.hpp); the caller writes the results (report/outputs.hpp) and
// then discards the checkpoint.
#pragma once

#include <filesystem>
#include <optional>

#include "ember/core/output_set.hpp"
#include "ember/pipeline/job.hpp"
#include "ember/scenario/load.hpp"

namespace ember::pipeline {

// How to run; none of it changes a number.
struct RunSettings {
  int threads = 1;
  bool quiet = true;  // no progress bar on stderr
  // Tables are kept between runs in `cache_directory`, or the default folder (core/cache.hpp)
  // when that is empty; `use_cache` off: every table is built afresh and none is stored.
  bool use_cache = true;
  std::optional<std::filesystem::path> cache_directory;
  // Finished work items are kept here as the run goes, and a rerun of the same job resumes from
  // them; none: OUTPUT/.ember-checkpoint. `restart` discards a checkpoint of this or another job.
  std::optional<std::filesystem::path> checkpoint;
  bool restart = false;
  const Executor* executor = nullptr;  // none: `threads` threads here. Not owned.
  // A non-empty results folder no run of Ember wrote: refused, or adopted (core/output_set.hpp).
  ForeignFolder foreign = ForeignFolder::refuse;
};

struct ScenarioRun {
  JobResults results;
  std::filesystem::path checkpoint;                      // where finished items were kept
  std::optional<std::filesystem::path> cache_directory;  // none: the cache was off
  ForeignFolder foreign = ForeignFolder::refuse;         // as settled before the run, for the writing
};

// Checks that `output` can hold the results before computing anything (InputError, OutputError),
// then runs the job with `numerics` (the job's numerical options; their thread, cache and
// checkpoint fields are set from `settings`).
ScenarioRun run_scenario(const scenario::LoadedScenario& loaded, const std::filesystem::path& output,
                         const RunSettings& settings, JobOptions numerics = {});

// Once the results are written, nothing is left to resume. Best effort.
void discard_checkpoint(const ScenarioRun& run);

}  // namespace ember::pipeline
