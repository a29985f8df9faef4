// The main job (pipeline::run_job) end to end: verdicts, thread and chunk independence,
// checkpoints, bands, failed points, and N against an independent light-cone count.
#include <doctest/doctest.h>
#include <fmt/format.h>
#include <unistd.h>

#include <cmath>
#include <filesystem>
#include <iterator>
#include <string>
#include <tuple>

#include "ember/core/errors.hpp"
#include "ember/pipeline/job.hpp"
#include "ember/scenario/load.hpp"
#include "ember/units/constants.hpp"
#include "support.hpp"

using namespace ember;
namespace u = ember::units;
using ember::testing::close;
using ember::testing::no_thresholds;
using ember::testing::source_dir;

namespace {
// The number of holes formed inside our past light cone per unit beta, computed here without the
// cosmology module: radiation era, t_f = G M / gamma (Carr, ApJ 201 (1975) 1; gamma = 0.2, common
// practice), rho = 3 / (32 pi G t^2) (Friedmann, radiation era), rho = (pi^2/30) g T^4 with
// g = g_s = 106.75 (the Standard Model above the electroweak scale; Kolb & Turner, The Early
// Universe, 1990, sec. 3.3), entropy conservation a_f = (3.91 / 106.75)^(1/3) T_0 / T_f with
// T_0 = 2.7255 K (Fixsen, ApJ 707 (2009) 916), and the light cone's comoving radius at t_f ~ 0
// the particle horizon, 14.2 Gpc (Planck 2018; common practice). Good to a few per cent.
double independent_count_per_beta(double mass) {
  const double gamma = 0.2, g = 106.75;
  const double t_f = u::newton_G * mass / gamma;
  const double rho = 3 / (32 * u::pi * u::newton_G * t_f * t_f);
  const double temperature = std::pow(30 * rho / (u::pi * u::pi * g), 0.25);
  const double a_f = std::cbrt(3.91 / g) * 2.7255 * u::kelvin / temperature;
  const double chi = 14.2e9 * u::parsec;
  return rho / mass * a_f * a_f * a_f * 4 * u::pi / 3 * chi * chi * chi;
}

// configs/higgs_sensitivity.yaml cut down: 3 masses, the central point and M_t at -2 and +2 sigma.
scenario::LoadedScenario small_band() {
  auto loaded = scenario::load_scenario_file(source_dir / "configs/higgs_sensitivity.yaml");
  loaded.scenario.scan.masses.points = 3;
  loaded.scenario.scan.band.top_mass.points = 2;
  loaded.scenario.scan.band.higgs_mass.points = 1;
  loaded.scenario.scan.band.alpha_s.points = 1;
  loaded.scenario.scan.band.lambda6.clear();
  return loaded;
}

}  // namespace

TEST_CASE("a stable potential gives no constraint, and says so") {
  // M_t = 168 GeV is below the critical top mass (test_higgs.cpp): the vacuum is stable.
  const auto loaded = scenario::load_scenario_text(
      "population:\n  spectrum: {shape: monochromatic, mass: 1e9 g}\n  abundance: {measure: beta, value: 1e-20}\n"
      "standard_model: {top_mass: 168 GeV}\ntunnelling: {prescriptions: [probe_field, hot_bubble]}\n"
      "scan: {masses: {from: 1 g, to: 1e12 g, points: 4}}\n",
      "stable.yaml", ".");
  const pipeline::JobResults r = pipeline::run_job(no_thresholds(loaded.scenario));
  CHECK(r.no_constraint);
  CHECK(r.no_constraint_reason.find("stable") != std::string::npos);
  for (const auto& o : r.outcomes) {
    CHECK(o.counts.lightcone == 0.0);
    CHECK_FALSE(o.excluded);
    for (const auto& row : o.curve) CHECK_FALSE(row.beta_max);
  }
}

