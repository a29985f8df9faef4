// The greybody table (data/greybody.tsv) and its fast interpolating lookup.
//
// Units: G = c = hbar = M = 1; x = G M omega / c^3. Rows hold Gamma_{s,l}(x) on a log-uniform x grid
// per mode, for each spin and each l up to where further l add less than 1e-6 of the power.
//
// Lookup, per mode:
//   x_min <= x <= x_end: a natural cubic spline (GSL) of L = ln(Gamma / |R|^2) in ln x, so
//     Gamma = 1 / (1 + e^-L). L is ~linear in ln x at low x (a power law) and grows smoothly where
//     the wave gets over the barrier. The stated interpolation error is twice the largest relative
//     deviation from direct solves measured at interval midpoints when the table was built.
//   x < x_min: Gamma = C x^p with p the leading low-frequency power (2l+2 bosons, 2j+1 spin 1/2)
//     and C fitted at x_min; relative error |p_local - p|, the local slope's departure from p.
//   x > x_end (where 1 - Gamma < 1e-14): Gamma = 1.
// Lookups are read-only and thread-safe.
#pragma once

#include <filesystem>
#include <memory>
#include <string>
#include <vector>

#include "ember/core/estimate.hpp"
#include "ember/greybody/mode.hpp"
#include "ember/greybody/solver.hpp"

namespace ember::greybody {

struct TableRow {
  int twice_spin, twice_l;
  double x, transmission, reflection, error;
};

struct TableHeader {
  double x_min = 1e-3, x_max = 5.0;
  int points_per_mode = 0;         // grid points over [x_min, x_max] (a mode may stop early)
  double interpolation_error = 0;  // stated relative error of interpolated values
  double solver_tolerance = 0;     // SolverOptions::ode_relative used
};

class Table {
 public:
  Table(TableHeader header, std::vector<TableRow> rows);

  // Gamma for a tabulated mode (the Regge-Wheeler or Dirac W^2 + W' potential); throws
  // InputError when the mode is not in the table.
  Estimate transmission(int twice_spin, int twice_l, double x) const;
  // sum over the tabulated l of (2l+1) Gamma_l(x); the error includes a bound on the next l.
  Estimate weighted_sum(int twice_spin, double x) const;
  // The tabulated 2l values of a spin, lowest first.
  std::vector<int> twice_ls(int twice_spin) const;

  const TableHeader& header() const { return header_; }
  const std::vector<TableRow>& rows() const { return rows_; }

  struct Curve;

 private:
  TableHeader header_;
  std::vector<TableRow> rows_;
  std::vector<std::shared_ptr<const Curve>> curves_;
  const Curve* find(int twice_spin, int twice_l) const;
};

// Reads a table; throws InputError naming the file, line and what was expected.
Table load_table(const std::filesystem::path& file);
// The same from the file's text; `label` names it in messages.
Table parse_table(std::string_view text, const std::string& label);
// The table that ships: data/greybody.tsv in the data folder.
Table load_default_table();
std::filesystem::path default_table_path();

// The table as text, in the format load_table reads; `notes` go into the header.
std::string format_table(const Table& table, const std::vector<std::string>& notes);

// --- building -------------------------------------------------------------------------------------
struct BuildOptions {
  // Grid: points_per_mode log-uniform points over [x_min, x_max].
  double x_min = 1e-3, x_max = 5.0;
  int points_per_mode = 161;
  // Partial waves are added until a further l adds less than this fraction of the power.
  double power_fraction_cut = tolerance::power_fraction_cut;
  // A mode stops once 1 - Gamma < this; Gamma = 1 beyond.
  double unit_transmission = tolerance::unit_transmission;
  SolverOptions solver;
  bool quiet = false;  // no progress bar

  void validate() const;
};

struct BuildSummary {
  long solves = 0;
  long rhs_evaluations = 0;
  int modes = 0;
  double max_midpoint_error = 0;  // largest relative interpolation error found at midpoints
  double seconds = 0;
  std::string message;
};

// Solves every row, checks interpolation at every interval midpoint, and returns the table.
// Throws NumericalError when a solve does not converge.
Table build_table(const BuildOptions& options, BuildSummary* summary = nullptr);

}  // namespace ember::greybody
