#include "work_items.hpp"

#include <algorithm>
#include <cmath>

#include "ember/core/errors.hpp"
#include "ember/tunnelling/action_cache.hpp"
#include "ember/tunnelling/rate.hpp"

namespace ember::pipeline::detail {

using tunnelling::Prescription;

std::string one_line(std::string text) {
  for (char& c : text)
    if (c == '\n' || c == '\r') c = ' ';
  return text;
}

namespace {
// One formation mass's response (trajectory, hazard integrals with the hot era and the minimum
// action, light cone) against one probe_field node: about 0.5 (1.8 ms against 3.8 ms, measured
// by scripts/bench; docs/benchmarks.md).
constexpr double response_cost = 0.5;
// A table's top search: about six rough solves at half the cost of a node.
constexpr double top_search_cost = 3;
}  // namespace

tunnelling::TunnellingSetup setup_for(const scenario::Scenario& s, const PointModel& model) {
  tunnelling::TunnellingSetup setup;
  setup.potential = model.potential.get();
  setup.standard_model = model.sm;
  if (s.tunnelling.wall_tension && s.tunnelling.energy_gap)
    setup.thin_wall = tunnelling::ThinWall{*s.tunnelling.wall_tension, *s.tunnelling.energy_gap};
  setup.semiclassical_floor = s.tunnelling.semiclassical_floor;
  setup.hot_bubble_volume = s.tunnelling.hot_bubble_volume;
  setup.minimum_action = s.tunnelling.minimum_action;
  return setup;
}

population::ResponseContext context_for(const JobPlan& plan, const PointModel& model) {
  population::ResponseContext c = plan.context;
  c.standard_model = model.sm;
  return c;
}

double expected_cost(const JobPlan& plan, const WorkItem& w) {
  const PointModel& model = plan.models[w.point];
  const Prescription p = plan.prescription(w);
  if (w.is_table) {
    if (model.failure || (model.no_decay && tunnelling::needs(p).potential)) return 0.01;  // nothing to solve
    const auto& o = plan.table_options;
    const double checks = (o.points - 2) / o.midpoint_stride + 1;
    return (o.points + checks + top_search_cost) * tunnelling::relative_node_cost(p);
  }
  if (model.failure || model.no_decay) return 0.01;
  const auto [begin, end] = plan.chunk_span(w.chunk);
  return 0.01 + response_cost * static_cast<double>(end - begin);
}

std::string table_work(const JobPlan& plan, const WorkItem& w) {
  const PointModel& model = plan.models[w.point];
  const Prescription p = plan.prescription(w);
  TableRecord r;
  if (model.failure) {
    r.state = TableRecord::State::failed;
    r.failure = *model.failure;
    return to_text(r);
  }
  // A potential without a bubble leaves nothing to compute, except for prescriptions that do not
  // read it (thin_wall: its own wall).
  if (model.no_decay && tunnelling::needs(p).potential) return to_text(r);
  try {
    const tunnelling::CachedTable cached = tunnelling::cached_action_table(
        p, setup_for(*plan.scenario, model), plan.table_options, plan.options->cache_directory);
    r.state = TableRecord::State::table;
    r.cache_hit = cached.hit;
    r.cache_failure = cached.store_failure.value_or("");
    r.table = cached.table.to_text();
  } catch (const NumericalError& e) {
    // Recorded, and the other units go on.
    r.state = TableRecord::State::failed;
    r.failure = one_line(e.what());
  }
  return to_text(r);
}

namespace {

// beta <= 1 by definition (an energy fraction): a bound at or above 1 means even a universe made
// of these holes decays fewer than max_decays times, so nothing is constrained.
void drop_unphysical(std::optional<double>& beta, std::optional<double>& f) {
  if (beta && !(*beta < 1)) beta = f = std::nullopt;
}

// The response context at one Higgs point: its own Standard Model potential sets the plasma's
// thermal mass (population/plasma.hpp).
population::ResponseContext context_at(const JobPlan& plan, std::size_t point) {
  return context_for(plan, plan.models[point]);
}

void monochromatic_rows(const JobPlan& plan, const WorkItem& w, const tunnelling::ActionTable& table, std::size_t begin,
                        std::size_t end, ItemResult& u) {
  const bool central = plan.points[w.point].central;
  u.beta_max.assign(end - begin, std::nullopt);
  u.f_max.assign(end - begin, std::nullopt);
  const population::ResponseContext context = context_at(plan, w.point);
  for (std::size_t r = begin; r < end; ++r) try {
      if (plan.options->before_row) plan.options->before_row(w.point, w.prescription, r);
      const population::Response resp = population::response_at(plan.rows[r].mass, table, context);
      if (resp.lightcone_per_beta > 0) {
        u.beta_max[r - begin] = plan.scenario->exclusion.max_decays / resp.lightcone_per_beta;
        u.f_max[r - begin] = *u.beta_max[r - begin] * resp.f_per_beta;
      }
      drop_unphysical(u.beta_max[r - begin], u.f_max[r - begin]);
      if (central) u.scan.push_back(resp);
    } catch (const NumericalError& e) {
      // Recorded with its reason; the other rows go on.
      u.beta_max[r - begin] = u.f_max[r - begin] = std::nullopt;
      u.row_failures.resize(end - begin);
      u.row_failures[r - begin] = one_line(e.what());
    }
}

ItemResult failed_unit(std::size_t rows, const std::string& why, std::optional<bool> cache_hit) {
  ItemResult u;
  u.beta_max.assign(rows, std::nullopt);
  u.f_max.assign(rows, std::nullopt);
  u.failure = why;
  u.cache_hit = cache_hit;
  return u;
}

}  // namespace

std::string chunk_work(const JobPlan& plan, const Tables& tables, const WorkItem& w) {
  const auto [begin, end] = plan.chunk_span(w.chunk);
  ItemResult u;
  if (!tables[w.table]) return to_text(u);  // no table: nothing to compute here
  if (plan.monochromatic()) {
    monochromatic_rows(plan, w, *tables[w.table], begin, end, u);
  } else {
    try {
      const population::ResponseContext context = context_at(plan, w.point);
      for (std::size_t i = begin; i < end; ++i)
        u.scan.push_back(population::response_at(plan.grid[i], *tables[w.table], context));
    } catch (const NumericalError& e) {
      u.scan.clear();
      u.failure = one_line(e.what());  // the whole unit fails: every row integrates over the grid
    }
  }
  return to_text(u);
}

namespace {

// Extended spectra: every row integrates over the whole response grid.
void extended_rows(const JobPlan& plan, const WorkItem& w, const std::vector<population::Response>& grid,
                   ItemResult& u) {
  const scenario::Scenario& s = *plan.scenario;
  for (std::size_t r = 0; r < plan.rows.size(); ++r) try {
      if (plan.options->before_row) plan.options->before_row(w.point, w.prescription, r);
      const double per_f = population::lightcone_per_amplitude(*plan.row_spectra[r], grid);
      if (per_f > 0) {
        u.f_max[r] = s.exclusion.max_decays / per_f;
        const population::Formation f =
            population::formation_of(plan.rows[r].mass, s.population.collapse_fraction, *plan.background);
        u.beta_max[r] = *u.f_max[r] / population::f_pbh_per_beta(f, *plan.background);
      }
      drop_unphysical(u.beta_max[r], u.f_max[r]);
    } catch (const NumericalError& e) {
      u.beta_max[r] = u.f_max[r] = std::nullopt;
      u.row_failures.resize(plan.rows.size());
      u.row_failures[r] = one_line(e.what());
    }
}

// The scenario's own abundance at this Higgs point (every point: the band reports N per point).
void own_counts(const JobPlan& plan, const WorkItem& w, const tunnelling::ActionTable& table,
                const std::vector<population::Response>& grid, ItemResult& u) {
  const scenario::Scenario& s = *plan.scenario;
  if (plan.options->before_row) plan.options->before_row(w.point, w.prescription, plan.rows.size());
  const std::vector<population::Response> own =
      plan.monochromatic() ? std::vector<population::Response>{population::response_at(
                                 plan.base->characteristic_mass(), table, context_at(plan, w.point))}
                           : grid;
  u.counts = population::counts_for(*plan.base, s.population.abundance.measure, s.population.abundance.value, own);
}

// The central point's responses for decay.csv, and Gamma_D / Gamma_H for the plot.
void central_extras(const JobPlan& plan, const tunnelling::ActionTable& table,
                    const std::vector<population::Response>& grid, ItemResult& u) {
  const scenario::Scenario& s = *plan.scenario;
  if (!plan.monochromatic()) u.scan = grid;
  u.table_summary = table.summary().message;
  for (const double m : plan.plot_masses) {
    const tunnelling::ActionPoint a = table.at(m);
    const tunnelling::Rates rate = tunnelling::rates_at(a, *plan.mass_loss, s.tunnelling.prefactor);
    u.plot_ratio.push_back(rate.evaporation_rate > 0 ? rate.decay_rate / rate.evaporation_rate : 0.0);
    u.plot_low_action.push_back(a.flags.below_minimum_action);
  }
}

}  // namespace

ItemResult assemble_table(const JobPlan& plan, const WorkItem& w, const TableRecord& record,
                          const std::optional<tunnelling::ActionTable>& table, const std::vector<ItemResult>& chunks) {
  const std::size_t n = plan.rows.size();
  if (record.state == TableRecord::State::failed) return failed_unit(n, record.failure, record.cache_hit);
  ItemResult u;
  u.beta_max.assign(n, std::nullopt);
  u.f_max.assign(n, std::nullopt);
  u.cache_hit = record.cache_hit;
  if (record.state == TableRecord::State::no_decay || !table) return u;
  try {
    std::vector<population::Response> grid;
    for (std::size_t c = 0; c < chunks.size(); ++c) {
      const ItemResult& ch = chunks[c];
      if (!ch.failure.empty()) return failed_unit(n, ch.failure, record.cache_hit);
      const std::size_t begin = plan.chunk_span(c).first;
      if (plan.monochromatic()) {
        for (std::size_t i = 0; i < ch.beta_max.size(); ++i) {
          u.beta_max[begin + i] = ch.beta_max[i];
          u.f_max[begin + i] = ch.f_max[i];
        }
        for (std::size_t i = 0; i < ch.row_failures.size(); ++i)
          if (!ch.row_failures[i].empty()) {
            u.row_failures.resize(n);
            u.row_failures[begin + i] = ch.row_failures[i];
          }
        u.scan.insert(u.scan.end(), ch.scan.begin(), ch.scan.end());
      } else {
        grid.insert(grid.end(), ch.scan.begin(), ch.scan.end());
      }
    }
    if (!plan.monochromatic()) extended_rows(plan, w, grid, u);
    own_counts(plan, w, *table, grid, u);
    if (plan.points[w.point].central) central_extras(plan, *table, grid, u);
  } catch (const NumericalError& e) {
    // The whole unit failed (the scenario's own counts): recorded, and the others go on.
    return failed_unit(n, one_line(e.what()), record.cache_hit);
  }
  return u;
}

}  // namespace ember::pipeline::detail
