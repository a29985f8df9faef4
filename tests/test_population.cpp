// Cosmology, formation, decay along trajectories, counts and constraint curves.
#include <doctest/doctest.h>
#include <unistd.h>

#include <cmath>
#include <filesystem>
#include <iterator>

#include "ember/core/errors.hpp"
#include "ember/pipeline/job.hpp"
#include "ember/population/counts.hpp"
#include "ember/scenario/load.hpp"
#include "ember/units/constants.hpp"
#include "support.hpp"

using namespace ember;
namespace u = ember::units;
using ember::testing::close;
using ember::testing::source_dir;

namespace {
const cosmology::Background& background() {
  static const cosmology::Background b(cosmology::planck2018(),
                                       cosmology::DegreesOfFreedom::load(source_dir / "data/relativistic_dof.tsv"));
  return b;
}
const evaporation::MassLoss& mass_loss() {
  static const evaporation::MassLoss ml(greybody::load_table(source_dir / "data/greybody.tsv"),
                                        evaporation::load_particles(source_dir / "data/particles.yaml"));
  return ml;
}
const higgs::StandardModelPotential& standard_model() {
  static const higgs::StandardModelPotential sm(std::make_shared<const higgs::Running>(higgs::default_inputs()));
  return sm;
}
const tunnelling::ActionTable& probe_table() {
  static const tunnelling::ActionTable t = [] {
    tunnelling::TunnellingSetup s;
    s.potential = &standard_model();
    s.standard_model = &standard_model();
    tunnelling::ActionTableOptions o;
    o.points = 30;
    o.midpoint_stride = 6;
    return tunnelling::ActionTable(tunnelling::Prescription::probe_field, s, o);
  }();
  return t;
}
population::ResponseContext context() {
  population::ResponseContext c;
  c.background = &background();
  c.mass_loss = &mass_loss();
  c.decay.grid_points = 500;
  return c;
}
double gram(double g) {
  return g * u::gram;
}
}  // namespace

TEST_CASE("the Planck 2018 background") {
  const auto& b = background();
  // Age 13.79 Gyr (Planck 2018 VI, A&A 641 (2020) A6, Table 2: 13.787 +- 0.020 Gyr); we leave out
  // the neutrino masses Planck include, so 0.03 Gyr.
  CHECK(std::abs(b.age() / (1e9 * u::year) - 13.79) < 0.03);
  // Comoving particle horizon today about 14.2 Gpc, 46 billion light years (common practice).
  CHECK(std::abs(b.particle_horizon() / (1e9 * u::parsec) - 14.2) < 0.1);
  CHECK(std::abs(b.particle_horizon() / (1e9 * u::year) - 46.0) < 0.5);
  // Radiation era: M_H = c^3 t / G (derived from H = 1/(2t)) and M = gamma M_H ~ 1e15 g (t / 1e-23 s)
  // (Carr 1975; Green, arXiv:1403.1198, eq. 1; a one-figure estimate, so 25%).
  const double t = 1e-23 * u::second;
  CHECK(close(b.horizon_mass(t), t / u::newton_G, 1e-3));
  CHECK(close(0.2 * b.horizon_mass(t), gram(1e15), 0.25));
}

