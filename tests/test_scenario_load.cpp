// Loading good scenarios: values land in internal units, defaults are filled in, paths resolve.
#include <doctest/doctest.h>

#include <cmath>
#include <filesystem>

#include "ember/scenario/load.hpp"
#include "ember/units/constants.hpp"
#include "support.hpp"

namespace fs = std::filesystem;
using namespace ember;
using namespace ember::scenario;
using ember::testing::close;
using ember::testing::source_dir;

TEST_CASE("the demo scenario loads, with the defaults filled in") {
  const LoadedScenario loaded = load_scenario_file(source_dir / "configs/demo.yaml");
  const Scenario& s = loaded.scenario;
  REQUIRE(std::holds_alternative<Lognormal>(s.population.spectrum));
  CHECK(close(std::get<Lognormal>(s.population.spectrum).peak_mass, 1e9 * units::gram));
  CHECK(s.population.abundance.measure == AbundanceMeasure::beta);
  // Defaults, with the sources named in src/scenario/scenario_keys.cpp:
  CHECK(s.population.collapse_fraction == 0.2);                              // Carr 1975
  CHECK(close(s.standard_model.inputs.higgs_mass, 125.2));                   // PDG 2024 (data/standard_model.yaml)
  CHECK(close(s.standard_model.inputs.alpha_s, 0.118));                      // PDG 2024 (data/standard_model.yaml)
  CHECK(close(s.cosmology.hubble, 0.6766));                                  // Planck 2018 VI, Table 2
  CHECK(close(s.tunnelling.semiclassical_floor, 1e3 * units::planck_mass));  // common practice
  CHECK(s.tunnelling.prescriptions.size() == 4);
  CHECK(s.scan.masses.points == 31);
  CHECK(loaded.resolved["standard_model"]["potential"]["form"].Scalar() == "standard_model");
}

TEST_CASE("every variant reads into its typed form") {
  SUBCASE("table spectrum: a relative path starts at the scenario's folder") {
    const auto s = load_scenario_file(source_dir / "tests/data/good/every_shape_table.yaml").scenario;
    REQUIRE(std::holds_alternative<TabulatedSpectrum>(s.population.spectrum));
    const auto& t = std::get<TabulatedSpectrum>(s.population.spectrum);
    CHECK(t.file.is_absolute());
    CHECK(fs::equivalent(t.file, source_dir / "tests/data/good/table_spectrum.tsv"));
    CHECK(t.mass_unit == "g");
    CHECK(s.population.abundance.measure == AbundanceMeasure::lightcone_count);
    REQUIRE(s.dof_table);
    CHECK(fs::equivalent(*s.dof_table, source_dir / "data/relativistic_dof.tsv"));
  }
  SUBCASE("polynomial potential, thin wall and scan lists") {
    const auto s = load_scenario_file(source_dir / "tests/data/good/polynomial_potential.yaml").scenario;
    REQUIRE(std::holds_alternative<CriticalCollapse>(s.population.spectrum));
    CHECK(std::get<CriticalCollapse>(s.population.spectrum).exponent == 2.85);
    REQUIRE(std::holds_alternative<PolynomialForm>(s.standard_model.potential));
    const auto& p = std::get<PolynomialForm>(s.standard_model.potential);
    CHECK(p.scale == 1e10);
    CHECK(p.coefficients == std::vector<double>{0, 0, 0.5, 0, -0.01});
    CHECK(s.tunnelling.prescriptions == std::vector{Prescription::thin_wall, Prescription::no_seed});
    CHECK(s.tunnelling.prefactor == Prefactor::light_crossing);
    CHECK(s.tunnelling.wall_tension == 1e30);
    CHECK(s.tunnelling.energy_gap == 2.5e38);
    CHECK(close(s.scan.masses.from.value_or(0), 1e-3 * units::kilogram));
    CHECK(close(s.scan.masses.to.value_or(0), 1e-10 * units::solar_mass));
    CHECK(s.scan.widths == std::vector<double>{0.3, 1});
    CHECK(s.scan.band.top_mass.points == 5);
    CHECK(s.scan.band.top_mass.span == 3);
    CHECK(close(s.scan.band.top_mass.sigma, 0.29));  // PDG 2024 (data/standard_model.yaml) uncertainty, the default
    CHECK(s.scan.band.lambda6 == std::vector<double>{-0.5, 0.5});
    CHECK(s.output.files == std::vector<std::string>{"summary"});
  }
  SUBCASE("power law, temperatures in GeV, momentum greybody argument") {
    const auto s = load_scenario_file(source_dir / "tests/data/good/power_law.yaml").scenario;
    REQUIRE(std::holds_alternative<PowerLaw>(s.population.spectrum));
    const auto& p = std::get<PowerLaw>(s.population.spectrum);
    CHECK(close(p.min_mass, 1e4 * units::planck_mass));
    CHECK(p.exponent == -1.5);
    CHECK(s.population.abundance.value == 0);
    CHECK(close(s.cosmology.cmb_temperature, 2.35e-13));
    CHECK(close(s.evaporation.mass_loss.qcd_scale, 0.25));
    CHECK(close(s.evaporation.mass_loss.qcd_width, 0.3));
    CHECK(s.evaporation.mass_loss.argument == ember::evaporation::GreybodyArgument::momentum);
    CHECK(std::holds_alternative<StandardModelForm>(s.standard_model.potential));
  }
}

TEST_CASE("all errors of a file are reported together, in line order") {
  const std::string text =
      "population:\n"
      "  spectrum: {shape: monochromatic, mass: 1e12 s}\n"
      "  abundance: {measure: beta, value: 7}\n"
      "standard_model:\n"
      "  loops: 0\n";
  try {
    load_scenario_text(text, "inline.yaml", ".");
    FAIL("expected an error");
  } catch (const ScenarioError& e) {
    REQUIRE(e.diagnostics().size() == 3);
    CHECK(e.diagnostics()[0].line == 2);
    CHECK(e.diagnostics()[1].line == 3);
    CHECK(e.diagnostics()[2].line == 5);
    CHECK(std::string(e.what()).find("inline.yaml:5:10: standard_model.loops: 0 is out of range") != std::string::npos);
  }
}

TEST_CASE("files that are not scenario files are input errors") {
  CHECK_THROWS_WITH_AS(load_scenario_file(source_dir / "no-such.yaml"), doctest::Contains("no such file"), InputError);
  CHECK_THROWS_WITH_AS(load_scenario_file(source_dir / "configs"), doctest::Contains("is a directory"), InputError);
}

TEST_CASE("a confidence level is the exclusion rule at max_decays = -ln(1 - CL)") {
  // Excluded when the survival probability e^-N is below 1 - CL, i.e. N > -ln(1 - CL) (derived);
  // at 95% that is N > 3.00 (ln 20 = 2.9957).
  const auto with_cl = ember::scenario::load_scenario_text(
      "population:\n  spectrum: {shape: monochromatic, mass: 1e9 g}\n  abundance: {measure: beta, value: 1e-20}\n"
      "exclusion: {confidence_level: 0.95}\n",
      "cl.yaml", ".");
  CHECK(with_cl.scenario.exclusion.max_decays == doctest::Approx(std::log(20.0)).epsilon(1e-12));
  const auto plain = ember::scenario::load_scenario_text(
      "population:\n  spectrum: {shape: monochromatic, mass: 1e9 g}\n  abundance: {measure: beta, value: 1e-20}\n",
      "plain.yaml", ".");
  CHECK(plain.scenario.exclusion.max_decays == 1);
}