TEST_CASE("results do not depend on the thread count") {
  auto loaded = small_band();
  // And the chunks of formation masses the work is shared out in (one row each, against the
  // default): a division of work only, so the same bits (derived).
  // With max_chunks = 1 the bound wins over rows_per_chunk: one chunk per table.
  pipeline::JobOptions one, two, fine, bounded;
  one.threads = 1;
  two.threads = 2;
  fine.threads = 2;
  fine.rows_per_chunk = 1;
  bounded.rows_per_chunk = 1;
  bounded.max_chunks = 1;
  const pipeline::JobResults a = pipeline::run_job(no_thresholds(loaded.scenario), one);
  for (const auto* options : {&two, &fine, &bounded}) {
    const pipeline::JobResults b = pipeline::run_job(no_thresholds(loaded.scenario), *options);
    REQUIRE(a.outcomes.size() == b.outcomes.size());
    for (std::size_t k = 0; k < a.outcomes.size(); ++k) {
      CHECK(a.outcomes[k].counts.lightcone == b.outcomes[k].counts.lightcone);  // bit for bit
      REQUIRE(a.outcomes[k].curve.size() == b.outcomes[k].curve.size());
      for (std::size_t r = 0; r < a.outcomes[k].curve.size(); ++r) {
        CHECK(a.outcomes[k].curve[r].beta_max == b.outcomes[k].curve[r].beta_max);
        CHECK(a.outcomes[k].curve[r].band_low == b.outcomes[k].curve[r].band_low);
        CHECK(a.outcomes[k].curve[r].band_high == b.outcomes[k].curve[r].band_high);
      }
      REQUIRE(a.outcomes[k].scan.size() == b.outcomes[k].scan.size());
      for (std::size_t r = 0; r < a.outcomes[k].scan.size(); ++r)
        CHECK(a.outcomes[k].scan[r].decay.hazard == b.outcomes[k].scan[r].decay.hazard);
    }
  }
  CHECK(a.band.size() == 3);  // the central point and M_t at -2 and +2 sigma
}

TEST_CASE("checkpoint files stay bounded however fine the grid, and a rerun resumes from them") {
  // 3000 scan rows at 8 per chunk would be 375 chunk files; the bound (max_chunks, 256) holds
  // them to 256 beside the one table and the identity, and a rerun computes nothing.
  const auto loaded = scenario::load_scenario_text(
      "population:\n  spectrum: {shape: monochromatic, mass: 1e9 g}\n  abundance: {measure: beta, value: 1e-20}\n"
      "tunnelling: {prescriptions: [probe_field]}\nscan: {masses: {from: 1 g, to: 1e12 g, points: 3000}}\n",
      "many_rows.yaml", ".");
  const auto dir = std::filesystem::temp_directory_path() / ("ember-checkpoint-bound-" + std::to_string(::getpid()));
  std::filesystem::remove_all(dir);
  pipeline::JobOptions o;
  o.table_points = 8;  // bookkeeping only: the table's accuracy is not what is tested
  o.checkpoint = pipeline::CheckpointOptions{dir, "bound test", false};
  const pipeline::JobResults first = pipeline::run_job(no_thresholds(loaded.scenario), o);
  const auto files = static_cast<int>(std::distance(std::filesystem::directory_iterator(dir), {}));
  CHECK(files == 1 + 1 + o.max_chunks);
  const pipeline::JobResults again = pipeline::run_job(no_thresholds(loaded.scenario), o);
  CHECK(again.items_resumed == 1 + o.max_chunks);
  REQUIRE(first.outcomes.at(0).curve.size() == 3000);
  for (std::size_t r = 0; r < 3000; ++r)
    CHECK(first.outcomes[0].curve[r].beta_max == again.outcomes[0].curve[r].beta_max);
  std::filesystem::remove_all(dir);
}