TEST_CASE("formation and abundance conversions") {
  const auto& b = background();
  for (double m : {1e5, 1e10, 1e15}) {
    const population::Formation f = population::formation_of(gram(m), 0.2, b);
    CAPTURE(m);
    // The number of holes per horizon volume at formation is beta/gamma (derived).
    CHECK(close(population::per_horizon_per_beta(f, b), 1 / 0.2, 1e-6));
    // Carr, Kohri, Sendouda & Yokoyama, Rep. Prog. Phys. 84 (2021) 116902, eq. 6 (as quoted in a
    // secondary copy of the paper; not checked against the journal text):
    //   beta = 7.06e-18 gamma^-1/2 (h/0.67)^2 (g*/106.75)^1/4 Omega_PBH (M/1e15 g)^1/2.
    // Differences: their g* and cosmology against ours (Saikawa-Shirai g*, Planck 2018): 2%.
    const double g = b.dof().g_rho(f.temperature);
    const double omega_per_beta = population::f_pbh_per_beta(f, b) * b.omega_cdm();
    const double carr =
        1 / (7.06e-18 / std::sqrt(0.2) * std::pow(0.6766 / 0.67, 2) * std::pow(g / 106.75, 0.25) * std::sqrt(m / 1e15));
    CHECK(close(omega_per_beta, carr, 0.02));
    // Carr, Kohri, Sendouda & Yokoyama, PRD 81 (2010) 104019 (from memory; the paper's text was
    // not available to check), in their earlier normalisation to h = 0.72 and the solar mass:
    //   Omega_PBH = beta' (M/Msun)^-1/2 (h/0.72)^-2 / 1.15e-8,  beta' = gamma^1/2 (g*/106.75)^-1/4 beta.
    // The same differences as above: 2%.
    const double carr2010 = std::pow(0.6766 / 0.72, -2) * std::sqrt(0.2) * std::pow(g / 106.75, -0.25) /
                            (1.15e-8 * std::sqrt(gram(m) / u::solar_mass));
    CHECK(close(omega_per_beta, carr2010, 0.02));
    // Their eq. 5: beta = 7.99e-29 gamma^-1/2 (g*/106.75)^1/4 (M/Msun)^3/2 (n_PBH(t0) / Gpc^-3).
    const double n = population::comoving_number_per_beta(f) * std::pow(1e9 * u::parsec, 3);
    const double carr5 =
        1 / (7.99e-29 / std::sqrt(0.2) * std::pow(g / 106.75, 0.25) * std::pow(gram(m) / u::solar_mass, 1.5));
    CHECK(close(n, carr5, 0.02));
  }
}

TEST_CASE("mass functions integrate to one") {
  const auto integral = [](const population::MassFunction& s) {
    const int n = 20000;
    const double lo = std::log(s.low()), hi = std::log(s.high());
    double total = 0;
    for (int i = 0; i <= n; ++i) {
      const double m = std::exp(lo + (hi - lo) * i / n);
      total += (i == 0 || i == n ? 0.5 : 1.0) * m * s.psi(m) * (hi - lo) / n;
    }
    return total;
  };
  CHECK(close(integral(*population::lognormal(gram(1e12), 0.8)), 1.0, 1e-6));
  CHECK(close(integral(*population::power_law(gram(1e9), gram(1e15), -1.5)), 1.0, 1e-6));
  CHECK(close(integral(*population::critical_collapse(gram(1e12), 2.85)), 1.0, 1e-5));
  CHECK(close(integral(*population::tabulated((source_dir / "tests/data/good/table_spectrum.tsv").string(), "g")), 1.0,
              1e-3));
}

TEST_CASE("decay along trajectories: the two hazard integrals agree, and P ~ 1 gives beta_max ~ M^(3/2)") {
  const auto c = context();
  std::vector<double> masses{1.0, 1e3, 1e6, 1e9}, beta_max;
  for (double m : masses) {
    const population::Response r = population::response_at(gram(m), probe_table(), c);
    CAPTURE(m);
    REQUIRE(r.decay.evaporated);
    CHECK(r.decay.probability == doctest::Approx(1.0));
    // int Gamma_D dt against int (Gamma_D/Gamma_H) d ln M (a cross-check of the two integration variables).
    CHECK(close(r.decay.hazard_in_time, r.decay.hazard, 1e-5));
    // A hole that surely decays does so once decay outruns evaporation: after the crossover, before
    // the end (derived). Far above the crossover mass that is the end of its life.
    REQUIRE(r.decay.crossover_mass);
    const evaporation::Trajectory tr(mass_loss(), gram(m));
    CHECK(r.decay.decay_time >= r.formation.time + tr.age_at(*r.decay.crossover_mass) * (1 - 1e-9));
    CHECK(r.decay.decay_time <= (r.formation.time + r.decay.lifetime) * (1 + 1e-9));
    if (m >= 1e6) CHECK(close(r.decay.decay_time, r.formation.time + r.decay.lifetime, 1e-6));
    beta_max.push_back(1 / r.lightcone_per_beta);
  }
  // "Not a single evaporated PBH in our past light cone": beta_max ~ M^(3/2) (derived: n a^3/beta ~
  // T_f / M ~ M^(-3/2), with chi(t_decay) the particle horizon).
  const double slope = std::log(beta_max.back() / beta_max.front()) / std::log(masses.back() / masses.front());
  CHECK(slope == doctest::Approx(1.5).epsilon(0.01));
  // A hole that survives today has not decayed.
  const population::Response heavy = population::response_at(gram(1e17), probe_table(), c);
  CHECK_FALSE(heavy.decay.evaporated);
  CHECK(heavy.decay.probability == 0.0);
}

