#include "thresholds.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "ember/core/errors.hpp"
#include "ember/core/gsl_tools.hpp"
#include "ember/core/parallel.hpp"
#include "ember/tunnelling/action_cache.hpp"
#include "ember/tunnelling/rate.hpp"
#include "work_items.hpp"

namespace ember::pipeline::detail {

namespace {

using scenario::ThresholdInput;
using tunnelling::Prescription;

// log10 of a zero N or rate ratio: below the log10 of any double, so a root search still sees the
// sign change where a bubble first appears.
constexpr double log10_of_zero = -400;

double log10_or_floor(double x) {
  return x > 0 ? std::log10(x) : log10_of_zero;
}

double& input_of(higgs::Inputs& in, ThresholdInput i) {
  return i == ThresholdInput::top_mass ? in.top_mass : i == ThresholdInput::higgs_mass ? in.higgs_mass : in.alpha_s;
}

const scenario::BandAxis& axis_of(const scenario::Band& b, ThresholdInput i) {
  return i == ThresholdInput::top_mass ? b.top_mass : i == ThresholdInput::higgs_mass ? b.higgs_mass : b.alpha_s;
}

scenario::InputRange accepted(ThresholdInput i) {
  return i == ThresholdInput::top_mass     ? scenario::top_mass_accepted
         : i == ThresholdInput::higgs_mass ? scenario::higgs_mass_accepted
                                           : scenario::alpha_s_accepted;
}

// The quantity whose root is sought, from one evaluation: none where its solver failed.
enum class Quantity { exclusion, outruns };
std::optional<double> level(const SensitivitySample& s, Quantity q, double max_decays) {
  if (q == Quantity::exclusion)
    return s.lightcone ? std::optional<double>(log10_or_floor(*s.lightcone) - std::log10(max_decays)) : std::nullopt;
  return s.max_ratio ? std::optional<double>(log10_or_floor(*s.max_ratio)) : std::nullopt;
}

struct Search {
  const JobPlan& plan;
  ThresholdInput input;
  // Extended spectra: the plan's response grid over the scenario's own spectrum only, with one
  // node beyond each end (the plan's grid also spans every scan row's spectrum): the same nodes,
  // so the evaluation at the scenario's own value reproduces the main N.
  std::vector<double> own_grid;

  HiggsPoint point_at(double x) const {
    HiggsPoint p = plan.points.front();  // the central point: the scenario's inputs and operators
    input_of(p.inputs, input) = x;
    p.central = false;
    p.label = fmt::format("{} {:.6g}", scenario::name_of(input), x);
    return p;
  }

  PointModel model_at(double x) const {
    try {
      return model_for(point_at(x), plan.scenario->standard_model);
    } catch (const NumericalError& e) {
      PointModel m;
      m.failure = one_line(e.what());
      return m;
    }
  }

  // The largest Gamma_D / Gamma_H under prescription k at this point and, with `counts`, the
  // scenario's own N (the costly part: a response per formation mass).
  SensitivitySample evaluate(double x, std::size_t k, const PointModel& model, bool counts = true) const {
    SensitivitySample s;
    s.value = x;
    s.prescription = k;
    if (model.failure) {
      s.failure = *model.failure;
      return s;
    }
    const Prescription p = plan.scenario->tunnelling.prescriptions[k];
    if (model.no_decay && tunnelling::needs(p).potential) {
      s.lightcone = s.max_ratio = 0.0;
      return s;
    }
    try {
      tunnelling::ActionTableOptions o = plan.table_options;
      o.threads = 1;  // the evaluations themselves run in parallel
      const tunnelling::ActionTable table =
          tunnelling::cached_action_table(p, setup_for(*plan.scenario, model), o, plan.options->cache_directory).table;
      if (counts) s.lightcone = lightcone(table, model);
      double ratio = 0;
      for (const double m : plan.plot_masses) {
        const tunnelling::Rates r =
            tunnelling::rates_at(table.at(m), *plan.mass_loss, plan.scenario->tunnelling.prefactor);
        if (r.evaporation_rate > 0) ratio = std::max(ratio, r.decay_rate / r.evaporation_rate);
      }
      s.max_ratio = ratio;
    } catch (const NumericalError& e) {
      s.failure = one_line(e.what());
    }
    return s;
  }

