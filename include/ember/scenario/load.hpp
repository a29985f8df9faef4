// Loading a scenario: read the file, parse YAML, validate against the schema, fill defaults,
// and build the typed Scenario. Nothing is computed until all of this has succeeded.
#pragma once

#include <yaml-cpp/yaml.h>

#include <filesystem>
#include <nlohmann/json.hpp>
#include <string>
#include <string_view>

#include "ember/scenario/resolve.hpp"
#include "ember/scenario/scenario.hpp"

namespace ember::scenario {

struct LoadedScenario {
  std::string source;   // the file as named by the user
  YAML::Node resolved;  // every key, canonical text
  Scenario scenario;
};

// Throws ScenarioError (an InputError) listing every problem, or InputError when the file
// cannot be read.
LoadedScenario load_scenario_file(const std::filesystem::path& file);

// The same, from text; `label` names it in diagnostics, relative input paths start at `base`.
LoadedScenario load_scenario_text(std::string_view text, const std::string& label, const std::filesystem::path& base);

// The fingerprint of the resolved scenario: what every output file and checkpoint names.
std::string scenario_hash(const LoadedScenario& loaded);

// The resolved scenario as YAML, loadable again to the same result.
std::string resolved_yaml(const LoadedScenario& loaded);

// The resolved scenario as JSON: numbers as numbers, flags as booleans, quantities as text
// with their unit ("1e+12 g").
nlohmann::ordered_json resolved_json(const YAML::Node& resolved);

}  // namespace ember::scenario
