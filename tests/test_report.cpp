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
using ember::testing::no_thresholds;

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
  const pipeline::JobResults r = pipeline::run_job(no_thresholds(first.scenario));
  const auto j = report::summary_json(first, r)["prescriptions"]["probe_field"];
  const double n = j["N_lightcone"].get<double>();
  REQUIRE(n > 1);  // excluded at f = 1e-20 (an evaporated 1e9 g population)
  CHECK(close(j["N_over_max_decays"].get<double>(), n, 1e-12));
  CHECK(j["verdict"].get<std::string>().rfind("EXCLUDED by a factor", 0) == 0);
  const double f_allowed = j["largest_allowed"]["f_pbh"].get<double>();
  const scenario::LoadedScenario again = lognormal(fmt::format("{:.17g}", f_allowed));
  const pipeline::JobResults r2 = pipeline::run_job(no_thresholds(again.scenario));
  CHECK(close(r2.outcomes.at(0).counts.lightcone, 1.0, 1e-9));
  const auto j2 = report::summary_json(again, r2)["prescriptions"]["probe_field"];
  CHECK(close(j2["largest_allowed"]["beta"].get<double>(), j["largest_allowed"]["beta"].get<double>(), 1e-9));
}

namespace {
pipeline::JobResults band_run(const std::string& band, scenario::LoadedScenario& loaded) {
  loaded = scenario::load_scenario_text(
      "population:\n  spectrum: {shape: monochromatic, mass: 1e8 g}\n  abundance: {measure: beta, value: 1e-70}\n"
      "tunnelling: {prescriptions: [probe_field]}\nscan:\n  masses: {from: 10 g, to: 1e12 g, points: 3}\n  band: " +
          band + "\n",
      "band.yaml", ".");
  return pipeline::run_job(no_thresholds(loaded.scenario));
}
}  // namespace

TEST_CASE("bands per point: 1 sigma inside 2 sigma inside the whole band, clean labels, flat bands explained") {
  // M_t over -2..+2 sigma in five points: the 1 sigma band holds the -1, 0, +1 points, the 2 sigma
  // band all five (derived from the definitions). Each band contains the central curve.
  scenario::LoadedScenario loaded;
  const pipeline::JobResults r = band_run("{top_mass: {span: 2, points: 5}, alpha_s: {span: 2, points: 2}}", loaded);
  REQUIRE(r.band.size() == 11);  // the central point and the 5 x 2 grid (alpha_s at -2 and +2 sigma only)
  for (const auto& b : r.band) {
    CAPTURE(b.point.label);
    CHECK(b.point.label.find("999999") == std::string::npos);
    CHECK(b.point.label.find("000001") == std::string::npos);
    CHECK(b.point.sigmas <= 2 + 1e-9);
  }
  for (const auto& row : r.outcomes.at(0).curve) {
    if (!row.beta_max || !row.band1_low || !row.band2_low || !row.band_low) continue;
    CHECK(*row.band_low <= *row.band2_low);
    CHECK(*row.band2_low <= *row.band1_low);
    CHECK(*row.band1_low <= *row.beta_max);
    CHECK(*row.beta_max <= *row.band1_high);
    CHECK(*row.band1_high <= *row.band2_high);
    CHECK(*row.band2_high <= *row.band_high);
    // alpha_s has only its -2 and +2 sigma points here, so the 1 sigma band is the central point.
    CHECK(*row.band1_low == *row.beta_max);
    CHECK(*row.band1_high == *row.beta_max);
  }
  // Over M_t alone every evaporating hole here decays for certain (P_decay = 1) at every point,
  // so beta_max is the light-cone count's alone and the band is flat: the summary says why.
  scenario::LoadedScenario flat_loaded;
  const pipeline::JobResults flat = band_run("{top_mass: {span: 1, points: 3}}", flat_loaded);
  const auto j = report::summary_json(flat_loaded, flat);
  REQUIRE(j.contains("band_note"));
  CHECK(j["band_note"].get<std::string>().find("P_decay = 1") != std::string::npos);
  CHECK(j["band"].size() == 3);
  CHECK(j["band"][1]["N_lightcone"]["probe_field"].get<double>() > 0);
}
