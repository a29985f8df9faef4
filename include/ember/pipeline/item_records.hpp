// What the main job's work items produce, as records: a B(M) table (TableRecord), and the results
// of a chunk of formation masses, or of a whole (Higgs point, prescription) once its chunks are
// assembled (ItemResult). Items are independent; they are what threads share out, what a
// checkpoint stores and what MPI ranks send to rank 0. The text form is exact (hex floats), so a
// resumed or distributed run assembles the same numbers as a serial one.
//
// Units: masses in GeV, times in GeV^-1 (as population::Response).
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "ember/population/counts.hpp"

namespace ember::pipeline {

struct ItemResult {
  std::vector<std::optional<double>> beta_max, f_max;  // per scan row; none: no constraint
  std::vector<population::Response> scan;              // central point only
  population::Counts counts;                           // central point only
  std::string table_summary;                           // central point only
  std::vector<double> plot_ratio;                      // Gamma_D / Gamma_H at the plot masses (central)
  std::vector<bool> plot_low_action;                   // B below the minimum action there
  std::optional<bool> cache_hit;                       // set when a B(M) table was needed
  std::string failure;                                 // a solver failed for the whole unit: why
  std::vector<std::string> row_failures;               // per scan row: why it failed; empty: it did not
};

std::string to_text(const ItemResult& item);
// Throws InputError naming `what` (a file, or a rank) when the text is malformed.
ItemResult item_from_text(const std::string& text, const std::string& what);

// The first stage of a unit: its B(M) table, shared by every chunk of formation masses. `table` is
// ActionTable::to_text() (exact); empty when there is no table.
struct TableRecord {
  enum class State { table, no_decay, failed } state = State::no_decay;
  std::optional<bool> cache_hit;
  std::string failure;        // why, when failed
  std::string cache_failure;  // built, but the cache could not keep it: why (empty: it could)
  std::string table;
};

std::string to_text(const TableRecord& table);
TableRecord table_from_text(const std::string& text, const std::string& what);

}  // namespace ember::pipeline