TEST_CASE("counts are linear in the abundance and converge as the mass grid is refined") {
  const auto c = context();
  const auto spectrum = population::lognormal(gram(1e9), 0.7);
  const auto coarse = population::response_grid(spectrum->low(), spectrum->high(), 10, probe_table(), c);
  const auto fine = population::response_grid(spectrum->low(), spectrum->high(), 20, probe_table(), c);
  const auto a = population::counts_for(*spectrum, population::AbundanceMeasure::f_pbh, 1e-60, coarse);
  const auto b = population::counts_for(*spectrum, population::AbundanceMeasure::f_pbh, 1e-59, coarse);
  CHECK(close(b.lightcone, 10 * a.lightcone, 1e-12));
  const auto f = population::counts_for(*spectrum, population::AbundanceMeasure::f_pbh, 1e-60, fine);
  CHECK(close(f.lightcone, a.lightcone, 2e-3));
  // Monochromatic: beta, f_PBH and the light-cone count are one abundance three ways.
  const auto mono = population::monochromatic(gram(1e10));
  const std::vector<population::Response> one{population::response_at(gram(1e10), probe_table(), c)};
  const auto by_beta = population::counts_for(*mono, population::AbundanceMeasure::beta, 1e-70, one);
  const auto by_f = population::counts_for(*mono, population::AbundanceMeasure::f_pbh, by_beta.f_pbh, one);
  CHECK(close(by_f.lightcone, by_beta.lightcone, 1e-12));
  CHECK(close(population::counts_for(*mono, population::AbundanceMeasure::beta, 2e-70, one).lightcone,
              2 * by_beta.lightcone, 1e-12));
}

TEST_CASE("a stable potential gives no constraint, and says so") {
  // M_t = 168 GeV is below the critical top mass (test_higgs.cpp): the vacuum is stable.
  const auto loaded = scenario::load_scenario_text(
      "population:\n  spectrum: {shape: monochromatic, mass: 1e9 g}\n  abundance: {measure: beta, value: 1e-20}\n"
      "standard_model: {top_mass: 168 GeV}\ntunnelling: {prescriptions: [probe_field, hot_bubble]}\n"
      "scan: {masses: {from: 1 g, to: 1e12 g, points: 4}}\n",
      "stable.yaml", ".");
  const pipeline::JobResults r = pipeline::run_job(loaded.scenario);
  CHECK(r.no_constraint);
  CHECK(r.no_constraint_reason.find("stable") != std::string::npos);
  for (const auto& o : r.outcomes) {
    CHECK(o.counts.lightcone == 0.0);
    CHECK_FALSE(o.excluded);
    for (const auto& row : o.curve) CHECK_FALSE(row.beta_max);
  }
}

