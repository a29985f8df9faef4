// B(M) tabulated once per potential and prescription, for cheap lookups along trajectories.
//
// Units: seed masses in GeV; B dimensionless.
//
// Nodes are log-spaced in the seed mass from the semiclassical floor up to where B passes
// `stop_action` (found by a coarse decade search first), at most `max_seed`. ln B is interpolated
// in ln M by GSL's Steffen spline (monotone between nodes, no overshoot). For entropy_drop the
// nodes are solved at the remnant mass M_- and placed at their seed mass M_+ = M_- + DeltaM; where
// M_+(M_-) folds over, the branches are kept apart and a lookup takes the lowest B. The stated
// interpolation error is measured against direct solves at interval midpoints, relative to
// max(B, 1): the rate goes as e^{-B}, so below B = 1 it is the absolute error that matters.
#pragma once

#include <memory>
#include <string>
#include <vector>

#include "ember/tunnelling/prescription.hpp"

namespace ember::tunnelling {

struct ActionTableOptions {
  int points = 60;                              // nodes over [floor, top]
  double stop_action = 1e4;                     // the table ends where B passes this
  double max_seed = 1e20 * units::planck_mass;  // ... or here (GeV), whichever comes first
  int midpoint_stride = 3;                      // check every this many interval midpoints against direct solves
  // Nodes and checks are solved on up to this many threads; the table does not depend on it
  // (each solve is a pure function of its mass), so it is not part of the cache key.
  int threads = 1;

  void validate() const;
};

struct ActionTableSummary {
  int nodes = 0, checks = 0;
  double interpolation_error = 0;  // largest |B_interp - B_direct| / max(B_direct, 1) at the checked midpoints
  double seconds = 0;
  std::string message;
};

class ActionTable {
 public:
  ActionTable(Prescription prescription, const TunnellingSetup& setup, const ActionTableOptions& options = {});

  // B and flags at a seed mass, interpolated; the error adds the stated interpolation error.
  ActionPoint at(double seed_mass) const;
  Prescription prescription() const { return prescription_; }
  const std::vector<ActionPoint>& nodes() const { return nodes_; }
  double floor() const { return floor_; }
  double top() const { return top_; }
  const ActionTableSummary& summary() const { return summary_; }

  // The table as text (hex floats: reading it back gives the same table bit for bit), and back.
  std::string to_text() const;
  static ActionTable from_text(const std::string& text);  // throws InputError on a malformed text

  struct Branch;

 private:
  ActionTable() = default;
  void build_branches();
  void set_message();
  Prescription prescription_;
  double floor_ = 0, top_ = 0;
  double minimum_action_ = 1;  // TunnellingSetup::minimum_action, for the flag on looked-up points
  std::vector<ActionPoint> nodes_;
  std::vector<std::shared_ptr<const Branch>> branches_;
  ActionTableSummary summary_;
  ActionPoint interpolate(double seed) const;
};

}  // namespace ember::tunnelling
