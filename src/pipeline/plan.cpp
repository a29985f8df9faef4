#include "plan.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "ember/core/errors.hpp"
#include "ember/core/parallel.hpp"
#include "ember/tunnelling/landscape.hpp"
#include "ember/tunnelling/unseeded.hpp"
#include "work_items.hpp"

namespace ember::pipeline::detail {

namespace {

using population::MassFunction;
using namespace ember::scenario;

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

// The scenario's spectrum at a mass and width, with its cut when one is asked for.
std::unique_ptr<MassFunction> spectrum_of(const Population& p, std::optional<double> mass,
                                          std::optional<double> width) {
  std::unique_ptr<MassFunction> s = spectrum_at(p.spectrum, mass, width);
  if (!p.cut_below) return s;
  if (s->monochromatic())
    throw InputError("population.cut_below: applies to extended spectra; expected no cut for a monochromatic one");
  return population::cut_below(std::move(s), *p.cut_below);
}

std::vector<HiggsPoint> higgs_points(const StandardModelInputs& sm, const ScanChoices& scan) {
  const auto* form = std::get_if<StandardModelForm>(&sm.potential);
  HiggsPoint central{sm.inputs, form ? form->options.lambda6 : 0.0, form ? form->options.lambda8 : 0.0, true,
                     "central"};
  std::vector<HiggsPoint> out{central};
  if (!form) return out;
  // Each axis: the values and their offsets in sigma.
  const auto axis = [](const BandAxis& a, double centre) {
    std::vector<std::pair<double, double>> v;
    for (int i = 0; i < a.points; ++i) {
      const double k = a.points == 1 ? 0.0 : a.span * (2.0 * i / (a.points - 1) - 1);
      v.emplace_back(centre + a.sigma * k, k);
    }
    return v;
  };
  std::vector<double> l6{central.lambda6}, l8{central.lambda8};
  l6.insert(l6.end(), scan.band.lambda6.begin(), scan.band.lambda6.end());
  l8.insert(l8.end(), scan.band.lambda8.begin(), scan.band.lambda8.end());
  // Labels to six figures, with each offset in sigma: no float noise (171.98999999999998).
  const auto value = [](const char* name, double x, double k, const char* unit) {
    return k == 0 ? fmt::format("{} {:.6g}{}", name, x, unit)
                  : fmt::format("{} {:.6g}{} ({:+.3g} sigma)", name, x, unit, k);
  };
  for (const auto& [mt, kt] : axis(scan.band.top_mass, sm.inputs.top_mass))
    for (const auto& [mh, kh] : axis(scan.band.higgs_mass, sm.inputs.higgs_mass))
      for (const auto& [as, ka] : axis(scan.band.alpha_s, sm.inputs.alpha_s))
        for (const double a6 : l6)
          for (const double a8 : l8) {
            HiggsPoint p{sm.inputs, a6, a8, false, ""};
            p.inputs.top_mass = mt;
            p.inputs.higgs_mass = mh;
            p.inputs.alpha_s = as;
            if (kt == 0 && kh == 0 && ka == 0 && a6 == central.lambda6 && a8 == central.lambda8) continue;
            p.sigmas = std::max({std::abs(kt), std::abs(kh), std::abs(ka)});
            p.operators = a6 != central.lambda6 || a8 != central.lambda8;
            p.label = fmt::format("{}, {}, {}, lambda6 {:.6g}, lambda8 {:.6g}", value("M_t", mt, kt, " GeV"),
                                  value("M_h", mh, kh, " GeV"), value("alpha_s", as, ka, ""), a6, a8);
            out.push_back(p);
          }
  return out;
}

}  // namespace

PointModel model_for(const HiggsPoint& hp, const StandardModelInputs& sm) {
  PointModel m;
  if (const auto* form = std::get_if<StandardModelForm>(&sm.potential)) {
    m.running = std::make_shared<const higgs::Running>(hp.inputs);
    auto pot = std::make_unique<higgs::StandardModelPotential>(
        m.running, higgs::StandardModelOptions{form->options.coleman_weinberg, hp.lambda6, hp.lambda8});
    m.sm = pot.get();
    m.stability = tunnelling::analyse_unseeded(*pot);
    if (m.stability->verdict == higgs::Verdict::stable)
      m.no_decay = "the Higgs potential is stable for these inputs (lambda_eff stays positive up to the Planck scale)";
    m.potential = std::move(pot);
    return m;
  }
  if (const auto* poly = std::get_if<PolynomialForm>(&sm.potential))
    m.potential = std::make_unique<higgs::PolynomialPotential>(poly->scale, poly->coefficients);
  else
    m.potential = std::make_unique<higgs::TabulatedPotential>(std::get<TabulatedForm>(sm.potential).file);
  try {
    tunnelling::analyse_landscape(*m.potential, m.potential->field_max() * 1e-40);
  } catch (const InputError&) {
    m.no_decay = "the potential has no barrier into a lower region: no constraint";
  }
  return m;
}

namespace {

// An explicit scan range that misses the scenario's own (peak) mass, or leaves out more than a
// stated share of its abundance, shows a constraint curve that is not about this scenario.
void scan_warnings(const Scenario& s, JobPlan& plan) {
  if (std::holds_alternative<TabulatedSpectrum>(s.population.spectrum)) return;  // one row, at its own mass
  const double own = plan.base->characteristic_mass();
  const bool mono = plan.base->monochromatic();
  if (own < plan.scan_from || own > plan.scan_to)
    plan.warnings.push_back(
        fmt::format("scan.masses: the range {:.4g} g to {:.4g} g misses the scenario's own {} at "
                    "{:.4g} g; constraint.csv and the plot do not show it",
                    plan.scan_from / units::gram, plan.scan_to / units::gram, mono ? "mass" : "characteristic mass",
                    own / units::gram));
  if (mono) return;
  const double out = population::share_outside(*plan.base, plan.scan_from, plan.scan_to);
  if (out > scan_abundance_cut)
    plan.warnings.push_back(
        fmt::format("scan.masses: {:.3g} of the spectrum's abundance lies outside the range "
                    "{:.4g} g to {:.4g} g (more than {:.0e}); leave from and to out to follow "
                    "the spectrum",
                    out, plan.scan_from / units::gram, plan.scan_to / units::gram, scan_abundance_cut));
}

// The scan: formation or characteristic masses, and widths for a lognormal spectrum. A tabulated
// spectrum has one row, at its own characteristic mass.
void plan_rows(const Scenario& s, JobPlan& plan) {
  const bool table_spectrum = std::holds_alternative<TabulatedSpectrum>(s.population.spectrum);
  const std::vector<double> widths =
      std::holds_alternative<Lognormal>(s.population.spectrum) ? s.scan.widths : std::vector<double>{};
  const MassGrid& g = s.scan.masses;
  const bool mono = plan.base->monochromatic();
  const double from = g.from.value_or(mono ? monochromatic_scan_from_g * units::gram : plan.base->low());
  const double to = g.to.value_or(mono ? monochromatic_scan_to_g * units::gram : plan.base->high());
  if (!(to >= from))
    throw InputError(
        fmt::format("scan.masses: from {:.4g} g lies above to {:.4g} g once the spectrum fills in the "
                    "missing end; expected from <= to",
                    from / units::gram, to / units::gram));
  plan.scan_from = from;
  plan.scan_to = to;
  scan_warnings(s, plan);
  for (int i = 0; i < (table_spectrum ? 1 : g.points); ++i) {
    const double m = table_spectrum  ? plan.base->characteristic_mass()
                     : g.points == 1 ? from
                                     : from * std::pow(to / from, static_cast<double>(i) / (g.points - 1));
    if (widths.empty()) plan.rows.push_back({m, std::nullopt});
    for (const double w : widths) plan.rows.push_back({m, w});
  }
  for (const ScanRow& r : plan.rows)
    plan.row_spectra.push_back(table_spectrum ? spectrum_of(s.population, std::nullopt, std::nullopt)
                                              : spectrum_of(s.population, r.mass, r.width));
}

// Extended spectra: the response grid spans every row's spectrum. A wide spectrum's tails can
// reach masses that cannot form (before T = 1e19 GeV or after today): no holes form there, so the
// integrals stop at the formable range, and the description says so.
void plan_grid(const Scenario& s, JobPlan& plan, std::string& spectrum) {
  double lo = plan.base->low(), hi = plan.base->high();
  for (const auto& f : plan.row_spectra) {
    lo = std::min(lo, f->low());
    hi = std::max(hi, f->high());
  }
  const population::MassRange formable = population::formable_masses(s.population.collapse_fraction, *plan.background);
  if (lo < formable.low || hi > formable.high) {
    spectrum += fmt::format(" (integrated over the formable masses {:.3g} g to {:.3g} g only)",
                            std::max(lo, formable.low) / units::gram, std::min(hi, formable.high) / units::gram);
    lo = std::max(lo, formable.low);
    hi = std::min(hi, formable.high);
  }
  if (!plan.monochromatic()) plan.grid = population::response_masses(lo, hi, plan.options->responses_per_decade);
}

// Every Higgs point's potential and verdict: independent, each writing only its own slot, so the
// results do not depend on the thread count. The central point's failure ends the run (nothing
// can be reported without it); a band point's is recorded and the others go on.
void plan_points(const Scenario& s, JobPlan& plan) {
  plan.points = higgs_points(s.standard_model, s.scan);
  plan.models.resize(plan.points.size());
  parallel_for(plan.points.size(), plan.options->threads, [&](std::size_t i) {
    try {
      plan.models[i] = model_for(plan.points[i], s.standard_model);
    } catch (const NumericalError& e) {
      if (plan.points[i].central) throw;
      plan.models[i] = PointModel{};
      plan.models[i].failure = one_line(e.what());
    }
  });
}

}  // namespace

// What is chunked (scan rows or grid masses): how many, and how many per chunk at most.
std::pair<std::size_t, std::size_t> JobPlan::chunking() const {
  if (monochromatic()) return {rows.size(), static_cast<std::size_t>(options->rows_per_chunk)};
  return {grid.size(), static_cast<std::size_t>(options->grid_per_chunk)};
}

std::size_t JobPlan::chunks_per_table() const {
  const auto [n, per] = chunking();
  const std::size_t wanted = std::max<std::size_t>(1, (n + per - 1) / per);
  const std::size_t bound = std::max<std::size_t>(1, static_cast<std::size_t>(options->max_chunks) / tables());
  return std::min(wanted, bound);
}

// Chunk k of c holds [k n / c, (k + 1) n / c): sizes differ by at most one.
std::pair<std::size_t, std::size_t> JobPlan::chunk_span(std::size_t chunk) const {
  const std::size_t n = chunking().first, c = chunks_per_table();
  return {chunk * n / c, (chunk + 1) * n / c};
}

WorkItem JobPlan::item(std::size_t index) const {
  WorkItem w;
  w.is_table = index < tables();
  w.table = w.is_table ? index : (index - tables()) / chunks_per_table();
  w.chunk = w.is_table ? 0 : (index - tables()) % chunks_per_table();
  w.point = w.table / prescriptions();
  w.prescription = w.table % prescriptions();
  return w;
}

JobPlan make_plan(const Scenario& s, const JobOptions& o, const cosmology::Background& background,
                  const evaporation::MassLoss& mass_loss, std::string& spectrum) {
  JobPlan plan;
  plan.scenario = &s;
  plan.options = &o;
  plan.background = &background;
  plan.mass_loss = &mass_loss;
  plan.base = spectrum_of(s.population, std::nullopt, std::nullopt);
  spectrum = plan.base->description();
  plan_rows(s, plan);
  plan_grid(s, plan, spectrum);
  plan.context.background = &background;
  plan.context.mass_loss = &mass_loss;
  plan.context.trajectory = s.evaporation.trajectory;
  plan.context.decay.prefactor = s.tunnelling.prefactor;
  plan.context.decay.grid_points = o.decay_grid_points;
  plan.context.decay.hot_era = s.tunnelling.hot_era;
  plan.context.collapse_fraction = s.population.collapse_fraction;
  plan.table_options.points = o.table_points;
  plan.table_options.midpoint_stride = o.table_check_stride;
  for (int i = 0; i < o.plot_points; ++i)
    plan.plot_masses.push_back(s.tunnelling.semiclassical_floor *
                               std::pow(1e10, static_cast<double>(i) / (o.plot_points - 1)));
  plan_points(s, plan);
  return plan;
}

}  // namespace ember::pipeline::detail
