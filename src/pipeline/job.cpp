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
#include "ember/evaporation/mass_loss_cache.hpp"
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
  out.survivors_mass = evaporation::mass_with_lifetime(mass_loss, background.age(), s.evaporation.trajectory);
  for (const Prescription p : s.tunnelling.prescriptions) {
    PrescriptionOutcome outcome;
    outcome.prescription = p;
    out.outcomes.push_back(outcome);
  }

  detail::JobPlan plan = detail::make_plan(s, o, background, mass_loss, out.spectrum);
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
