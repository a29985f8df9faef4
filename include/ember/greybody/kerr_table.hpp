// The Kerr greybody table (data/kerr_greybody.tsv): Gamma_{s,l,m}(x) of a rotating hole at a grid
// of hole spins a* (the nodes), from direct solves of the Teukolsky equation (kerr_solver.hpp).
//
// Units: as kerr_mode.hpp (G = c = hbar = M = 1; x = G M omega / c^3).
//
// Lookup, per node and mode. Gamma of a boson changes sign at the superradiant threshold
// x = m Omega_H, where it vanishes like (x - m Omega_H) (kerr_solver.hpp), so the table
// interpolates the reduced transmission
//   G = Gamma x / (x - m Omega_H)  (bosons),   G = Gamma  (spin 1/2),
// which is positive and smooth through the threshold: a natural cubic spline of ln G in ln x.
// Below the first point: G = C x^p, p and C from the first interval. Each mode is tabulated from
// x_min up to its top, max(m Omega_H, 0) + 72 T_H, beyond which the thermal factor leaves less than
// e^-72 of any emission integral (tolerance::kerr_thermal_cut); lookups above the top are refused.
// The stated interpolation error is twice the largest relative deviation of G from direct solves
// at interval midpoints, measured when the table was built.
//
// Grid, per mode: starts uniform in v = ln x + x / w with w = 4 T_H: log-spaced at low x, where
// Gamma is a power law, and evenly spaced where it changes on the scale of the hole's temperature;
// then intervals are halved (in v) where a direct solve at the midpoint disagrees with the spline
// by more than 1e-4 (near the superradiant threshold of a fast-spinning hole, G rises e-fold in
// ~2 T_H, measured at a* = 0.99).
// Partial waves: l is raised until a further l (all its m) adds less than 1e-6 of the spin's
// power at that node.
// Lookups are read-only and thread-safe.
#pragma once

#include <filesystem>
#include <memory>
#include <string>
#include <vector>

#include "ember/core/estimate.hpp"
#include "ember/greybody/kerr_mode.hpp"
#include "ember/greybody/kerr_solver.hpp"
#include "ember/greybody/tolerances.hpp"

namespace ember::greybody {

struct KerrTableRow {
  double hole_spin;
  int twice_spin, twice_l, twice_m;
  double x, transmission, error;
};

struct KerrTableHeader {
  double x_min = 1e-3;
  int points_per_mode = 0;
  double interpolation_error = 0;  // stated relative error of interpolated G (and Gamma)
  double solver_tolerance = 0;     // KerrSolverOptions::ode_relative used
};

class KerrTable {
 public:
  KerrTable(KerrTableHeader header, std::vector<KerrTableRow> rows);

  // The tabulated hole spins, increasing; the first is 0.
  const std::vector<double>& hole_spins() const { return spins_; }
  // The modes of one spin tabulated at node `node` (an index into hole_spins()).
  std::vector<KerrMode> modes(std::size_t node, int twice_spin) const;
  // Gamma at a node (negative in superradiant modes); throws InputError when the mode is not
  // tabulated there or x is above its top.
  Estimate transmission(std::size_t node, const KerrMode& mode, double x) const;
  // The top of a mode's tabulated range at a node: max(m Omega_H, 0) + 72 T_H.
  double top(std::size_t node, const KerrMode& mode) const;
  // Gamma of every mode of one spin at a node, in modes() order, 0 above a mode's top: the
  // emission sums' fast path (no search per mode).
  void transmissions(std::size_t node, int twice_spin, double x, std::vector<double>& out) const;

  const KerrTableHeader& header() const { return header_; }
  const std::vector<KerrTableRow>& rows() const { return rows_; }

  struct Curve;

 private:
  KerrTableHeader header_;
  std::vector<KerrTableRow> rows_;
  std::vector<double> spins_;
  std::vector<std::shared_ptr<const Curve>> curves_;
  std::vector<std::vector<const Curve*>> by_node_spin_;  // [node * 4 + spin index]
  const Curve& find(std::size_t node, const KerrMode& mode) const;
};

// Reads a table; throws InputError naming the file, line and what was expected.
KerrTable load_kerr_table(const std::filesystem::path& file);
KerrTable parse_kerr_table(std::string_view text, const std::string& label);
KerrTable load_default_kerr_table();  // data/kerr_greybody.tsv
std::filesystem::path default_kerr_table_path();
std::string format_kerr_table(const KerrTable& table, const std::vector<std::string>& notes);

// --- building -------------------------------------------------------------------------------------
struct KerrBuildOptions {
  // The nodes. The shipped set is denser towards a* = 1, where T_H -> 0 changes the spectrum fastest.
  std::vector<double> hole_spins{0.0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.85, 0.9, 0.95, 0.975, 0.99};
  std::vector<int> twice_spins{0, 1, 2, 4};
  double x_min = 1e-3;
  // The starting grid per mode; intervals whose midpoint deviates from a direct solve by more
  // than refine_relative are split, for at most refine_passes rounds.
  int points_per_mode = 33;
  double refine_relative = tolerance::interpolation_relative;
  int refine_passes = 8;
  double power_fraction_cut = tolerance::power_fraction_cut;
  KerrSolverOptions solver;
  int threads = 1;
  bool quiet = false;

  void validate() const;  // throws InputError naming the field and the rule
};

struct KerrBuildSummary {
  long solves = 0;
  int modes = 0;
  double max_midpoint_error = 0;
  double seconds = 0;
  std::string message;
};

// Solves every row and checks the interpolation at every interval midpoint. Throws
// NumericalError when a solve does not converge.
KerrTable build_kerr_table(const KerrBuildOptions& options, KerrBuildSummary* summary = nullptr);

// The x grid of one mode at one node (see above): `points` values from x_min to the mode's top,
// none within 1e-6 of the superradiant threshold.
std::vector<double> kerr_mode_grid(const KerrHole& hole, const KerrMode& mode, double x_min, int points);
double kerr_mode_top(const KerrHole& hole, const KerrMode& mode);

}  // namespace ember::greybody