TEST_CASE("a band mixing stable and metastable points, with widths, lambda6 and a light-cone count") {
  // Derived checks of the job's bookkeeping: a band over M_t +- 2 GeV (the low end is
  // stable: the critical top mass is about 171 GeV, Buttazzo et al. JHEP 12 (2013) 089, from
  // memory; the test reads each point's verdict rather than assuming it) and lambda6 = 3.
  const auto loaded = scenario::load_scenario_text(R"(
population:
  spectrum: {shape: lognormal, peak_mass: 1e9 g, width: 0.5}
  abundance: {measure: lightcone_count, value: 3}
standard_model: {loops: 2}
tunnelling: {prescriptions: [probe_field]}
scan:
  masses: {from: 1e8 g, to: 1e10 g, points: 2}
  widths: [0.3, 0.6]
  band:
    top_mass: {span: 2, points: 3, sigma: 1 GeV}
    lambda6: [3.0]
)",
                                                   "band.yaml", ".");
  const pipeline::JobResults r = pipeline::run_job(no_thresholds(loaded.scenario));
  // The central point, then 3 top masses x {0, 3} for lambda6 less the central one: 6 points.
  REQUIRE(r.band.size() == 6);
  int stable = 0, with_lambda6 = 0;
  for (const auto& b : r.band) {
    if (b.verdict == higgs::Verdict::stable) {
      ++stable;
      CHECK_FALSE(b.constraint);  // a stable point constrains nothing
    }
    with_lambda6 += b.point.lambda6 == 3.0;
  }
  CHECK(stable == 2);  // M_t = 170.57 GeV with and without lambda6
  CHECK(with_lambda6 == 3);
  const auto& o = r.outcomes.at(0);
  // Rows: 2 characteristic masses x 2 widths, and the widths change the answer.
  REQUIRE(o.curve.size() == 4);
  CHECK(o.curve[0].width == 0.3);
  CHECK(o.curve[1].width == 0.6);
  REQUIRE(o.curve[0].beta_max);
  REQUIRE(o.curve[1].beta_max);
  CHECK(*o.curve[0].beta_max != *o.curve[1].beta_max);
  for (const auto& row : o.curve) {
    CHECK(row.band_without == 2);  // exactly the stable points
    REQUIRE(row.band_low);
    REQUIRE(row.band_high);
    CHECK(*row.band_low <= *row.beta_max);
    CHECK(*row.beta_max <= *row.band_high);
  }
  // The abundance given as a light-cone count comes back as that count.
  CHECK(close(o.counts.lightcone, 3.0, 1e-6));
  CHECK(o.excluded);
}

TEST_CASE("a failed point is recorded with its reason, and the rest of the scan goes on") {
  // Derived (the job's contract: a failure is recorded, never fatal): failures are injected through
  // JobOptions::before_row, as a solver would throw them; every other number must equal the run without failures.
  auto loaded = small_band();
  loaded.scenario.tunnelling.prescriptions = {tunnelling::Prescription::probe_field};
  pipeline::JobOptions plain, failing;
  failing.before_row = [](std::size_t point, std::size_t, std::size_t row) {
    if (point == 1 && row == 1) throw ember::NumericalError("test solver", "injected at row 1 of point 1");
    if (point == 0 && row == 3) throw ember::NumericalError("test solver", "injected in the central counts");
  };
  const pipeline::JobResults a = pipeline::run_job(no_thresholds(loaded.scenario), plain);
  const pipeline::JobResults b = pipeline::run_job(no_thresholds(loaded.scenario), failing);
  CHECK(a.failures.empty());
  REQUIRE(b.failures.size() == 2);
  // In scan order: the central point's unit, then point 1's row 1.
  CHECK(b.failures[0].point == 0);
  CHECK_FALSE(b.failures[0].mass);
  CHECK(b.failures[0].reason.find("injected in the central counts") != std::string::npos);
  CHECK(b.failures[1].point == 1);
  REQUIRE(b.failures[1].mass);
  CHECK(*b.failures[1].mass == a.outcomes[0].curve[1].mass);
  CHECK(b.failures[1].prescription == "probe_field");
  CHECK(b.failures[1].reason.find("test solver: injected at row 1") != std::string::npos);
  // The central unit failed as a whole: no verdict, no curve, but the band points still count.
  const auto& o = b.outcomes[0];
  CHECK_FALSE(o.failure.empty());
  CHECK_FALSE(o.excluded);
  for (const auto& row : o.curve) {
    CHECK(row.failed);
    CHECK_FALSE(row.beta_max);
  }
  CHECK(b.band[0].failed);
  CHECK(b.band[1].failed);
  CHECK_FALSE(b.band[2].failed);
  // Point 2 is untouched and point 1 lost only row 1; the central value lies inside the band
  // (beta_max moves monotonically with M_t), so the envelope edges at rows 0 and 2 are as before.
  for (std::size_t r : {0u, 2u}) {
    CAPTURE(r);
    CHECK(o.curve[r].band_high == a.outcomes[0].curve[r].band_high);
  }
}