TEST_CASE("results do not depend on the thread count") {
  auto loaded = scenario::load_scenario_file(source_dir / "configs/higgs_sensitivity.yaml");
  loaded.scenario.scan.masses.points = 3;
  loaded.scenario.scan.band.top_mass.points = 2;
  loaded.scenario.scan.band.higgs_mass.points = 1;
  loaded.scenario.scan.band.alpha_s.points = 1;
  loaded.scenario.scan.band.lambda6.clear();
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
  const pipeline::JobResults a = pipeline::run_job(loaded.scenario, one);
  for (const auto* options : {&two, &fine, &bounded}) {
    const pipeline::JobResults b = pipeline::run_job(loaded.scenario, *options);
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
  const pipeline::JobResults first = pipeline::run_job(loaded.scenario, o);
  const auto files = static_cast<int>(std::distance(std::filesystem::directory_iterator(dir), {}));
  CHECK(files == 1 + 1 + o.max_chunks);
  const pipeline::JobResults again = pipeline::run_job(loaded.scenario, o);
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
  const pipeline::JobResults r = pipeline::run_job(loaded.scenario);
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
  auto loaded = scenario::load_scenario_file(source_dir / "configs/higgs_sensitivity.yaml");
  loaded.scenario.scan.masses.points = 3;
  loaded.scenario.scan.band.top_mass.points = 2;
  loaded.scenario.scan.band.higgs_mass.points = 1;
  loaded.scenario.scan.band.alpha_s.points = 1;
  loaded.scenario.scan.band.lambda6.clear();
  loaded.scenario.tunnelling.prescriptions = {tunnelling::Prescription::probe_field};
  pipeline::JobOptions plain, failing;
  failing.before_row = [](std::size_t point, std::size_t, std::size_t row) {
    if (point == 1 && row == 1) throw ember::NumericalError("test solver", "injected at row 1 of point 1");
    if (point == 0 && row == 3) throw ember::NumericalError("test solver", "injected in the central counts");
  };
  const pipeline::JobResults a = pipeline::run_job(loaded.scenario, plain);
  const pipeline::JobResults b = pipeline::run_job(loaded.scenario, failing);
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

TEST_CASE("the job runs end to end on the demo with a reduced grid") {
  auto loaded = scenario::load_scenario_file(source_dir / "configs/demo.yaml");
  loaded.scenario.scan.masses.points = 4;
  const pipeline::JobResults r = pipeline::run_job(loaded.scenario);
  REQUIRE(r.outcomes.size() == 4);
  for (const auto& o : r.outcomes) {
    CAPTURE(tunnelling::name_of(o.prescription));
    CHECK(std::isfinite(o.counts.lightcone));
    CHECK(o.curve.size() == 4);
    CHECK(o.survival >= 0);
    CHECK(o.survival <= 1);
  }
  CHECK(r.stability);
  CHECK(r.stability->verdict == higgs::Verdict::metastable);
}

TEST_CASE("the trajectory cutoff never moves the end of the hazard integral") {
  // cutoff_mass only sets where the numerical trajectory hands over to the analytic tail; the
  // hazard runs to the semiclassical floor either way (derived: Gamma_D / Gamma_H per ln M does
  // not depend on the trajectory). A cutoff above the formation mass once gave zero.
  population::ResponseContext c = context();
  const population::Response plain = population::response_at(gram(1e10), probe_table(), c);
  c.trajectory.cutoff_mass = gram(1e12);
  const population::Response cut = population::response_at(gram(1e10), probe_table(), c);
  CHECK_FALSE(cut.decay.formed_below_floor);
  CHECK(close(cut.decay.hazard, plain.decay.hazard, 1e-6));
  CHECK(cut.lightcone_per_beta > 0);
}

TEST_CASE("formable masses: after T = 1e19 GeV and before today") {
  const population::MassRange r = population::formable_masses(0.2, background());
  // The schema's formation-mass range [1e-6 g, 1e50 g] lies inside it for gamma <= 1 (ours).
  const population::MassRange widest = population::formable_masses(1.0, background());
  CHECK(widest.low < gram(1e-6));
  CHECK(r.high > gram(1e50));
  CHECK_NOTHROW(population::formation_of(r.low, 0.2, background()));
  CHECK_NOTHROW(population::formation_of(r.high, 0.2, background()));
  CHECK_THROWS_AS(population::formation_of(0.99 * r.low, 0.2, background()), InputError);
}
