// The main job, stage by stage in data-flow order: the background (cosmology), the mass-loss
// table (evaporation), then the pipeline's three stages: the plan (scan rows, Higgs points and
// their potentials, work items: plan.hpp), its execution (B(M) tables, then chunks of formation
// masses, on threads or MPI ranks, checkpointed: execute.hpp), and the assembly of the results
// (assemble.hpp); last the unseeded thermal baseline of the hot universe (population).
#include "ember/pipeline/job.hpp"

#include <fmt/format.h>

#include <chrono>

#include "assemble.hpp"
#include "ember/core/embedded.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/input_file.hpp"
#include "ember/core/text.hpp"
#include "ember/evaporation/kerr_mass_loss.hpp"
#include "ember/evaporation/mass_loss_cache.hpp"
#include "ember/evaporation/spinning_clock.hpp"
#include "ember/greybody/kerr_table.hpp"
#include "ember/greybody/table.hpp"
#include "ember/greybody/table_cache.hpp"
#include "ember/population/thermal_baseline.hpp"
#include "ember/version.hpp"
#include "thresholds.hpp"

namespace ember::pipeline {

namespace {

using scenario::EvaporationChoices;
using scenario::Scenario;
using scenario::StandardModelForm;
using tunnelling::Prescription;

bool quiet_here(const JobOptions& o) {
  return o.quiet || (o.executor && !o.executor->assembles());
}

evaporation::MassLossOptions with_progress(evaporation::MassLossOptions m, const JobOptions& o) {
  m.quiet = quiet_here(o);
  return m;
}

// The shipped table, or one this binary computes (and caches) for the scenario.
greybody::Table greybody_table(const EvaporationChoices& e, const JobOptions& o, JobResults& out) {
  if (!e.computed_greybody) {
    greybody::Table t = greybody::load_default_table();
    out.greybody = fmt::format("{} as shipped (stated interpolation error {:.1e})",
                               greybody::default_table_path().filename().string(), t.header().interpolation_error);
    return t;
  }
  greybody::BuildOptions b = *e.computed_greybody;
  b.quiet = quiet_here(o);
  greybody::CachedGreybody c = greybody::cached_table(b, o.cache_directory);
  out.greybody = fmt::format("computed by this binary, {} points per mode (stated interpolation error {:.1e})",
                             b.points_per_mode, c.table.header().interpolation_error);
  out.greybody_from_cache = c.hit;
  if (c.store_failure) out.cache_warning = c.store_failure;
  return std::move(c.table);
}

void check_applicable(const Scenario& s) {
  const bool sm = std::holds_alternative<StandardModelForm>(s.standard_model.potential);
  const bool wall = s.tunnelling.wall_tension && s.tunnelling.energy_gap;
  for (const Prescription p : s.tunnelling.prescriptions) {
    const tunnelling::PrescriptionNeeds n = tunnelling::needs(p);
    if (n.standard_model && !sm)
      throw InputError(
          fmt::format("tunnelling.prescriptions: {0} needs the Standard Model potential (its thermal mass); expected "
                      "standard_model.potential.form: standard_model, or drop {0}",
                      name_of(p)));
    if (n.wall && !wall)
      throw InputError(fmt::format(
          "tunnelling.prescriptions: {} needs tunnelling.thin_wall.tension and energy_gap; expected both", name_of(p)));
  }
}

// The mass-loss table: from the cache, or built over the greybody table the scenario asks for.
evaporation::MassLoss mass_loss_for(const Scenario& s, const JobOptions& o, JobResults& out) {
  evaporation::CachedMassLoss cached =
      evaporation::cached_mass_loss(greybody_table(s.evaporation, o, out), evaporation::load_default_particles(),
                                    with_progress(s.evaporation.mass_loss, o), o.cache_directory);
  if (!out.cache_warning) out.cache_warning = cached.store_failure;
  return std::move(cached.mass_loss);
}

// The spins the holes are born with, as quadrature nodes (population/hole_spin.hpp).
population::SpinDistribution hole_spins_of(const Scenario& s) {
  const double top = greybody::KerrBuildOptions{}.hole_spins.back();
  if (const auto* f = std::get_if<scenario::FixedSpin>(&s.population.hole_spin))
    return population::fixed_spin(f->value);
  if (const auto* u = std::get_if<scenario::UniformSpin>(&s.population.hole_spin))
    return population::uniform_spin(u->low, u->high);
  if (const auto* g = std::get_if<scenario::GaussianSpin>(&s.population.hole_spin))
    return population::gaussian_spin(g->mean, g->width, top);
  const auto& t = std::get<scenario::TabulatedSpin>(s.population.hole_spin);
  // A spin table has tens of rows; this is room for a hundred thousand.
  constexpr std::uintmax_t max_bytes = 4u << 20;
  return population::tabulated_spin(read_input_file(t.file, "a spin table (a*, density)", max_bytes), t.file.string(),
                                    top);
}

// The Kerr rates, for a population with spin; none without.
std::optional<evaporation::KerrMassLoss> kerr_rates_for(const Scenario& s, const population::SpinDistribution& spins,
                                                        JobResults& out) {
  if (!spins.spinning()) return std::nullopt;
  if (s.evaporation.mass_loss.argument == evaporation::GreybodyArgument::momentum)
    throw InputError(
        "evaporation.greybody_argument: momentum is not available for spinning holes (population.hole_spin); "
        "expected energy (the Kerr rates take the greybody factors at the energy)");
  const greybody::KerrTable table = s.evaporation.kerr_table ? greybody::load_kerr_table(*s.evaporation.kerr_table)
                                                             : greybody::load_default_kerr_table();
  evaporation::KerrMassLoss kerr(table, evaporation::load_default_particles(), s.evaporation.mass_loss);
  for (const auto& n : spins.nodes)
    if (n.spin > kerr.max_hole_spin())
      throw InputError(
          fmt::format("population.hole_spin: a* = {} above the Kerr table's top node {}; expected a* <= {}",
                      format_real(n.spin), format_real(kerr.max_hole_spin()), format_real(kerr.max_hole_spin())));
  out.kerr =
      fmt::format("{} (stated greybody interpolation error {:.1e}); Kerr rates within {:.1e} between its spin nodes",
                  s.evaporation.kerr_table ? s.evaporation.kerr_table->string()
                                           : greybody::default_kerr_table_path().filename().string(),
                  table.header().interpolation_error, kerr.relative_error());
  return kerr;
}

// The unseeded thermal baseline at the central Higgs point (Standard Model potentials only),
// from the earliest formation time of any mass the job evaluates.
std::optional<population::ThermalBaseline> thermal_baseline_of(const detail::JobPlan& plan) {
  for (std::size_t i = 0; i < plan.points.size(); ++i) {
    if (!plan.points[i].central || !plan.models[i].sm) continue;
    double lightest = INFINITY;
    for (const auto& row : plan.rows) lightest = std::min(lightest, row.mass);
    for (const double m : plan.grid) lightest = std::min(lightest, m);
    const double earliest =
        population::formation_of(lightest, plan.scenario->population.collapse_fraction, *plan.background).time;
    try {
      return population::thermal_baseline(*plan.models[i].sm, *plan.background, earliest);
    } catch (const NumericalError& e) {
      population::ThermalBaseline failed;
      failed.note = std::string("not computed: ") + e.what();
      return failed;
    }
  }
  return std::nullopt;
}

}  // namespace

JobResults run_job(const Scenario& s, const JobOptions& o) {
  const auto start = std::chrono::steady_clock::now();
  check_applicable(s);
  JobResults out;
  const cosmology::Background background(s.cosmology, s.dof_table ? cosmology::DegreesOfFreedom::load(*s.dof_table)
                                                                  : cosmology::DegreesOfFreedom::load_default());
  const evaporation::MassLoss mass_loss = mass_loss_for(s, o, out);
  for (const Prescription p : s.tunnelling.prescriptions) {
    PrescriptionOutcome outcome;
    outcome.prescription = p;
    out.outcomes.push_back(outcome);
  }

  const population::SpinDistribution spins = hole_spins_of(s);
  const std::optional<evaporation::KerrMassLoss> kerr = kerr_rates_for(s, spins, out);
  if (kerr) {  // heavier holes survive today whatever their spin: the fastest spin sets the mass
    double fastest = 0;
    for (const auto& n : spins.nodes) fastest = std::max(fastest, n.spin);
    out.survivors_mass =
        evaporation::spinning_mass_with_lifetime(*kerr, mass_loss, fastest, background.age(), s.evaporation.trajectory);
  } else {
    out.survivors_mass = evaporation::mass_with_lifetime(mass_loss, background.age(), s.evaporation.trajectory);
  }
  out.hole_spin = spins.description;
  out.spinning = spins.spinning();
  out.spin_limit = s.tunnelling.spin_limit;

  detail::JobPlan plan = detail::make_plan(s, o, background, mass_loss, out.spectrum);
  plan.context.hole_spin = spins;
  plan.context.spinning = {kerr ? &*kerr : nullptr, &mass_loss, s.evaporation.trajectory, s.tunnelling.spin_limit};
  out.plot_masses = plan.plot_masses;
  out.spectrum_mass = plan.base->characteristic_mass();
  out.warnings = plan.warnings;
  const detail::Executed done = detail::execute(plan);
  out.items_resumed = done.resumed;
  out.checkpoint_warning = done.checkpoint_warning;
  out.assembled = done.assembles;
  if (!out.assembled) return out;  // an MPI rank that only computed
  detail::assemble(plan, done, out);
  out.thermal_baseline = thermal_baseline_of(plan);
  out.thresholds = detail::find_thresholds(plan);
  out.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  return out;
}

}  // namespace ember::pipeline

namespace ember::pipeline {

std::string job_identity(const JobOptions& o) {
  return fmt::format(
      "ember {} numerics {} table_points {} table_check_stride {} responses_per_decade {} "
      "decay_grid_points {} plot_points {} rows_per_chunk {} grid_per_chunk {} max_chunks {}",
      version, embedded::numerics_fingerprint(), o.table_points, o.table_check_stride, o.responses_per_decade,
      o.decay_grid_points, o.plot_points, o.rows_per_chunk, o.grid_per_chunk, o.max_chunks);
}

}  // namespace ember::pipeline