  double lightcone(const tunnelling::ActionTable& table, const PointModel& model) const {
    const population::ResponseContext context = context_for(plan, model);
    std::vector<population::Response> own;
    if (plan.monochromatic())
      own.push_back(population::response_at(plan.base->characteristic_mass(), table, context));
    else
      for (const double m : own_grid) own.push_back(population::response_at(m, table, context));
    const auto& a = plan.scenario->population.abundance;
    return population::counts_for(*plan.base, a.measure, a.value, own).lightcone;
  }
};

std::string side_words(ThresholdInput input, Quantity q, bool rises) {
  const std::string name = scenario::name_of(input);
  if (q == Quantity::exclusion)
    return rises ? fmt::format("excluded above this {}, allowed below", name)
                 : fmt::format("allowed above this {}, excluded below", name);
  return rises ? fmt::format("below this {}, seeded decay never outruns evaporation at any seed mass", name)
               : fmt::format("above this {}, seeded decay never outruns evaporation at any seed mass", name);
}

std::string throughout_words(Quantity q, bool above) {
  if (q == Quantity::exclusion) return above ? "excluded throughout the window" : "allowed throughout the window";
  return above ? "seeded decay outruns evaporation at some seed mass throughout the window"
               : "seeded decay never outruns evaporation throughout the window";
}

// One root for prescription k: bracketed on the window's grid (the bracket nearest the scenario's
// value), refined by Brent's method; the refinements are appended to `refined`.
Threshold find_root(const Search& search, const InputThresholds& in, std::size_t k, Quantity q,
                    const std::vector<SensitivitySample>& grid, std::vector<SensitivitySample>& refined) {
  const double max_decays = search.plan.scenario->exclusion.max_decays;
  std::vector<std::pair<double, double>> known;  // (value, level) where the evaluation succeeded
  for (const auto& s : grid)
    if (const auto l = level(s, q, max_decays)) known.emplace_back(s.value, *l);
  Threshold t;
  if (known.empty()) {
    t.note = "no evaluation in the window succeeded";
    return t;
  }
  std::optional<std::size_t> nearest;
  for (std::size_t i = 0; i + 1 < known.size(); ++i) {
    if ((known[i].second > 0) == (known[i + 1].second > 0)) continue;
    ++t.crossings;
    const auto distance = [&](std::size_t j) { return std::abs(known[j].first + known[j + 1].first - 2 * in.central); };
    if (!nearest || distance(i) < distance(*nearest)) nearest = i;
  }
  if (!nearest) {
    t.note = throughout_words(q, known.front().second > 0);
    return t;
  }
  // Plain copies, not structured bindings: clang before 16 cannot capture those in a lambda.
  const double a = known[*nearest].first, fa = known[*nearest].second;
  const double b = known[*nearest + 1].first, fb = known[*nearest + 1].second;
  const auto f = [&](double x) {
    // Brent's first calls are the bracket's ends, evaluated already.
    if (x == a) return fa;
    if (x == b) return fb;
    const SensitivitySample s = search.evaluate(x, k, search.model_at(x), q == Quantity::exclusion);
    refined.push_back(s);
    refined.back().grid = false;
    const auto l = level(s, q, max_decays);
    if (!l)
      throw NumericalError("threshold search (GSL Brent)",
                           fmt::format("at {} = {:.6g}: {}", scenario::name_of(in.input), x, s.failure));
    return *l;
  };
  try {
    const BrentResult r = brent_root(f, a, b, in.tolerance, 100);
    if (!r.converged)
      throw NumericalError("threshold search (GSL Brent)", fmt::format("no convergence in [{:.6g}, {:.6g}]", a, b));
    t.value = r.x;
    t.note = side_words(in.input, q, fb > fa);
    if (t.crossings > 1)
      t.note += fmt::format(" ({} crossings in the window; this is the one nearest the scenario's value)", t.crossings);
  } catch (const NumericalError& e) {
    t.note = one_line(fmt::format("root search failed between {:.6g} and {:.6g}: {}", a, b, e.what()));
  }
  return t;
}

// The window around the scenario's value, within the accepted inputs; the top-mass window reaches
// one sigma below the critical top mass, so the figure shows where the constraint vanishes.
InputThresholds window(const JobPlan& plan, ThresholdInput input) {
  const scenario::Scenario& s = *plan.scenario;
  InputThresholds in;
  in.input = input;
  higgs::Inputs inputs = s.standard_model.inputs;
  in.central = input_of(inputs, input);
  in.sigma = axis_of(s.scan.band, input).sigma;
  in.tolerance = s.scan.thresholds.tolerance * in.sigma;
  in.from = in.central - s.scan.thresholds.span * in.sigma;
  in.to = in.central + s.scan.thresholds.span * in.sigma;
  if (input == ThresholdInput::top_mass) {
    const auto& form = std::get<scenario::StandardModelForm>(s.standard_model.potential);
    try {
      in.critical_top_mass = higgs::critical_top_mass_effective(inputs, form.options);
      in.from = std::min(in.from, *in.critical_top_mass - in.sigma);
    } catch (const NumericalError& e) {
      in.critical_note = one_line(e.what());
    }
  }
  const scenario::InputRange range = accepted(input);
  in.from = std::max(in.from, range.low);
  in.to = std::min(in.to, range.high);
  return in;
}

InputThresholds search_input(const JobPlan& plan, ThresholdInput input) {
  InputThresholds in = window(plan, input);
  Search search{plan, input, {}};
  const auto& g = plan.grid;
  for (std::size_t i = 0; i < g.size(); ++i)
    if ((i + 1 < g.size() && g[i + 1] >= plan.base->low()) && (i == 0 || g[i - 1] <= plan.base->high()))
      search.own_grid.push_back(g[i]);
  const int n = plan.scenario->scan.thresholds.points;
  std::vector<double> values;
  for (int i = 0; i < n; ++i) values.push_back(in.from + (in.to - in.from) * i / (n - 1));
  std::vector<PointModel> models(values.size());
  const int threads = plan.options->threads;
  parallel_for(values.size(), threads, [&](std::size_t i) { models[i] = search.model_at(values[i]); });
  const std::size_t prescriptions = plan.prescriptions();
  std::vector<SensitivitySample> grid(values.size() * prescriptions);
  parallel_for(grid.size(), threads, [&](std::size_t j) {
    grid[j] = search.evaluate(values[j / prescriptions], j % prescriptions, models[j / prescriptions]);
  });
  in.prescriptions.resize(prescriptions);
  std::vector<std::vector<SensitivitySample>> samples(prescriptions);
  parallel_for(prescriptions, threads, [&](std::size_t k) {
    std::vector<SensitivitySample> own;
    for (std::size_t i = 0; i < values.size(); ++i) own.push_back(grid[i * prescriptions + k]);
    if (!tunnelling::needs(plan.scenario->tunnelling.prescriptions[k]).potential) {
      in.prescriptions[k].exclusion.note = in.prescriptions[k].outruns.note =
          "this prescription does not read the Higgs potential: no threshold";
    } else {
      std::vector<SensitivitySample> refined;
      in.prescriptions[k].exclusion = find_root(search, in, k, Quantity::exclusion, own, refined);
      in.prescriptions[k].outruns = find_root(search, in, k, Quantity::outruns, own, refined);
      own.insert(own.end(), refined.begin(), refined.end());
    }
    std::stable_sort(own.begin(), own.end(), [](const auto& x, const auto& y) { return x.value < y.value; });
    samples[k] = std::move(own);
  });
  for (auto& s : samples) in.samples.insert(in.samples.end(), s.begin(), s.end());
  return in;
}

}  // namespace

std::vector<InputThresholds> find_thresholds(const JobPlan& plan) {
  std::vector<InputThresholds> out;
  if (!std::holds_alternative<scenario::StandardModelForm>(plan.scenario->standard_model.potential)) return out;
  for (const ThresholdInput input : plan.scenario->scan.thresholds.inputs) out.push_back(search_input(plan, input));
  return out;
}

}  // namespace ember::pipeline::detail
