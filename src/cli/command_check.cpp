// `ember check SCENARIO.yaml`: validate a scenario and print it resolved, or print every error.
#include <fmt/format.h>

#include <iostream>

#include "command.hpp"
#include "ember/core/atomic_file.hpp"
#include "ember/core/errors.hpp"
#include "ember/scenario/load.hpp"

namespace ember::cli {

namespace {

struct CheckOptions {
  std::string scenario;
  std::string resolved_out;
  bool json = false;
};

nlohmann::ordered_json diagnostic_json(const scenario::Diagnostic& d) {
  return {{"file", d.file}, {"line", d.line},       {"column", d.column},
          {"key", d.path},  {"problem", d.problem}, {"expected", d.expected}};
}

int check(const CheckOptions& options) {
  scenario::LoadedScenario loaded;
  try {
    loaded = scenario::load_scenario_file(options.scenario);
  } catch (const scenario::ScenarioError& e) {
    if (options.json) {
      nlohmann::ordered_json errors = nlohmann::ordered_json::array();
      for (const auto& d : e.diagnostics()) errors.push_back(diagnostic_json(d));
      print_json({{"file", options.scenario}, {"valid", false}, {"errors", errors}});
    }
    throw;
  }
  const std::string yaml = scenario::resolved_yaml(loaded);
  if (!options.resolved_out.empty()) write_file_atomically(options.resolved_out, yaml);
  if (options.json) {
    print_json({{"file", options.scenario}, {"valid", true}, {"scenario", scenario::resolved_json(loaded.resolved)}});
  } else {
    std::cout << yaml;
  }
  fmt::print(stderr, "{}: valid scenario{}\n", options.scenario,
             options.resolved_out.empty() ? "" : fmt::format("; resolved copy written to {}", options.resolved_out));
  return exit_ok;
}

}  // namespace

Command add_check(CLI::App& parent) {
  auto options = std::make_shared<CheckOptions>();
  CLI::App* app = parent.add_subcommand(
      "check", "Validate a scenario file; print it with every default filled in, or print every error.");
  app->add_option("scenario", options->scenario, "scenario file (YAML)")->required();
  app->add_option("--resolved", options->resolved_out, "also write the resolved scenario to this file");
  app->add_flag("--json", options->json, "print one JSON object on stdout");
  return {app, [options] { return check(*options); }};
}

}  // namespace ember::cli
