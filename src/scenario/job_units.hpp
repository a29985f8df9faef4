// Internal to the scenario module: the main job's work, in two stages. First one item per
// (Higgs point, prescription): its B(M) table. Then, per table, chunks of formation masses: a block
// of scan rows (monochromatic spectra) or of response-grid masses (extended spectra). Every item
// is a pure function of its index returning exact text, so threads, MPI ranks and a resumed
// checkpoint all assemble the same numbers.
//
// Units: internal natural units (GeV), as job.hpp.
#pragma once

#include <memory>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "ember/population/counts.hpp"
#include "ember/scenario/job.hpp"
#include "ember/scenario/unit_result.hpp"
#include "ember/tunnelling/action_table.hpp"

namespace ember::scenario::detail {

struct PointModel {
  std::shared_ptr<const higgs::Running> running;
  std::unique_ptr<higgs::Potential> potential;
  const higgs::StandardModelPotential* sm = nullptr;
  std::optional<higgs::StabilityReport> stability;
  std::optional<std::string> no_decay;  // why there is no constraint at this point
  std::optional<std::string> failure;   // a solver failed building this point's potential
};

// Everything the work items read; built once by run_job, then read-only.
struct JobPlan {
  const Scenario* scenario = nullptr;
  const JobOptions* options = nullptr;
  const cosmology::Background* background = nullptr;
  const evaporation::MassLoss* mass_loss = nullptr;
  std::unique_ptr<population::MassFunction> base;
  std::vector<std::pair<double, std::optional<double>>> rows;  // (mass, width) per scan row
  std::vector<std::unique_ptr<population::MassFunction>> row_spectra;
  std::vector<double> grid;  // extended spectra: the response-grid masses
  population::ResponseContext context;
  tunnelling::ActionTableOptions table_options;
  std::vector<HiggsPoint> points;
  std::vector<PointModel> models;
  std::vector<double> plot_masses;

  std::size_t prescriptions() const { return scenario->tunnelling.prescriptions.size(); }
  std::size_t tables() const { return points.size() * prescriptions(); }
  bool monochromatic() const { return base->monochromatic(); }
  std::size_t chunks_per_table() const;
  std::pair<std::size_t, std::size_t> chunk_span(std::size_t chunk) const;  // [begin, end) of rows or grid

 private:
  std::pair<std::size_t, std::size_t> chunking() const;
};

using Tables = std::vector<std::optional<tunnelling::ActionTable>>;

// The expected cost of a work item, in B(M) nodes of one probe_field static solve, for the
// progress estimate (the results never depend on it).
double expected_table_cost(const JobPlan& plan, std::size_t table);
double expected_chunk_cost(const JobPlan& plan, std::size_t chunk_index);

std::string table_work(const JobPlan& plan, std::size_t table);
// Item `chunk_index` = table * chunks_per_table() + chunk.
std::string chunk_work(const JobPlan& plan, const Tables& tables, std::size_t chunk_index);
// The unit of one table from its chunks, with the central point's counts and plot data.
UnitResult assemble_unit(const JobPlan& plan, std::size_t table, const TableResult& record,
                         const std::optional<tunnelling::ActionTable>& parsed, const std::vector<UnitResult>& chunks);

// A solver's message as one line, for the unit records.
std::string one_line(std::string text);

}  // namespace ember::scenario::detail
