// Benchmarks of in-process workloads, run by scripts/bench. Prints one tab-separated line per
// workload: name, wall seconds per run, runs, and a throughput note. Targets live in
// scripts/bench, never in tests.
#include <fmt/format.h>

#include <chrono>
#include <cmath>
#include <functional>

#include "ember/evaporation/trajectory.hpp"
#include "ember/greybody/emission.hpp"
#include "ember/greybody/solver.hpp"
#include "ember/greybody/table.hpp"
#include "ember/higgs/stability.hpp"
#include "ember/scenario/job.hpp"
#include "ember/scenario/load.hpp"
#include "ember/tunnelling/action_table.hpp"
#include "ember/units/constants.hpp"

namespace {

using clock_type = std::chrono::steady_clock;

void report(const std::string& name, int runs, const std::function<void()>& work, const std::string& unit = "") {
  work();  // warm up (caches, lazy loads)
  const auto start = clock_type::now();
  for (int i = 0; i < runs; ++i) work();
  const double per_run = std::chrono::duration<double>(clock_type::now() - start).count() / runs;
  fmt::print("{}\t{:.6e}\t{}\t{}\n", name, per_run, runs,
             unit.empty() ? "" : fmt::format("{:.3g} {}", 1.0 / per_run, unit));
}

}  // namespace

int main() {
  using namespace ember::greybody;
  volatile double sink = 0;
  for (const double x : {0.001, 0.1, 1.0, 5.0})
    report(
        fmt::format("greybody: one direct solve, spin 1, l = 1, x = {}", x), 50,
        [&] { sink = sink + solve_transmission(make_mode(1, 1), x).value; }, "solves/s");
  BuildOptions quiet;
  quiet.quiet = true;
  report("greybody: full table rebuild (in process, one core)", 3,
         [&] { sink = sink + build_table(quiet).rows().size(); });
  const Table table = load_default_table();
  report("greybody: load data/greybody.tsv", 20, [&] { sink = sink + load_default_table().rows().size(); });
  double x = 1e-3;
  report(
      "greybody: one interpolated lookup", 1000000,
      [&] {
        x = x * 1.0001 > 5 ? 1e-3 : x * 1.0001;
        sink = sink + table.transmission(2, 2, x).value;
      },
      "lookups/s");
  report(
      "greybody: sum over l at one x (spin 1/2)", 200000,
      [&] {
        x = x * 1.0001 > 5 ? 1e-3 : x * 1.0001;
        sink = sink + table.weighted_sum(1, x).value;
      },
      "sums/s");
  report("greybody: power and number coefficients, all spins", 20, [&] {
    for (int ts : {0, 1, 2, 4}) sink = sink + emission_per_dof(table, ts).power.value;
  });
  using namespace ember::evaporation;
  const ParticleSet particles = load_default_particles();
  report("evaporation: build the f(M) table (energy option)", 10,
         [&] { sink = sink + MassLoss(table, particles).alpha(1e30); });
  MassLossOptions momentum;
  momentum.argument = GreybodyArgument::momentum;
  report("evaporation: build the f(M) table (momentum option)", 1,
         [&] { sink = sink + MassLoss(table, particles, momentum).alpha(1e30); });
  const MassLoss ml(table, particles);
  const double gram = ember::units::gram;
  report(
      "evaporation: one trajectory, 1e15 g to the cutoff", 1000,
      [&] { sink = sink + Trajectory(ml, 1e15 * gram).lifetime(); }, "trajectories/s");
  report("evaporation: 1e4 trajectories, 1e5 g to 1e15 g", 1, [&] {
    for (int i = 0; i < 10000; ++i) sink = sink + Trajectory(ml, std::pow(10.0, 5 + 10.0 * i / 9999) * gram).lifetime();
  });
  using namespace ember::higgs;
  const Inputs sm = default_inputs();
  report(
      "higgs: one 3-loop run from M_t to 1e21 GeV (splines included)", 200,
      [&] { sink = sink + Running(sm).lambda(1.22e19); }, "runs/s");
  const auto running = std::make_shared<const Running>(sm);
  const StandardModelPotential potential(running);
  double h = 1e9;
  report(
      "higgs: one lambda_eff evaluation after tabulation", 1000000,
      [&] {
        h = h * 1.0001 > 1e20 ? 1e9 : h * 1.0001;
        sink = sink + potential.lambda_eff(h);
      },
      "evaluations/s");
  report("higgs: stability verdict and unseeded decay", 50,
         [&] { sink = sink + analyse_stability(potential).lambda_min; });
  report("higgs: critical top mass (root find over runs)", 5, [&] { sink = sink + critical_top_mass(sm); });
  using namespace ember::tunnelling;
  TunnellingSetup setup;
  setup.potential = &potential;
  setup.standard_model = &potential;
  report("tunnelling: one static solve (back-reacted, 1e5 M_Pl)", 20,
         [&] { sink = sink + solve_static(potential, 1e5 * ember::units::planck_mass).action.value; });
  report("tunnelling: one static solve (probe, 1e5 M_Pl)", 20, [&] {
    StaticOptions probe;
    probe.back_reaction = false;
    sink = sink + solve_static(potential, 1e5 * ember::units::planck_mass, probe).action.value;
  });
  for (const auto p :
       {Prescription::entropy_drop, Prescription::probe_field, Prescription::hot_bubble, Prescription::no_seed})
    report("tunnelling: 60-point B(M) table, " + name_of(p), 1,
           [&] { sink = sink + ActionTable(p, setup).nodes().size(); });
  const ActionTable table_probe(Prescription::probe_field, setup);
  double seed = 1e3 * ember::units::planck_mass;
  report(
      "tunnelling: one interpolated B(M) lookup", 1000000,
      [&] {
        seed = seed * 1.00001 > 1e9 * ember::units::planck_mass ? 1e3 * ember::units::planck_mass : seed * 1.00001;
        sink = sink + table_probe.at(seed).action.value;
      },
      "lookups/s");
  // The main job: a 100-mass x 3-prescription constraint curve and a 5 x 5 x 3 Higgs-input band.
  const std::string curve =
      "population:\n  spectrum: {shape: monochromatic, mass: 1e9 g}\n  abundance: {measure: beta, value: 1e-70}\n"
      "tunnelling: {prescriptions: [entropy_drop, probe_field, hot_bubble]}\n"
      "scan: {masses: {from: 1 g, to: 1e15 g, points: 100}}\n";
  const auto curve_scenario = ember::scenario::load_scenario_text(curve, "bench-curve.yaml", ".");
  report("run: 100-mass x 3-prescription constraint curve", 1,
         [&] { sink = sink + ember::scenario::run_job(curve_scenario.scenario).seconds; });
  const std::string band =
      "population:\n  spectrum: {shape: monochromatic, mass: 1e9 g}\n  abundance: {measure: beta, value: 1e-70}\n"
      "tunnelling: {prescriptions: [probe_field]}\n"
      "scan:\n  masses: {from: 1 g, to: 1e15 g, points: 20}\n"
      "  band: {top_mass: {points: 5}, higgs_mass: {points: 5}, alpha_s: {points: 3}}\n";
  const auto band_scenario = ember::scenario::load_scenario_text(band, "bench-band.yaml", ".");
  report("run: 5 x 5 x 3 Higgs-input band (probe_field, 20 masses)", 1,
         [&] { sink = sink + ember::scenario::run_job(band_scenario.scenario).seconds; });
  return sink == 12345.0;  // keeps the work from being optimised away
}
