#include "ember/pipeline/run.hpp"

#include <fmt/format.h>

#include "ember/core/cache.hpp"
#include "ember/core/output_set.hpp"

namespace ember::pipeline {

ScenarioRun run_scenario(const scenario::LoadedScenario& loaded, const std::filesystem::path& output,
                         const RunSettings& settings, JobOptions o) {
  check_results_folder(output, settings.foreign);  // before the computation, not after
  ScenarioRun run;
  run.foreign = settings.foreign;
  o.threads = settings.threads;
  o.quiet = settings.quiet;
  o.executor = settings.executor;
  if (settings.use_cache)
    o.cache_directory = settings.cache_directory ? settings.cache_directory : default_cache_directory();
  run.cache_directory = o.cache_directory;
  // Resuming is the default: a rerun of the same command picks up the items a killed run finished.
  run.checkpoint = settings.checkpoint.value_or(output / ".ember-checkpoint");
  o.checkpoint = CheckpointOptions{run.checkpoint,
                                   fmt::format("scenario {}\n{}", scenario::scenario_hash(loaded), job_identity(o)),
                                   settings.restart};
  run.results = run_job(loaded.scenario, o);
  return run;
}

void discard_checkpoint(const ScenarioRun& run) {
  Checkpoint::remove_folder(run.checkpoint);
}

}  // namespace ember::pipeline