TEST_CASE("end to end: where every hole decays, N is beta times the holes formed in our light cone") {
  // A 1e10 g hole evaporates at about 1e-5 s (test_evaporation: 407 s (M / 1e10 g)^3 f-scaled), and
  // on the way its seeded rate outruns evaporation once the seed is light (entropy_drop,
  // probe_field): the decay is certain, so N = beta x (holes formed inside our past light cone).
  auto loaded = scenario::load_scenario_file(source_dir / "configs/demo.yaml");
  const double mass = 1e10 * u::gram, beta = 1e-30;
  loaded.scenario.population.spectrum = scenario::Monochromatic{mass};
  loaded.scenario.population.abundance = {population::AbundanceMeasure::beta, beta};
  loaded.scenario.scan.masses.points = 4;
  const pipeline::JobResults r = pipeline::run_job(no_thresholds(loaded.scenario));
  REQUIRE(r.stability);
  CHECK(r.stability->verdict == higgs::Verdict::metastable);
  const double holes = beta * independent_count_per_beta(mass);
  REQUIRE(r.outcomes.size() == 4);
  for (const auto& o : r.outcomes) {
    CAPTURE(tunnelling::name_of(o.prescription));
    CHECK(o.curve.size() == 4);
    // No prescription decays a hole more than once.
    CHECK(o.counts.lightcone <= 1.05 * holes);
    if (o.prescription == tunnelling::Prescription::entropy_drop ||
        o.prescription == tunnelling::Prescription::probe_field) {
      CHECK(close(o.counts.lightcone, holes, 0.03));  // measured: 1.0%
      CHECK(close(o.survival, std::exp(-o.counts.lightcone), 1e-12));
    }
  }
}

TEST_CASE("end to end on the demo as shipped: the lognormal's count follows from the light cone") {
  // The demo's lognormal (peak M_c = 1e9 g, width sigma = 0.7, beta quoted at M_c) lies wholly in
  // holes that evaporate early and, under entropy_drop and probe_field, decay for certain. In the
  // radiation era at fixed g_*, the holes per unit beta in the light cone go as M^(-3/2) and
  // f_PBH/beta as M^(-1/2) (formation.hpp's relations, derived), so
  //   N = beta K(M_c) int psi(M) (M_c / M) dM = beta K(M_c) e^(sigma^2/2)
  // (the lognormal's mean of M_c/M, derived), with K from the independent estimate above.
  auto loaded = scenario::load_scenario_file(source_dir / "configs/demo.yaml");
  loaded.scenario.scan.masses.points = 4;
  const pipeline::JobResults r = pipeline::run_job(no_thresholds(loaded.scenario));
  const double beta = 1e-22, peak = 1e9 * u::gram, sigma = 0.7;  // configs/demo.yaml
  const double expected = beta * independent_count_per_beta(peak) * std::exp(sigma * sigma / 2);
  for (const auto& o : r.outcomes)
    if (o.prescription == tunnelling::Prescription::entropy_drop ||
        o.prescription == tunnelling::Prescription::probe_field) {
      CAPTURE(tunnelling::name_of(o.prescription));
      CAPTURE(o.counts.lightcone / expected);
      CHECK(close(o.counts.lightcone, expected, 0.03));  // measured: 1.4%
    }
}

namespace {
pipeline::JobResults monochromatic_run(const std::string& mass, const std::string& tunnelling) {
  const auto loaded = scenario::load_scenario_text(
      "population:\n  spectrum: {shape: monochromatic, mass: " + mass +
          "}\n  abundance: {measure: beta, value: 1e-30}\ntunnelling: {prescriptions: [probe_field], " + tunnelling +
          "}\nscan: {masses: {from: 1 g, to: 1e4 g, points: 2}}\n",
      "hot_era.yaml", ".");
  return pipeline::run_job(no_thresholds(loaded.scenario));
}
}  // namespace

