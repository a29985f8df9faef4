// Checks of a scenario document that yaml-cpp cannot be trusted with, run before and right after
// parsing: printable UTF-8 text, commas where YAML allows them, and a bounded size and depth.
// Each throws ScenarioError with one diagnostic naming the file, line and column.
#pragma once

#include <yaml-cpp/yaml.h>

#include <string>
#include <string_view>

#include "ember/scenario/resolve.hpp"

namespace ember::scenario {

// A diagnostic about the document as a whole ("(document)" in place of a key path).
Diagnostic document_error(const std::string& label, const YAML::Mark& mark, std::string problem, std::string expected);

// Before parsing: no control characters but tab, line feed and carriage return, and valid UTF-8.
void check_printable(std::string_view text, const std::string& label);
// Before parsing: a ',' outside flow brackets only inside a plain scalar.
void check_commas(std::string_view text, const std::string& label);
// After parsing: no deeper nesting and no larger alias expansion than any scenario needs.
void check_document_size(const YAML::Node& root, const std::string& label);

}  // namespace ember::scenario
