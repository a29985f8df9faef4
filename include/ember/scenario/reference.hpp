// The documented reference of every scenario key, generated from the schema: the text of
// configs/reference.yaml, and the same as JSON.
#pragma once

#include <nlohmann/json.hpp>
#include <string>

#include "ember/scenario/schema.hpp"

namespace ember::scenario {

// YAML with a comment above each key giving its meaning, unit, default and range. It loads as
// a valid scenario: required keys carry examples, and the variants not shown are commented out.
std::string reference_yaml(const Key& schema);

nlohmann::ordered_json reference_json(const Key& schema);

}  // namespace ember::scenario
