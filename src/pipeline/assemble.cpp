#include "assemble.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

namespace ember::pipeline::detail {

namespace {

// Each (Higgs point, prescription) from its table record and its chunks, in table order.
std::vector<ItemResult> assemble_tables(const JobPlan& plan, const Executed& done) {
  std::vector<ItemResult> out(plan.tables());
  for (std::size_t t = 0; t < plan.tables(); ++t) {
    std::vector<ItemResult> chunks;
    for (std::size_t c = 0; c < plan.chunks_per_table(); ++c) {
      const std::size_t i = plan.chunk_index(t, c);
      chunks.push_back(item_from_text(done.texts[i], fmt::format("item {}", i)));
    }
    out[t] = assemble_table(plan, plan.item(t), done.records[t], done.tables[t], chunks);
  }
  return out;
}

// Tables this run computed (not those resumed from the checkpoint): built, or read from the cache.
void count_tables(const Executed& done, JobResults& out) {
  for (const std::size_t t : done.computed_tables) {
    const TableRecord& r = done.records[t];
    if (r.cache_hit) ++(*r.cache_hit ? out.tables_from_cache : out.tables_built);
    if (!out.cache_warning && !r.cache_failure.empty()) out.cache_warning = r.cache_failure;
  }
}

bool row_failed(const ItemResult& item, std::size_t r) {
  return r < item.row_failures.size() && !item.row_failures[r].empty();
}

// The central point's outcome under one prescription: its curve, counts and verdict.
void central_outcome(const JobPlan& plan, const ItemResult& item, PrescriptionOutcome& outcome) {
  for (std::size_t r = 0; r < plan.rows.size(); ++r) {
    CurveRow row;
    row.mass = plan.rows[r].mass;
    row.width = plan.rows[r].width.value_or(0);
    row.beta_max = item.beta_max[r];
    row.f_max = item.f_max[r];
    row.failed = row_failed(item, r) || !item.failure.empty();
    outcome.curve.push_back(row);
  }
  outcome.scan = item.scan;
  outcome.counts = item.counts;
  outcome.survival = std::exp(-item.counts.lightcone);
  outcome.excluded = item.failure.empty() && item.counts.lightcone > plan.scenario->exclusion.max_decays;
  outcome.table_summary = item.table_summary;
  outcome.plot_ratio = item.plot_ratio;
  outcome.plot_low_action = item.plot_low_action;
  if (!plan.monochromatic() && item.failure.empty()) {
    outcome.dn_dlnm = population::contributions(*plan.base, item.counts.f_pbh, item.scan);
    outcome.range90 = population::contribution_range(item.scan, outcome.dn_dlnm, 0.9);
  }
  outcome.failure = item.failure;
}

// The central point's potential, verdict and plot data.
void central_point(const PointModel& model, JobResults& out) {
  out.potential = model.potential->description();
  out.stability = model.stability;
  if (model.no_decay) {
    out.no_constraint = true;
    out.no_constraint_reason = *model.no_decay;
  }
  if (!model.sm) return;
  const double t0 = std::log(model.running->mu_min()), t1 = std::log(model.running->mu_max());
  for (int i = 0; i <= 300; ++i) {
    const double h = std::exp(t0 + (t1 - t0) * i / 300);
    out.plot_field.push_back(h);
    out.plot_lambda.push_back(model.running->lambda(h));
    out.plot_lambda_eff.push_back(model.sm->lambda_eff(h));
  }
}

// One row's beta_max at one band point, folded into the envelope (the central point comes first,
// so its curve exists already).
void widen(std::optional<double>& low, std::optional<double>& high, double beta_max) {
  low = low ? std::min(*low, beta_max) : beta_max;
  high = high ? std::max(*high, beta_max) : beta_max;
}

// Every point widens the whole band; those within 1 and 2 sigma of the central inputs (with the
// central operators) widen the 1 and 2 sigma bands too.
void fold_into_band(std::optional<double> beta_max, const HiggsPoint& p, CurveRow& row) {
  if (!beta_max) {
    ++row.band_without;
    return;
  }
  widen(row.band_low, row.band_high, *beta_max);
  if (p.operators) return;
  constexpr double slack = 1e-9;  // the axis offsets are computed, not exact
  if (p.sigmas <= 1 + slack) widen(row.band1_low, row.band1_high, *beta_max);
  if (p.sigmas <= 2 + slack) widen(row.band2_low, row.band2_high, *beta_max);
}

// One Higgs point under every prescription: its band entry, its failures, and (for the central
// point) the outcomes.
BandPoint assemble_point(const JobPlan& plan, std::size_t point, const std::vector<ItemResult>& items,
                         JobResults& out) {
  const PointModel& model = plan.models[point];
  BandPoint bp;
  bp.point = plan.points[point];
  bp.verdict = model.stability ? model.stability->verdict : higgs::Verdict::metastable;
  bp.log10_unseeded = model.stability ? model.stability->log10_expected_decays : std::nullopt;
  const auto failure = [&](std::string prescription, std::optional<ScanRow> row, std::string reason) {
    bp.failed = true;
    out.failures.push_back({point, std::move(prescription), row ? std::optional<double>(row->mass) : std::nullopt,
                            row ? row->width : std::nullopt, std::move(reason)});
  };
  if (model.failure) failure("", std::nullopt, *model.failure);
  for (std::size_t k = 0; k < plan.prescriptions(); ++k) {
    const ItemResult& item = items[point * plan.prescriptions() + k];
    const std::string name = name_of(plan.scenario->tunnelling.prescriptions[k]);
    if (!item.failure.empty() && !model.failure) failure(name, std::nullopt, item.failure);
    if (bp.point.central) central_outcome(plan, item, out.outcomes[k]);
    for (std::size_t r = 0; r < plan.rows.size(); ++r) {
      bp.constraint |= item.beta_max[r].has_value();
      if (row_failed(item, r)) failure(name, plan.rows[r], item.row_failures[r]);
      if (r < out.outcomes[k].curve.size()) fold_into_band(item.beta_max[r], bp.point, out.outcomes[k].curve[r]);
    }
    bp.lightcone.push_back(item.failure.empty() ? std::optional<double>(item.counts.lightcone) : std::nullopt);
    bp.beta_max.push_back(item.beta_max);
    bp.f_max.push_back(item.f_max);
  }
  if (bp.point.central) central_point(model, out);
  return bp;
}

}  // namespace

void assemble(const JobPlan& plan, const Executed& done, JobResults& out) {
  const std::vector<ItemResult> items = assemble_tables(plan, done);
  count_tables(done, out);
  for (std::size_t point = 0; point < plan.points.size(); ++point)
    out.band.push_back(assemble_point(plan, point, items, out));
}

}  // namespace ember::pipeline::detail
