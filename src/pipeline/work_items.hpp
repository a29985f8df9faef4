// Internal to the pipeline: the work items of the plan (plan.hpp), each a pure function of its
// index returning exact text, so threads, MPI ranks and a resumed checkpoint all assemble the same
// numbers. First one item per (Higgs point, prescription): its B(M) table. Then, per table, chunks
// of formation masses: a block of scan rows (monochromatic spectra) or of response-grid masses
// (extended spectra).
//
// Units: internal natural units (GeV), as job.hpp.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "ember/pipeline/item_records.hpp"
#include "plan.hpp"

namespace ember::pipeline::detail {

using Tables = std::vector<std::optional<tunnelling::ActionTable>>;

// The expected cost of a work item, in B(M) nodes of one probe_field static solve, for the
// progress estimate (the results never depend on it).
double expected_cost(const JobPlan& plan, const WorkItem& item);

// The tunnelling setup of a Higgs point's potential under the scenario's choices (a B(M) table's
// input), and the response context at that point (its potential sets the plasma's thermal mass).
tunnelling::TunnellingSetup setup_for(const scenario::Scenario& s, const PointModel& model);
population::ResponseContext context_for(const JobPlan& plan, const PointModel& model);

std::string table_work(const JobPlan& plan, const WorkItem& item);
std::string chunk_work(const JobPlan& plan, const Tables& tables, const WorkItem& item);
// One (Higgs point, prescription) from its table and chunks, with the central point's own counts
// and plot data.
ItemResult assemble_table(const JobPlan& plan, const WorkItem& table, const TableRecord& record,
                          const std::optional<tunnelling::ActionTable>& parsed, const std::vector<ItemResult>& chunks);

// A solver's message as one line, for the records.
std::string one_line(std::string text);

}  // namespace ember::pipeline::detail
