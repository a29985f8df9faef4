// The report: the scenario's own verdict and margin in summary.json.
#include <doctest/doctest.h>
#include <fmt/format.h>

#include <string>

#include "ember/pipeline/job.hpp"
#include "ember/report/outputs.hpp"
#include "ember/scenario/load.hpp"
#include "support.hpp"

using namespace ember;
using ember::testing::close;

namespace {
scenario::LoadedScenario lognormal(const std::string& value) {
  return scenario::load_scenario_text(
      "population:\n  spectrum: {shape: lognormal, peak_mass: 1e9 g, width: 0.5}\n  abundance: {measure: f_pbh, "
      "value: " +
          value +
          "}\ntunnelling: {prescriptions: [probe_field]}\nscan: {masses: {from: 1e8 g, to: 1e10 g, points: 2}}\n",
      "margin.yaml", ".");
}
}  // namespace

TEST_CASE("the largest allowed abundance is the one that gives N = max_decays") {
  // Counts are linear in the abundance (population/counts.hpp, derived): rerunning the scenario at
  // its own largest allowed f_PBH must give N = max_decays = 1, and the margin is N itself.
  const scenario::LoadedScenario first = lognormal("1e-20");
  const pipeline::JobResults r = pipeline::run_job(first.scenario);
  const auto j = report::summary_json(first, r)["prescriptions"]["probe_field"];
  const double n = j["N_lightcone"].get<double>();
  REQUIRE(n > 1);  // excluded at f = 1e-20 (an evaporated 1e9 g population)
  CHECK(close(j["N_over_max_decays"].get<double>(), n, 1e-12));
  CHECK(j["verdict"].get<std::string>().rfind("EXCLUDED by a factor", 0) == 0);
  const double f_allowed = j["largest_allowed"]["f_pbh"].get<double>();
  const scenario::LoadedScenario again = lognormal(fmt::format("{:.17g}", f_allowed));
  const pipeline::JobResults r2 = pipeline::run_job(again.scenario);
  CHECK(close(r2.outcomes.at(0).counts.lightcone, 1.0, 1e-9));
  const auto j2 = report::summary_json(again, r2)["prescriptions"]["probe_field"];
  CHECK(close(j2["largest_allowed"]["beta"].get<double>(), j["largest_allowed"]["beta"].get<double>(), 1e-9));
}