TEST_CASE("the hot era: a 1 g hole evaporates before the plasma lets its bubble form; a 1e3 g hole does not") {
  // The static bubble's field at the horizon is about 1.5e11 GeV (ember bounce). The plasma's
  // thermal mass, m_T^2 ~ 0.1 T^2, holds that field in the false vacuum while
  // m_T^2 phi^2 / 2 > -V(phi) = |lambda_eff| phi^4 / 4, i.e. until T ~ 0.15 phi ~ 2e10 GeV, which
  // the radiation era reaches at t ~ 0.3 g^(-1/2) M_Pl / T^2 ~ 4e-28 s (derived). A 1 g hole lives
  // about 4e-28 s (407 s x (1e-10)^3, MacGibbon 1991 scaled, from memory), so postponing the hot
  // era's hazard removes nearly all of its decays; a 1e3 g hole lives 1e9 times longer and still
  // decays for certain once the plasma has cooled.
  const pipeline::JobResults light = monochromatic_run("1 g", "hot_era: postpone");
  const population::Counts& c = light.outcomes.at(0).counts;
  CHECK(c.lightcone == c.lightcone_postponed);  // the default treatment is the headline N
  CHECK(c.lightcone_counted > 0);
  CHECK(c.lightcone_postponed < 1e-3 * c.lightcone_counted);
  const pipeline::JobResults counted = monochromatic_run("1 g", "hot_era: count");
  CHECK(counted.outcomes.at(0).counts.lightcone == counted.outcomes.at(0).counts.lightcone_counted);
  CHECK(close(counted.outcomes.at(0).counts.lightcone, c.lightcone_counted, 1e-12));

  const pipeline::JobResults heavy = monochromatic_run("1e3 g", "hot_era: postpone");
  const population::Counts& h = heavy.outcomes.at(0).counts;
  CHECK(h.lightcone_counted > 0);
  CHECK(close(h.lightcone_postponed, h.lightcone_counted, 1e-6));
  // Its decay waits for the cold plasma: the plasma at the decay is colder than the 1 g hole's
  // whole hot era (the field is held until about 2e10 GeV).
  const population::Decay& d = heavy.outcomes.at(0).scan.back().decay;  // the 1e4 g row
  REQUIRE(d.cooled_time);
  CHECK(d.plasma_at_decay < 1e11);
  CHECK(d.plasma_at_decay > 0);
}

TEST_CASE("the share of N resting on B below the minimum action") {
  // A hole of 1e7 M_Pl (218 g) forms with B ~ 244 (ember bounce: B ~ 2.46e-5 M / M_Pl for the
  // Standard Model) and decays once Gamma_D / Gamma_H ~ sqrt(B/2 pi) e^-B (G M Gamma_H)^-1 passes
  // one, near B ~ 34 (derived from the scan's ratio 9.6e3 at B = 24.6). With minimum_action = 1
  // no decay rests on B < 1; with 50 all of it does: the hazard accumulated while B > 50 is
  // about e^-(50 - 34) ~ 1e-7.
  const double mass = 1e7 * u::planck_mass / u::gram;
  const std::string m = fmt::format("{} g", mass);
  for (const auto& [minimum_text, low, high] : {std::tuple{"1", 0.0, 1e-6}, std::tuple{"50", 0.999, 1.0}}) {
    const std::string minimum = minimum_text;  // a plain variable: doctest's CAPTURE takes it by reference
    CAPTURE(minimum);
    const population::Counts c = monochromatic_run(m, std::string("minimum_action: ") + minimum).outcomes.at(0).counts;
    REQUIRE(c.lightcone > 0);
    const double share = 1 - c.lightcone_semiclassical / c.lightcone;
    CHECK(share >= low - 1e-12);
    CHECK(share <= high + 1e-12);
  }
}

