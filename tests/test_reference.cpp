// configs/reference.yaml documents every key, and is exactly what the schema generates.
#include <doctest/doctest.h>

#include <filesystem>
#include <fstream>
#include <sstream>

#include "ember/scenario/load.hpp"
#include "ember/scenario/reference.hpp"
#include "support.hpp"

namespace fs = std::filesystem;
using namespace ember::scenario;

namespace {
using ember::testing::source_dir;

void check_documented(const Key& key, const std::string& path) {
  CAPTURE(path);
  CHECK(!key.meaning.empty());
  if (key.type == ValueType::section) {
    for (const auto& c : key.children) check_documented(c, path + "." + c.name);
  } else if (key.type == ValueType::choice) {
    for (const auto& v : key.variants) {
      CHECK(!v.meaning.empty());
      for (const auto& c : v.keys) check_documented(c, path + "." + c.name);
    }
  } else {
    // A value key has a default, or is required with an example, or shows an example.
    CHECK((key.fallback.has_value() || !key.example.empty()));
  }
}
}  // namespace

TEST_CASE("the shipped reference is the generated one") {
  std::ifstream in(source_dir / "configs/reference.yaml");
  std::ostringstream shipped;
  shipped << in.rdbuf();
  CHECK_MESSAGE(shipped.str() == reference_yaml(scenario_schema()),
                "configs/reference.yaml is stale: regenerate it with `build/ember schema > configs/reference.yaml`");
}

TEST_CASE("every key is documented") {
  const Key schema = scenario_schema();
  for (const auto& c : schema.children) check_documented(c, c.name);
}

TEST_CASE("the reference loads as a scenario, so its examples and defaults are valid") {
  CHECK_NOTHROW(load_scenario_file(source_dir / "configs/reference.yaml"));
}

TEST_CASE("the reference JSON names types, defaults and ranges") {
  const auto j = reference_json(scenario_schema());
  CHECK(j["keys"]["standard_model"]["keys"]["top_mass"]["default"] == "172.57 GeV");
  CHECK(j["keys"]["standard_model"]["keys"]["top_mass"]["range"] == "between 150 GeV and 200 GeV");
  CHECK(j["keys"]["population"]["keys"]["spectrum"]["selector"] == "shape");
  CHECK(j["keys"]["population"]["required"] == true);
}
