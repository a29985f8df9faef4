// `ember run SCENARIO.yaml`: the main job. Validate the scenario, compute decay counts and
// constraint curves through every stage, write the results, and print a short summary.
#include <fmt/format.h>

#include <iostream>

#include "command.hpp"
#include "ember/core/cache.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/output_set.hpp"
#include "ember/core/parallel.hpp"
#include "ember/report/outputs.hpp"
#include "ember/scenario/job.hpp"

namespace ember::cli {

namespace {

struct RunOptions {
  std::string scenario, output, cache_dir, checkpoint;
  bool json = false, no_plots = false, quiet = false, no_cache = false, restart = false;
  int threads = default_threads();
};

int run(const RunOptions& o, const ExecutorFactory& factory) {
  const scenario::LoadedScenario loaded = scenario::load_scenario_file(o.scenario);  // input, validated whole
  const std::filesystem::path out =
      o.output.empty() ? loaded.scenario.output.directory : std::filesystem::path(o.output);
  check_results_folder(out);  // before the computation, not after
  scenario::JobOptions job;
  job.threads = o.threads;
  job.quiet = o.quiet;
  const std::unique_ptr<scenario::Executor> executor = factory ? factory(o.threads) : nullptr;
  job.executor = executor.get();
  if (!o.no_cache) job.cache_directory = o.cache_dir.empty() ? default_cache_directory() : o.cache_dir;
  // Resuming is the default: a rerun of the same command picks up the units a killed run finished.
  const std::filesystem::path checkpoint =
      o.checkpoint.empty() ? out / ".ember-checkpoint" : std::filesystem::path(o.checkpoint);
  job.checkpoint = scenario::CheckpointOptions{
      checkpoint, fmt::format("scenario {}\n{}", report::scenario_hash(loaded), scenario::job_identity(job)),
      o.restart};
  const scenario::JobResults results = scenario::run_job(loaded.scenario, job);  // cosmology, evaporation,
                                                                                 // higgs, tunnelling, population
  if (!results.assembled) return exit_ok;  // an MPI rank that only computed: rank 0 writes
  // Where the B(M) tables came from goes to stderr: it is not a result, and outputs do not depend on it.
  if (!o.quiet && (results.tables_built + results.tables_from_cache) > 0)
    std::cerr << fmt::format("ember: B(M) tables: {} from the cache{}, {} built\n", results.tables_from_cache,
                             job.cache_directory ? " in " + job.cache_directory->string() : std::string(" (off)"),
                             results.tables_built);
  // Shown even with --quiet: the next run will rebuild what this one could not keep.
  if (results.cache_warning)
    std::cerr << fmt::format("ember: warning: {}; the tables built here will be built again next time\n",
                             *results.cache_warning);
  if (results.checkpoint_warning) std::cerr << fmt::format("ember: warning: {}\n", *results.checkpoint_warning);
  if (!o.quiet && results.greybody_from_cache)
    std::cerr << fmt::format("ember: greybody table: {}\n", *results.greybody_from_cache ? "from the cache" : "built");
  if (!o.quiet && results.units_resumed > 0)
    std::cerr << fmt::format("ember: resumed {} finished units (tables and chunks) from {}\n", results.units_resumed,
                             checkpoint.string());
  const report::Written written = [&] {
    try {
      return report::write_outputs(loaded, results, out, !o.no_plots);
    } catch (const OutputError& e) {
      // The work is not lost: a rerun once there is room resumes from the checkpoint.
      std::error_code ec;
      if (!std::filesystem::exists(checkpoint / "job.identity", ec)) throw;
      throw OutputError(
          fmt::format("{}; the finished work is kept in {}, and rerunning the same command resumes "
                      "from it",
                      e.what(), checkpoint.string()));
    }
  }();
  scenario::Checkpoint::remove_folder(checkpoint);  // the outputs are whole: nothing left to resume
  if (o.json) {
    auto j = report::summary_json(loaded, results);
    j["output_directory"] = out.string();
    j["files"] = written.files;
    print_json(j);
  } else {
    std::cout << report::summary_text(loaded, results)
              << fmt::format("  results in {}: {}\n  {}\n", out.string(), fmt::join(written.files, ", "),
                             written.plots_note);
  }
  // Failed points are in the outputs with their reasons; the exit code still says a solver
  // failed, so scripts notice (exit 3, as for any numerical failure).
  if (!results.failures.empty()) {
    std::cout.flush();
    std::cerr << fmt::format(
        "ember: numerical failure at {} point(s) of the scan, recorded in {} (failed_points); "
        "the other points' results are written. First: {}\n",
        results.failures.size(), (out / "summary.json").string(), results.failures.front().reason);
    return exit_numerical;
  }
  return exit_ok;
}

}  // namespace

Command add_run(CLI::App& parent, ExecutorFactory factory) {
  auto o = std::make_shared<RunOptions>();
  CLI::App* app = parent.add_subcommand(
      "run",
      "The main job: decay counts in our past light cone and constraint curves for a PBH scenario, per rate "
      "prescription, with the Higgs-input band; results written to a folder.");
  app->add_option("scenario", o->scenario, "scenario file (YAML)")->required();
  app->add_option("-o,--output", o->output, "results folder (default: the scenario's output.directory)");
  app->add_flag("--no-plots", o->no_plots, "write the plot data but do not run scripts/plot");
  app->add_option("--threads", o->threads, "worker threads (default: the cores available); results do not depend on it")
      ->check(CLI::Range(1, 1024));
  app->add_flag("--quiet", o->quiet, "no progress bar or cache note");
  app->add_option("--cache-dir", o->cache_dir,
                  "keep tables (greybody, alpha(M), B(M)) here between runs (default: $EMBER_CACHE_DIR, else "
                  "$XDG_CACHE_HOME/ember, else "
                  "~/.cache/ember)");
  app->add_flag("--no-cache", o->no_cache, "build every table (greybody, alpha(M), B(M)) afresh and store none");
  app->add_option(
      "--checkpoint", o->checkpoint,
      "checkpoint finished work (tables, chunks of masses) here as the run goes; rerunning the same command resumes "
      "(default: OUTPUT/.ember-checkpoint, removed once the outputs are written)");
  app->add_flag("--restart", o->restart, "discard a checkpoint (of this or another scenario) and start afresh");
  app->add_flag("--json", o->json, "print the summary as one JSON object on stdout");
  return {app, [o, factory = std::move(factory)] { return run(*o, factory); }};
}

}  // namespace ember::cli