TEST_CASE("where the decays come from: an asteroid-mass lognormal is constrained by its evaporated tail") {
  // Holes still alive today never reach the light masses where decay outruns evaporation (the
  // crossover lies near 1e6 M_Pl, ember bounce), so N can only come from holes that have
  // evaporated: formed below the mass whose lifetime is the age of the universe (about 5e14 g,
  // MacGibbon, Carr & Page, PRD 78 (2008) 064043, from memory). For a lognormal peaked at 1e17 g
  // that is the far low tail.
  const auto run = [](const std::string& cut) {
    return pipeline::run_job(no_thresholds(
        scenario::load_scenario_text(
            "population:\n  spectrum: {shape: lognormal, peak_mass: 1e17 g, width: 1}\n  abundance: {measure: f_pbh, "
            "value: 1e-3}\n" +
                cut +
                "tunnelling: {prescriptions: [probe_field]}\nscan: {masses: {from: 1e17 g, to: 1e17 g, points: 1}}\n",
            "tail.yaml", ".")
            .scenario));
  };
  const pipeline::JobResults r = run("");
  const pipeline::PrescriptionOutcome& o = r.outcomes.at(0);
  REQUIRE(o.counts.lightcone > 0);
  REQUIRE(o.range90);
  CHECK(o.range90->high < r.survivors_mass);
  CHECK(o.range90->low < o.range90->median);
  CHECK(o.range90->median < o.range90->high);
  // The contributions integrate to N (trapezoid in ln M on the same grid, derived).
  double total = 0, below = 0;
  const double cut = 1e14 * u::gram;
  for (std::size_t i = 0; i + 1 < o.scan.size(); ++i) {
    const double piece = 0.5 * (o.dn_dlnm[i] + o.dn_dlnm[i + 1]) * std::log(o.scan[i + 1].mass / o.scan[i].mass);
    total += piece;
    if (o.scan[i + 1].mass <= cut) below += piece;
  }
  CHECK(close(total, o.counts.lightcone, 1e-9));
  // Cutting the spectrum below 1e14 g removes those holes' share of N, and no more (to the grid's
  // resolution at the cut).
  const pipeline::JobResults c = run("  cut_below: 1e14 g\n");
  const double kept = c.outcomes.at(0).counts.lightcone / o.counts.lightcone;
  CHECK(kept < 1);
  CHECK(std::abs(kept - (1 - below / total)) < 0.05);
}

TEST_CASE("the scan follows the spectrum by default, and an explicit range that misses it is warned of") {
  const auto run = [](const std::string& masses) {
    return pipeline::run_job(
        no_thresholds(scenario::load_scenario_text(
                          "population:\n  spectrum: {shape: lognormal, peak_mass: 1e16 g, width: 0.5}\n"
                          "  abundance: {measure: f_pbh, value: 1e-3}\ntunnelling: {prescriptions: [probe_field]}\n"
                          "scan: {masses: " +
                              masses + "}\n",
                          "scan.yaml", ".")
                          .scenario));
  };
  // Left out, the range is the spectrum's own: the lognormal's 7.5 widths either side of its peak
  // (population/mass_function.cpp: 1e-13 of its weight outside), and nothing is warned of.
  const pipeline::JobResults own = run("{points: 3}");
  const auto& curve = own.outcomes.at(0).curve;
  REQUIRE(curve.size() == 3);
  CHECK(close(curve.front().mass, 1e16 * u::gram * std::exp(-7.5 * 0.5), 1e-9));
  CHECK(close(curve[1].mass, 1e16 * u::gram, 1e-9));
  CHECK(own.warnings.empty());
  // The old default, 1 g to 1e15 g, misses the peak and almost all of the abundance.
  const pipeline::JobResults cut = run("{from: 1 g, to: 1e15 g, points: 3}");
  REQUIRE(cut.warnings.size() == 2);
  CHECK(cut.warnings[0].find("misses the scenario's own characteristic mass") != std::string::npos);
  CHECK(cut.warnings[1].find("of the spectrum's abundance lies outside") != std::string::npos);
}

