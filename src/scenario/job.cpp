#include "ember/scenario/job.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <chrono>
#include <cmath>

#include "ember/core/embedded.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/parallel.hpp"
#include "ember/core/progress.hpp"
#include "ember/evaporation/mass_loss_cache.hpp"
#include "ember/greybody/table.hpp"
#include "ember/greybody/table_cache.hpp"
#include "ember/scenario/checkpoint.hpp"
#include "ember/scenario/executor.hpp"
#include "ember/scenario/unit_result.hpp"
#include "ember/tunnelling/action_cache.hpp"
#include "ember/tunnelling/landscape.hpp"
#include "ember/version.hpp"
#include "job_units.hpp"

namespace ember::scenario {

namespace {

using population::MassFunction;
using tunnelling::Prescription;

// The spectrum, optionally moved to another characteristic mass and width (for the scans).
std::unique_ptr<MassFunction> spectrum_at(const Spectrum& s, std::optional<double> mass, std::optional<double> width) {
  if (const auto* m = std::get_if<Monochromatic>(&s)) return population::monochromatic(mass.value_or(m->mass));
  if (const auto* l = std::get_if<Lognormal>(&s))
    return population::lognormal(mass.value_or(l->peak_mass), width.value_or(l->width));
  if (const auto* p = std::get_if<PowerLaw>(&s)) {
    const double top = mass.value_or(p->max_mass);
    return population::power_law(p->min_mass * top / p->max_mass, top, p->exponent);
  }
  if (const auto* c = std::get_if<CriticalCollapse>(&s))
    return population::critical_collapse(mass.value_or(c->cutoff_mass), c->exponent);
  const auto& t = std::get<TabulatedSpectrum>(s);
  return population::tabulated(t.file.string(), t.mass_unit);
}

std::vector<HiggsPoint> higgs_points(const StandardModelInputs& sm, const ScanChoices& scan) {
  const auto* form = std::get_if<StandardModelForm>(&sm.potential);
  HiggsPoint central{sm.inputs, form ? form->options.lambda6 : 0.0, form ? form->options.lambda8 : 0.0, true,
                     "central"};
  std::vector<HiggsPoint> out{central};
  if (!form) return out;
  const auto axis = [](const BandAxis& a, double centre) {
    std::vector<double> v;
    for (int i = 0; i < a.points; ++i)
      v.push_back(a.points == 1 ? centre : centre + a.sigma * a.span * (2.0 * i / (a.points - 1) - 1));
    return v;
  };
  std::vector<double> l6{central.lambda6}, l8{central.lambda8};
  l6.insert(l6.end(), scan.band.lambda6.begin(), scan.band.lambda6.end());
  l8.insert(l8.end(), scan.band.lambda8.begin(), scan.band.lambda8.end());
  for (const double mt : axis(scan.band.top_mass, sm.inputs.top_mass))
    for (const double mh : axis(scan.band.higgs_mass, sm.inputs.higgs_mass))
      for (const double as : axis(scan.band.alpha_s, sm.inputs.alpha_s))
        for (const double a6 : l6)
          for (const double a8 : l8) {
            HiggsPoint p{sm.inputs, a6, a8, false, ""};
            p.inputs.top_mass = mt;
            p.inputs.higgs_mass = mh;
            p.inputs.alpha_s = as;
            if (mt == central.inputs.top_mass && mh == central.inputs.higgs_mass && as == central.inputs.alpha_s &&
                a6 == central.lambda6 && a8 == central.lambda8)
              continue;
            p.label = fmt::format("M_t {} M_h {} alpha_s {} lambda6 {} lambda8 {}", mt, mh, as, a6, a8);
            out.push_back(p);
          }
  return out;
}

detail::PointModel model_for(const HiggsPoint& hp, const StandardModelInputs& sm) {
  detail::PointModel m;
  if (const auto* form = std::get_if<StandardModelForm>(&sm.potential)) {
    m.running = std::make_shared<const higgs::Running>(hp.inputs);
    auto pot = std::make_unique<higgs::StandardModelPotential>(
        m.running, higgs::StandardModelOptions{form->options.coleman_weinberg, hp.lambda6, hp.lambda8});
    m.sm = pot.get();
    m.stability = higgs::analyse_stability(*pot);
    if (m.stability->verdict == higgs::Verdict::stable)
      m.no_decay = "the Higgs potential is stable for these inputs (lambda_eff stays positive up to the Planck scale)";
    m.potential = std::move(pot);
    return m;
  }
  if (const auto* poly = std::get_if<PolynomialPotential>(&sm.potential))
    m.potential = std::make_unique<higgs::PolynomialPotential>(poly->scale, poly->coefficients);
  else
    m.potential = std::make_unique<higgs::TabulatedPotential>(std::get<TabulatedPotential>(sm.potential).file);
  try {
    tunnelling::analyse_landscape(*m.potential, m.potential->field_max() * 1e-40);
  } catch (const InputError&) {
    m.no_decay = "the potential has no barrier into a lower region: no constraint";
  }
  return m;
}

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
  for (const Prescription p : s.tunnelling.prescriptions) {
    if (p == Prescription::hot_bubble && !sm)
      throw InputError(
          "tunnelling.prescriptions: hot_bubble needs the Standard Model potential (its thermal mass); expected "
          "standard_model.potential.form: standard_model, or drop hot_bubble");
    if (p == Prescription::thin_wall && !(s.tunnelling.wall_tension && s.tunnelling.energy_gap))
      throw InputError(
          "tunnelling.prescriptions: thin_wall needs tunnelling.thin_wall.tension and energy_gap; expected both");
  }
}

}  // namespace

