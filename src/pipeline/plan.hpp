// Internal to the pipeline: the first of its three stages. The plan holds everything the work
// items read, built once and then read-only: the scan rows, the Higgs-input points and their
// potentials, and the work items themselves. Items 0 .. tables() - 1 build the B(M) tables, one per
// (Higgs point, prescription); then come chunks of formation masses, chunks_per_table() per table.
//
// Units: internal natural units (GeV), as job.hpp.
#pragma once

#include <cstddef>
#include <memory>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "ember/pipeline/job.hpp"
#include "ember/population/counts.hpp"
#include "ember/population/mass_function.hpp"
#include "ember/tunnelling/action_table.hpp"

namespace ember::pipeline::detail {

// One Higgs-input point's potential and verdict.
struct PointModel {
  std::shared_ptr<const higgs::Running> running;
  std::unique_ptr<higgs::Potential> potential;
  const higgs::StandardModelPotential* sm = nullptr;
  std::optional<higgs::StabilityReport> stability;
  std::optional<std::string> no_decay;  // why there is no constraint at this point
  std::optional<std::string> failure;   // a solver failed building this point's potential
};

// A scan row: a formation (or characteristic) mass, and a lognormal width when widths are scanned.
struct ScanRow {
  double mass = 0;
  std::optional<double> width;
};

// Which work an item index stands for.
struct WorkItem {
  bool is_table = true;
  std::size_t table = 0;         // the B(M) table: point * prescriptions + prescription
  std::size_t point = 0;         // index into JobPlan::points
  std::size_t prescription = 0;  // index into the scenario's prescriptions
  std::size_t chunk = 0;         // chunks only: which of the table's chunks
};

struct JobPlan {
  const scenario::Scenario* scenario = nullptr;
  const JobOptions* options = nullptr;
  const cosmology::Background* background = nullptr;
  const evaporation::MassLoss* mass_loss = nullptr;
  std::unique_ptr<population::MassFunction> base;
  std::vector<ScanRow> rows;
  double scan_from = 0, scan_to = 0;  // the scan's mass range as used (GeV)
  std::vector<std::string> warnings;  // about the scan's range against the scenario's own spectrum
  std::vector<std::unique_ptr<population::MassFunction>> row_spectra;
  std::vector<double> grid;  // extended spectra: the response-grid masses
  population::ResponseContext context;
  tunnelling::ActionTableOptions table_options;
  std::vector<HiggsPoint> points;
  std::vector<PointModel> models;
  std::vector<double> plot_masses;

  std::size_t prescriptions() const { return scenario->tunnelling.prescriptions.size(); }
  std::size_t tables() const { return points.size() * prescriptions(); }
  std::size_t items() const { return tables() * (1 + chunks_per_table()); }
  bool monochromatic() const { return base->monochromatic(); }
  std::size_t chunks_per_table() const;
  std::pair<std::size_t, std::size_t> chunk_span(std::size_t chunk) const;  // [begin, end) of rows or grid
  WorkItem item(std::size_t index) const;
  std::size_t chunk_index(std::size_t table, std::size_t chunk) const {
    return tables() + table * chunks_per_table() + chunk;
  }
  tunnelling::Prescription prescription(const WorkItem& w) const {
    return scenario->tunnelling.prescriptions[w.prescription];
  }

 private:
  std::pair<std::size_t, std::size_t> chunking() const;
};

// A Higgs point's potential and verdict, under the scenario's choice of potential.
PointModel model_for(const HiggsPoint& point, const scenario::StandardModelInputs& sm);

// The plan for a scenario. `spectrum` receives the description of the spectrum as integrated.
// NumericalError only when the central point's potential fails (a band point's failure is kept
// in its model).
JobPlan make_plan(const scenario::Scenario& s, const JobOptions& o, const cosmology::Background& background,
                  const evaporation::MassLoss& mass_loss, std::string& spectrum);

}  // namespace ember::pipeline::detail
