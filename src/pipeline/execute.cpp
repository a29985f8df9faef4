#include "execute.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "ember/core/errors.hpp"
#include "ember/core/progress.hpp"
#include "ember/pipeline/checkpoint.hpp"

namespace ember::pipeline::detail {

namespace {

// Whether a checkpointed record parses: a damaged one is computed again.
bool readable(const JobPlan& plan, std::size_t i, const std::string& text) {
  try {
    const std::string what = fmt::format("checkpoint item {}", i);
    if (plan.item(i).is_table)
      (void)table_from_text(text, what);
    else
      (void)item_from_text(text, what);
    return true;
  } catch (const InputError&) {
    return false;
  }
}

// The items an earlier run of this job did not finish; the others' records go into `texts`.
std::vector<std::size_t> unfinished(const JobPlan& plan, const std::optional<Checkpoint>& checkpoint,
                                    std::vector<std::string>& texts, int& resumed) {
  std::vector<std::size_t> pending;
  for (std::size_t i = 0; i < plan.items(); ++i) {
    if (checkpoint)
      if (const auto text = checkpoint->load(i); text && readable(plan, i, *text)) {
        texts[i] = *text;
        ++resumed;
        continue;
      }
    pending.push_back(i);
  }
  return pending;
}

// Every table's record and table, from the texts every process now holds.
void read_tables(const JobPlan& plan, const std::vector<std::string>& table_texts, Executed& out) {
  out.records.resize(plan.tables());
  out.tables.resize(plan.tables());
  for (std::size_t t = 0; t < plan.tables(); ++t) {
    out.records[t] = table_from_text(table_texts[t], fmt::format("table {}", t));
    if (out.records[t].state == TableRecord::State::table)
      out.tables[t] = tunnelling::ActionTable::from_text(out.records[t].table);
  }
}

}  // namespace

Executed execute(JobPlan& plan) {
  const JobOptions& o = *plan.options;
  const ThreadExecutor local(o.threads);
  const Executor& executor = o.executor ? *o.executor : local;
  std::optional<Checkpoint> checkpoint;
  if (o.checkpoint && executor.assembles()) checkpoint.emplace(*o.checkpoint);
  Executed out;
  out.texts.resize(plan.items());
  const std::vector<std::size_t> pending = unfinished(plan, checkpoint, out.texts, out.resumed);
  const auto split =
      std::partition_point(pending.begin(), pending.end(), [&](std::size_t i) { return plan.item(i).is_table; });
  out.computed_tables.assign(pending.begin(), split);
  const std::vector<std::size_t> pending_chunks(split, pending.end());
  // Fewer tables than threads (a single-point run): the spare threads solve each table's nodes.
  plan.table_options.threads =
      std::max(1, o.threads / static_cast<int>(std::max<std::size_t>(1, out.computed_tables.size())));

  // Progress by expected cost (work_items.hpp): a B(M) table outweighs a chunk of masses.
  double total = 0, done = 0;
  for (const std::size_t i : pending) total += expected_cost(plan, plan.item(i));
  Progress progress("ember run", total, o.quiet || !executor.assembles());
  std::size_t tables_done = 0, chunks_done = 0;
  const auto finished = [&](std::size_t i, const std::string& text) {
    out.texts[i] = text;
    if (checkpoint) checkpoint->save(i, text);
    const WorkItem w = plan.item(i);
    done += expected_cost(plan, w);
    ++(w.is_table ? tables_done : chunks_done);
    progress.advance(done, fmt::format("{}: tables {}/{}, chunks {}/{}", name_of(plan.prescription(w)), tables_done,
                                       out.computed_tables.size(), chunks_done, pending_chunks.size()));
  };
  executor.run(
      out.computed_tables, [&](std::size_t i) { return table_work(plan, plan.item(i)); }, finished);
  // Every process needs every table for the chunks (MPI: rank 0 sends them).
  read_tables(plan,
              executor.share(std::vector<std::string>(out.texts.begin(),
                                                      out.texts.begin() + static_cast<std::ptrdiff_t>(plan.tables()))),
              out);
  executor.run(
      pending_chunks, [&](std::size_t i) { return chunk_work(plan, out.tables, plan.item(i)); }, finished);
  progress.finish();
  if (checkpoint) out.checkpoint_warning = checkpoint->failure();
  out.assembles = executor.assembles();
  return out;
}

}  // namespace ember::pipeline::detail