namespace {
// A light monochromatic population under probe_field (invented numbers), with a top-mass
// threshold search: `extra` adds keys to its scan section.
scenario::LoadedScenario threshold_scenario(const std::string& extra, double top_mass = 172.57) {
  return scenario::load_scenario_text(
      fmt::format("population:\n  spectrum: {{shape: monochromatic, mass: 1e9 g}}\n"
                  "  abundance: {{measure: beta, value: 1e-22}}\nstandard_model: {{top_mass: {} GeV}}\n"
                  "tunnelling: {{prescriptions: [probe_field]}}\n"
                  "scan:\n  masses: {{from: 1e9 g, to: 1e9 g, points: 1}}\n{}",
                  top_mass, extra),
      "thresholds.yaml", ".");
}

double largest_ratio(const pipeline::PrescriptionOutcome& o) {
  double m = 0;
  for (const double r : o.plot_ratio) m = std::max(m, r);
  return m;
}
}  // namespace

TEST_CASE("top-mass thresholds: the verdict flips where the search says, on either side by the main job") {
  const auto loaded = threshold_scenario("  thresholds: {inputs: [top_mass], points: 7}\n");
  const pipeline::JobResults r = pipeline::run_job(loaded.scenario);
  REQUIRE(r.thresholds.size() == 1);
  const pipeline::InputThresholds& in = r.thresholds[0];
  REQUIRE(in.critical_top_mass);
  // The window reaches one sigma below the critical top mass; the tolerance is 0.02 sigma.
  CHECK(in.from <= *in.critical_top_mass - in.sigma + 1e-12);
  CHECK(close(in.tolerance, 0.02 * 0.29, 1e-12));  // sigma: data/standard_model.yaml (PDG 2024)
  REQUIRE(in.prescriptions.size() == 1);
  const pipeline::Threshold& flip = in.prescriptions[0].exclusion;
  const pipeline::Threshold& outruns = in.prescriptions[0].outruns;
  REQUIRE(flip.value);
  REQUIRE(outruns.value);
  CAPTURE(*flip.value);
  CAPTURE(*outruns.value);
  CHECK(flip.note.find("excluded above") != std::string::npos);
  // Below the critical top mass the potential is stable: no bubble, no decay.
  for (const auto& s : in.samples)
    if (s.value < *in.critical_top_mass && s.lightcone) CHECK(*s.lightcone == 0);
  CHECK(*flip.value > *in.critical_top_mass);
  // The scenario's own value is on the grid: its N is the main job's, exactly (same path).
  bool central_seen = false;
  for (const auto& s : in.samples)
    if (s.grid && std::abs(s.value - in.central) < 1e-9) {
      central_seen = true;
      REQUIRE(s.lightcone);
      CHECK(close(*s.lightcone, r.outcomes.at(0).counts.lightcone, 1e-12));
    }
  CHECK(central_seen);
  // The main job run at the threshold plus and minus two tolerances, with no search: excluded
  // above, allowed below; and Gamma_D outruns Gamma_H somewhere above the outruns threshold only.
  const auto at = [&](double mt) {
    return pipeline::run_job(no_thresholds(threshold_scenario("", mt).scenario)).outcomes.at(0);
  };
  const double step = 2 * in.tolerance;
  CHECK(at(*flip.value + step).excluded);
  CHECK_FALSE(at(*flip.value - step).excluded);
  CHECK(largest_ratio(at(*outruns.value + step)) > 1);
  CHECK(largest_ratio(at(*outruns.value - step)) < 1);
}

TEST_CASE("an alpha_s threshold runs the other way: a larger alpha_s makes the vacuum more stable") {
  // A larger alpha_s lowers the top Yukawa coupling at high scales and lifts lambda (Buttazzo et
  // al., JHEP 12 (2013) 089, eq. 65: the critical top mass rises with alpha_s; from memory).
  const auto loaded = threshold_scenario("  thresholds: {inputs: [alpha_s], points: 7, span: 12}\n");
  const pipeline::JobResults r = pipeline::run_job(loaded.scenario);
  REQUIRE(r.thresholds.size() == 1);
  const pipeline::InputThresholds& in = r.thresholds[0];
  CHECK_FALSE(in.critical_top_mass);
  const pipeline::Threshold& flip = in.prescriptions.at(0).exclusion;
  REQUIRE(flip.value);
  CHECK(flip.note.find("allowed above") != std::string::npos);
  CHECK(*flip.value > in.central);
}
