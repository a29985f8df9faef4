// A resolved scenario, written out and read back, resolves to the same thing.
#include <doctest/doctest.h>

#include <filesystem>

#include "ember/scenario/load.hpp"
#include "support.hpp"

namespace fs = std::filesystem;
using namespace ember::scenario;

namespace {
using ember::testing::source_dir;

void check_round_trip(const fs::path& file) {
  CAPTURE(file);
  const LoadedScenario first = load_scenario_file(file);
  const std::string yaml1 = resolved_yaml(first);
  const LoadedScenario second = load_scenario_text(yaml1, first.source, file.parent_path());
  const std::string yaml2 = resolved_yaml(second);
  CHECK(yaml1 == yaml2);
  CHECK(resolved_json(first.resolved) == resolved_json(second.resolved));
  // The resolved form names every key: a second resolution adds nothing.
  CHECK(YAML::Dump(first.resolved) == YAML::Dump(second.resolved));
}
}  // namespace

TEST_CASE("resolved scenarios round-trip") {
  // Every shipped config loads and round-trips; a config added later is picked up here.
  int configs = 0;
  for (const auto& entry : std::filesystem::directory_iterator(source_dir / "configs"))
    if (entry.path().extension() == ".yaml") {
      CAPTURE(entry.path().string());
      check_round_trip(entry.path());
      ++configs;
    }
  CHECK(configs >= 5);
  check_round_trip(source_dir / "tests/data/good/every_shape_table.yaml");
  check_round_trip(source_dir / "tests/data/good/polynomial_potential.yaml");
  check_round_trip(source_dir / "tests/data/good/power_law.yaml");
}

TEST_CASE("the resolved form is canonical") {
  const auto a = load_scenario_text(
      "population: {spectrum: {shape: monochromatic, mass: 1e15g}, abundance: {measure: beta, value: 1.0e-20}}\n",
      "a.yaml", ".");
  const auto b = load_scenario_text(
      "population:\n  abundance: {value: 0.00000000000000000001, measure: beta}\n  spectrum: {mass: '1e+15 g', shape: "
      "monochromatic}\n",
      "a.yaml", ".");
  CHECK(resolved_yaml(a) == resolved_yaml(b));
  CHECK(a.resolved["population"]["spectrum"]["mass"].Scalar() == "1e15 g");
}