JobResults run_job(const Scenario& s, const JobOptions& o) {
  const auto start = std::chrono::steady_clock::now();
  check_applicable(s);
  JobResults out;
  const cosmology::Background background(s.cosmology, s.dof_table ? cosmology::DegreesOfFreedom::load(*s.dof_table)
                                                                  : cosmology::DegreesOfFreedom::load_default());
  evaporation::CachedMassLoss cached_loss =
      evaporation::cached_mass_loss(greybody_table(s.evaporation, o, out), evaporation::load_default_particles(),
                                    with_progress(s.evaporation.mass_loss, o), o.cache_directory);
  if (!out.cache_warning) out.cache_warning = cached_loss.store_failure;
  const evaporation::MassLoss mass_loss = std::move(cached_loss.mass_loss);
  out.survivors_mass = evaporation::mass_with_lifetime(mass_loss, background.age(), s.evaporation.trajectory);
  detail::JobPlan plan;
  plan.scenario = &s;
  plan.options = &o;
  plan.background = &background;
  plan.mass_loss = &mass_loss;
  plan.base = spectrum_at(s.population.spectrum, std::nullopt, std::nullopt);
  const MassFunction* base = plan.base.get();
  out.spectrum = base->description();

  // The scan: formation or characteristic masses, and widths for a lognormal spectrum.
  std::vector<std::pair<double, std::optional<double>>>& rows = plan.rows;
  const bool table_spectrum = std::holds_alternative<TabulatedSpectrum>(s.population.spectrum);
  const std::vector<double> widths =
      std::holds_alternative<Lognormal>(s.population.spectrum) ? s.scan.widths : std::vector<double>{};
  for (int i = 0; i < (table_spectrum ? 1 : s.scan.masses.points); ++i) {
    const double m = table_spectrum ? base->characteristic_mass()
                     : s.scan.masses.points == 1
                         ? s.scan.masses.from
                         : s.scan.masses.from * std::pow(s.scan.masses.to / s.scan.masses.from,
                                                         static_cast<double>(i) / (s.scan.masses.points - 1));
    if (widths.empty()) rows.emplace_back(m, std::nullopt);
    for (const double w : widths) rows.emplace_back(m, w);
  }
  // Formation masses the extended spectra need, across every row.
  double lo = base->low(), hi = base->high();
  std::vector<std::unique_ptr<MassFunction>>& row_spectra = plan.row_spectra;
  for (const auto& [m, w] : rows) {
    row_spectra.push_back(table_spectrum ? spectrum_at(s.population.spectrum, std::nullopt, std::nullopt)
                                         : spectrum_at(s.population.spectrum, m, w));
    lo = std::min(lo, row_spectra.back()->low());
    hi = std::max(hi, row_spectra.back()->high());
  }
  // A wide spectrum's tails can reach masses that cannot form (before T = 1e19 GeV or after
  // today): no holes form there, so the integrals stop at the formable range.
  const population::MassRange formable = population::formable_masses(s.population.collapse_fraction, background);
  if (lo < formable.low || hi > formable.high) {
    out.spectrum += fmt::format(" (integrated over the formable masses {:.3g} g to {:.3g} g only)",
                                std::max(lo, formable.low) / units::gram, std::min(hi, formable.high) / units::gram);
    lo = std::max(lo, formable.low);
    hi = std::min(hi, formable.high);
  }

  plan.context.background = &background;
  plan.context.mass_loss = &mass_loss;
  plan.context.trajectory = s.evaporation.trajectory;
  plan.context.decay.prefactor = s.tunnelling.prefactor;
  plan.context.decay.grid_points = o.decay_grid_points;
  plan.context.collapse_fraction = s.population.collapse_fraction;
  plan.table_options.points = o.table_points;
  plan.table_options.midpoint_stride = o.table_check_stride;
  if (!plan.monochromatic()) plan.grid = population::response_masses(lo, hi, o.responses_per_decade);

  plan.points = higgs_points(s.standard_model, s.scan);
  const std::vector<HiggsPoint>& points = plan.points;
  const std::size_t n_presc = s.tunnelling.prescriptions.size();
  for (const Prescription p : s.tunnelling.prescriptions)
    out.outcomes.push_back({p, {}, 1.0, false, {}, {}, "", {}, {}, ""});
  for (int i = 0; i < o.plot_points; ++i)
    plan.plot_masses.push_back(s.tunnelling.semiclassical_floor *
                               std::pow(1e10, static_cast<double>(i) / (o.plot_points - 1)));
  out.plot_masses = plan.plot_masses;

  // Every Higgs point's potential and verdict, then the work items: independent, each writing
  // only its own slot, so the results do not depend on the thread count.
  plan.models.resize(points.size());
  parallel_for(points.size(), o.threads, [&](std::size_t i) {
    try {
      plan.models[i] = model_for(points[i], s.standard_model);
    } catch (const NumericalError& e) {
      // The central point's failure ends the run (nothing can be reported without it); a band
      // point's is recorded and the others go on (issue 9).
      if (points[i].central) throw;
      plan.models[i] = detail::PointModel{};
      plan.models[i].failure = detail::one_line(e.what());
    }
  });
  const std::vector<detail::PointModel>& models = plan.models;

  // Items 0..T-1 are the B(M) tables, T.. the chunks of formation masses (job_units.hpp). Items
  // finished by an earlier run of this job come from its checkpoint; the rest are computed.
  const std::size_t n_tables = plan.tables(), per_table = plan.chunks_per_table(), n_items = n_tables * (1 + per_table);
  const ThreadExecutor local(o.threads);
  const Executor& executor = o.executor ? *o.executor : local;
  std::optional<Checkpoint> checkpoint;
  if (o.checkpoint && executor.assembles()) checkpoint.emplace(*o.checkpoint);
  std::vector<std::string> texts(n_items);
  std::vector<std::size_t> pending;
  for (std::size_t i = 0; i < n_items; ++i) {
    if (checkpoint)
      if (const auto text = checkpoint->load(i)) {
        try {  // a damaged record is computed again
          if (i < n_tables)
            (void)table_from_text(*text, fmt::format("checkpoint item {}", i));
          else
            (void)unit_from_text(*text, fmt::format("checkpoint item {}", i));
          texts[i] = *text;
          ++out.units_resumed;
          continue;
        } catch (const InputError&) {
        }
      }
    pending.push_back(i);
  }
  pending = executor.agree(pending);
  const auto split = std::partition_point(pending.begin(), pending.end(), [&](std::size_t i) { return i < n_tables; });
  const std::vector<std::size_t> pending_tables(pending.begin(), split), pending_chunks(split, pending.end());
  // Fewer tables than threads (a single-point run): the spare threads solve each table's nodes.
  plan.table_options.threads =
      std::max(1, o.threads / static_cast<int>(std::max<std::size_t>(1, pending_tables.size())));
  // Progress by expected cost (job_units.hpp): a B(M) table outweighs a chunk of masses.
  const auto cost = [&](std::size_t i) {
    return i < n_tables ? detail::expected_table_cost(plan, i) : detail::expected_chunk_cost(plan, i - n_tables);
  };
  double total_cost = 0, done_cost = 0;
  for (const std::size_t i : pending) total_cost += cost(i);
  Progress progress("ember run", total_cost, o.quiet || !executor.assembles());
  std::size_t tables_done = 0, chunks_done = 0;
  const auto finished = [&](std::size_t i, const std::string& text) {
    texts[i] = text;
    if (checkpoint) checkpoint->save(i, text);
    done_cost += cost(i);
    ++(i < n_tables ? tables_done : chunks_done);
    const std::size_t t = i < n_tables ? i : (i - n_tables) / per_table;
    progress.advance(done_cost,
                     fmt::format("{}: tables {}/{}, chunks {}/{}", name_of(s.tunnelling.prescriptions[t % n_presc]),
                                 tables_done, pending_tables.size(), chunks_done, pending_chunks.size()));
  };
  executor.run(
      pending_tables, [&](std::size_t t) { return detail::table_work(plan, t); }, finished);
  // Every process needs every table for the chunks (MPI: rank 0 sends them).
  std::vector<std::string> table_texts(texts.begin(), texts.begin() + static_cast<std::ptrdiff_t>(n_tables));
  table_texts = executor.share(std::move(table_texts));
  std::vector<TableResult> records(n_tables);
  detail::Tables tables(n_tables);
  for (std::size_t t = 0; t < n_tables; ++t) {
    records[t] = table_from_text(table_texts[t], fmt::format("table {}", t));
    if (records[t].state == TableResult::State::table) tables[t] = tunnelling::ActionTable::from_text(records[t].table);
  }
  executor.run(
      pending_chunks, [&](std::size_t i) { return detail::chunk_work(plan, tables, i - n_tables); }, finished);
  progress.finish();
  if (checkpoint) out.checkpoint_warning = checkpoint->failure();
  out.assembled = executor.assembles();
  if (!out.assembled) return out;

  std::vector<UnitResult> units(n_tables);
  for (std::size_t t = 0; t < n_tables; ++t) {
    std::vector<UnitResult> chunks;
    for (std::size_t c = 0; c < per_table; ++c) {
      const std::size_t i = n_tables + t * per_table + c;
      chunks.push_back(unit_from_text(texts[i], fmt::format("item {}", i)));
    }
    units[t] = detail::assemble_unit(plan, t, records[t], tables[t], chunks);
  }
  // Tables this run computed (not those resumed from the checkpoint): built, or read from the cache.
  for (const std::size_t t : pending_tables) {
    if (records[t].cache_hit) ++(*records[t].cache_hit ? out.tables_from_cache : out.tables_built);
    if (!out.cache_warning && !records[t].cache_failure.empty()) out.cache_warning = records[t].cache_failure;
  }

  // Assemble, in order.
  std::vector<std::vector<std::vector<std::optional<double>>>> band_values(
      n_presc, std::vector<std::vector<std::optional<double>>>(rows.size()));
  for (std::size_t point = 0; point < points.size(); ++point) {
    const detail::PointModel& model = models[point];
    BandPoint bp{points[point], model.stability ? model.stability->verdict : higgs::Verdict::metastable, false,
                 model.stability ? model.stability->log10_expected_decays : std::nullopt};
    if (model.failure) {
      bp.failed = true;
      out.failures.push_back({point, "", std::nullopt, std::nullopt, *model.failure});
    }
    for (std::size_t k = 0; k < n_presc; ++k) {
      const UnitResult& unit = units[point * n_presc + k];
      const std::string presc = name_of(s.tunnelling.prescriptions[k]);
      if (!unit.failure.empty() && !model.failure) {
        bp.failed = true;
        out.failures.push_back({point, presc, std::nullopt, std::nullopt, unit.failure});
      }
      const auto row_failed = [&](std::size_t r) {
        return r < unit.row_failures.size() && !unit.row_failures[r].empty();
      };
      for (std::size_t r = 0; r < rows.size(); ++r) {
        band_values[k][r].push_back(unit.beta_max[r]);
        bp.constraint |= unit.beta_max[r].has_value();
        if (row_failed(r)) {
          bp.failed = true;
          out.failures.push_back({point, presc, rows[r].first, rows[r].second, unit.row_failures[r]});
        }
      }
      if (!points[point].central) continue;
      PrescriptionOutcome& outcome = out.outcomes[k];
      for (std::size_t r = 0; r < rows.size(); ++r)
        outcome.curve.push_back({rows[r].first,
                                 rows[r].second.value_or(0),
                                 unit.beta_max[r],
                                 unit.f_max[r],
                                 {},
                                 {},
                                 0,
                                 row_failed(r) || !unit.failure.empty()});
      outcome.scan = unit.scan;
      outcome.counts = unit.counts;
      outcome.survival = std::exp(-unit.counts.lightcone);
      outcome.excluded = unit.counts.lightcone > s.exclusion.max_decays;
      outcome.table_summary = unit.table_summary;
      outcome.plot_ratio = unit.plot_ratio;
      outcome.failure = unit.failure;
      if (!unit.failure.empty()) outcome.excluded = false;
    }
    if (points[point].central) {
      out.potential = model.potential->description();
      out.stability = model.stability;
      if (model.no_decay) {
        out.no_constraint = true;
        out.no_constraint_reason = *model.no_decay;
      }
      if (model.sm) {
        const double t0 = std::log(model.running->mu_min()), t1 = std::log(model.running->mu_max());
        for (int i = 0; i <= 300; ++i) {
          const double h = std::exp(t0 + (t1 - t0) * i / 300);
          out.plot_field.push_back(h);
          out.plot_lambda.push_back(model.running->lambda(h));
          out.plot_lambda_eff.push_back(model.sm->lambda_eff(h));
        }
      }
    }
    out.band.push_back(bp);
  }
  // The band envelope over all Higgs points, per prescription and row.
  for (std::size_t k = 0; k < out.outcomes.size(); ++k)
    for (std::size_t r = 0; r < rows.size() && r < out.outcomes[k].curve.size(); ++r) {
      CurveRow& row = out.outcomes[k].curve[r];
      for (const auto& v : band_values[k][r]) {
        if (!v) {
          ++row.band_without;
          continue;
        }
        row.band_low = row.band_low ? std::min(*row.band_low, *v) : *v;
        row.band_high = row.band_high ? std::max(*row.band_high, *v) : *v;
      }
    }
  out.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  return out;
}

}  // namespace ember::scenario

namespace ember::scenario {

std::string job_identity(const JobOptions& o) {
  return fmt::format(
      "ember {} numerics {} table_points {} table_check_stride {} responses_per_decade {} "
      "decay_grid_points {} plot_points {} rows_per_chunk {} grid_per_chunk {} max_chunks {}",
      version, embedded::numerics_fingerprint(), o.table_points, o.table_check_stride, o.responses_per_decade,
      o.decay_grid_points, o.plot_points, o.rows_per_chunk, o.grid_per_chunk, o.max_chunks);
}

}  // namespace ember::scenario
