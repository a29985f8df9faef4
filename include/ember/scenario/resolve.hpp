// Validation of a parsed YAML document against the schema, filling in defaults.
//
// Every problem becomes a Diagnostic, formatted as
//   FILE:LINE:COL: <key path>: <what is wrong>; expected <...>
// and all of them are collected before the caller decides to stop.
#pragma once

#include <yaml-cpp/yaml.h>

#include <filesystem>
#include <string>
#include <vector>

#include "ember/core/errors.hpp"
#include "ember/scenario/schema.hpp"

namespace ember::scenario {

struct Diagnostic {
  std::string file;
  int line = 1;      // 1-based
  int column = 1;    // 1-based
  std::string path;  // dotted key path, e.g. "population.spectrum.width"; "(document)" for the whole file
  std::string problem;
  std::string expected;

  std::string format() const;
};

// Thrown when a scenario fails to load; what() holds every diagnostic, one per line.
class ScenarioError : public InputError {
 public:
  explicit ScenarioError(std::vector<Diagnostic> diagnostics);
  const std::vector<Diagnostic>& diagnostics() const { return diagnostics_; }

 private:
  std::vector<Diagnostic> diagnostics_;
};

struct ResolveContext {
  std::string file_label;                // as it appears in diagnostics
  std::filesystem::path base_directory;  // relative input paths are taken from here
};

struct Resolution {
  YAML::Node tree;  // the resolved document: every key present, values in canonical text
  std::vector<Diagnostic> errors;
};

// Validates `document` against the root section `schema`.
Resolution resolve(const YAML::Node& document, const Key& schema, const ResolveContext& context);

}  // namespace ember::scenario
