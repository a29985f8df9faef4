// Every malformed scenario in tests/data/bad/ is rejected with an error naming its line and key
// path; expectations.tsv lists what each must say.
#include <doctest/doctest.h>

#include <filesystem>
#include <fstream>
#include <set>
#include <sstream>

#include "ember/scenario/load.hpp"
#include "support.hpp"

namespace fs = std::filesystem;
using namespace ember::scenario;

namespace {
const fs::path bad_dir = ember::testing::source_dir / "tests/data/bad";

struct Expectation {
  std::string file;
  int line;
  std::string key, fragment;
};

std::vector<Expectation> read_expectations() {
  std::vector<Expectation> out;
  std::ifstream in(bad_dir / "expectations.tsv");
  std::string row;
  while (std::getline(in, row)) {
    if (row.empty() || row[0] == '#') continue;
    std::istringstream fields(row);
    Expectation e;
    std::string line;
    std::getline(fields, e.file, '\t');
    std::getline(fields, line, '\t');
    std::getline(fields, e.key, '\t');
    std::getline(fields, e.fragment);
    e.line = std::stoi(line);
    out.push_back(e);
  }
  return out;
}
}  // namespace

TEST_CASE("the bad corpus is complete and large enough") {
  const auto expectations = read_expectations();
  std::set<std::string> listed;
  for (const auto& e : expectations) listed.insert(e.file);
  std::set<std::string> present;
  for (const auto& entry : fs::directory_iterator(bad_dir))
    if (entry.path().extension() == ".yaml") present.insert(entry.path().filename().string());
  CHECK(listed == present);
  CHECK(present.size() >= 20);  // a corpus of at least 20 malformed scenarios, one per kind of error
}

TEST_CASE("each malformed scenario fails with its line and key path") {
  for (const auto& e : read_expectations()) {
    CAPTURE(e.file);
    const fs::path file = bad_dir / e.file;
    try {
      load_scenario_file(file);
      FAIL("loaded without error: " << e.file);
    } catch (const ScenarioError& error) {
      const auto& ds = error.diagnostics();
      REQUIRE(!ds.empty());
      const Diagnostic& d = ds.front();
      CHECK(d.file == file.string());
      CHECK(d.line == e.line);
      CHECK(d.path == e.key);
      CHECK(d.format().find(e.fragment) != std::string::npos);
      // The promised shape: FILE:LINE:COL: <key path>: <what is wrong>; expected <...>
      const std::string prefix = file.string() + ":" + std::to_string(e.line) + ":";
      CHECK(d.format().rfind(prefix, 0) == 0);
      CHECK(d.format().find(": " + e.key + ": ") != std::string::npos);
      CHECK(d.format().find("; expected ") != std::string::npos);
    }
  }
}
