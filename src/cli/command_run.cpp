// `ember run SCENARIO.yaml`: the main job. Validate the scenario, compute decay counts and
// constraint curves through every stage, write the results, and print a short summary.
#include <fmt/format.h>

#include <iostream>

#include "command.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/parallel.hpp"
#include "ember/pipeline/run.hpp"
#include "ember/report/outputs.hpp"
#include "plots.hpp"

namespace ember::cli {

namespace {

struct RunArguments {
  std::string scenario, output, cache_dir, checkpoint;
  bool json = false, no_plots = false, quiet = false, no_cache = false, restart = false, adopt_folder = false;
  int threads = default_threads();
};

// Where the tables came from, and what could not be kept, on stderr: not results, and the
// outputs do not depend on them. Warnings show even with --quiet: the next run would rebuild or
// lose what this one could not keep.
void print_notes(const pipeline::ScenarioRun& run, bool quiet) {
  const pipeline::JobResults& r = run.results;
  if (!quiet && (r.tables_built + r.tables_from_cache) > 0)
    std::cerr << fmt::format("ember: B(M) tables: {} from the cache{}, {} built\n", r.tables_from_cache,
                             run.cache_directory ? " in " + run.cache_directory->string() : std::string(" (off)"),
                             r.tables_built);
  if (r.cache_warning)
    std::cerr << fmt::format("ember: warning: {}; the tables built here will be built again next time\n",
                             *r.cache_warning);
  if (r.checkpoint_warning) std::cerr << fmt::format("ember: warning: {}\n", *r.checkpoint_warning);
  for (const auto& w : r.warnings) std::cerr << fmt::format("ember: warning: {}\n", w);
  if (!quiet && r.greybody_from_cache)
    std::cerr << fmt::format("ember: greybody table: {}\n", *r.greybody_from_cache ? "from the cache" : "built");
  if (!quiet && r.items_resumed > 0)
    std::cerr << fmt::format("ember: resumed {} finished work items (tables and chunks) from {}\n", r.items_resumed,
                             run.checkpoint.string());
}

// The results, written whole; then the checkpoint has served its purpose. If they cannot be
// written the work is not lost: a rerun once there is room resumes from the checkpoint.
report::Written write_results(const scenario::LoadedScenario& loaded, const pipeline::ScenarioRun& run,
                              const std::filesystem::path& out, bool plots) {
  try {
    // The figures are drawn into the set before it is committed, so they belong to it.
    const report::Figures figures = [plots](const std::filesystem::path& staging,
                                            const std::vector<std::string>& formats) {
      return plots ? draw_plots(staging, formats) : std::string("plots skipped (--no-plots)");
    };
    const report::Written written = report::write_outputs(loaded, run.results, out, figures, run.foreign);
    pipeline::discard_checkpoint(run);
    return written;
  } catch (const OutputError& e) {
    std::error_code ec;
    if (!std::filesystem::exists(run.checkpoint / "job.identity", ec)) throw;
    throw OutputError(fmt::format("{}; the finished work is kept in {}, and rerunning the same command resumes from it",
                                  e.what(), run.checkpoint.string()));
  }
}

int run(const RunArguments& o, const ExecutorFactory& factory) {
  const scenario::LoadedScenario loaded = scenario::load_scenario_file(o.scenario);  // input, validated whole
  const std::filesystem::path out =
      o.output.empty() ? loaded.scenario.output.directory : std::filesystem::path(o.output);
  const std::unique_ptr<pipeline::Executor> executor = factory ? factory(o.threads) : nullptr;
  pipeline::RunSettings settings;
  settings.threads = o.threads;
  settings.quiet = o.quiet;
  settings.use_cache = !o.no_cache;
  if (!o.cache_dir.empty()) settings.cache_directory = o.cache_dir;
  if (!o.checkpoint.empty()) settings.checkpoint = o.checkpoint;
  settings.restart = o.restart;
  settings.foreign = o.adopt_folder ? ForeignFolder::adopt : ForeignFolder::refuse;
  settings.executor = executor.get();
  const pipeline::ScenarioRun run = pipeline::run_scenario(loaded, out, settings);
  const pipeline::JobResults& results = run.results;
  if (!results.assembled) return exit_ok;  // an MPI rank that only computed: rank 0 writes
  print_notes(run, o.quiet);
  const report::Written written = write_results(loaded, run, out, !o.no_plots);
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
  auto o = std::make_shared<RunArguments>();
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
  app->add_flag("--adopt-folder", o->adopt_folder,
                "write into a non-empty results folder that no run of Ember wrote (its other files are left alone)");
  app->add_flag("--json", o->json, "print the summary as one JSON object on stdout");
  return {app, [o, factory = std::move(factory)] { return run(*o, factory); }};
}

}  // namespace ember::cli
