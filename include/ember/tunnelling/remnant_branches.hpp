// The remnant branches of a back-reacted static bubble: for a seed hole of mass M_+, every
// remnant mass M_- with M_- + DeltaM(M_-) = M_+, where DeltaM(M_-) is the mass the static bubble
// around a remnant M_- carries (every solution branch for a given seed, since the lowest B need not lie on the first
// one found).
//
// Units: masses in GeV (any unit works: the search only compares masses with each other).
//
// Where M_+(M_-) = M_- + DeltaM(M_-) folds over, two branches meet; near the fold dM_+/dM_- -> 0.
// A fold needs dDeltaM/dM_- = -1, so DeltaM of order M_- somewhere: with weak back-reaction (the
// Standard Model's DeltaM / M is below 1e-9) one fixed-point step settles the only branch and no
// scan is made.
#pragma once

#include <functional>
#include <optional>
#include <vector>

namespace ember::tunnelling {

struct RemnantSearchOptions {
  // Fixed-point iteration M_- <- M_+ - DeltaM(M_-) from M_- = M_+: stop when a step is below
  // this, relative to M_+, or after fixed_point_iterations steps.
  double fixed_point_tolerance = 1e-14;
  int fixed_point_iterations = 40;
  // Scan for every branch when DeltaM / M_+ exceeds this anywhere on the fixed-point path, or
  // when the fixed point does not settle.
  double strong_back_reaction = 1e-4;
  // The scan: scan_points log-spaced remnants from M_+ 10^-scan_decades up to M_+.
  double scan_decades = 2;
  int scan_points = 13;
  // Bisect each bracketed root until hi / lo - 1 is below this.
  double root_tolerance = 1e-10;
  // A root lies near a branch point when |dM_+/dM_-| there is below this.
  double branch_point_slope = 1e-2;
  // dM_+/dM_- by a central difference with this step, relative to M_-.
  double slope_step = 1e-4;

  void validate() const;
};

struct RemnantRoot {
  double remnant_mass = 0;      // M_- (GeV)
  double mass_shift = 0;        // DeltaM(M_-) (GeV)
  std::optional<double> slope;  // dM_+/dM_- there; computed only in a scan
  bool near_branch_point = false;
};

struct RemnantSearch {
  std::vector<RemnantRoot> roots;  // in increasing M_-
  bool scanned = false;            // the branch scan ran
  int evaluations = 0;             // calls of the mass-shift function
};

// DeltaM at a remnant mass (GeV), or nullopt where no static bubble exists around it.
using MassShiftFn = std::function<std::optional<double>(double remnant)>;

RemnantSearch find_remnants(double seed, const MassShiftFn& shift, const RemnantSearchOptions& options = {});

}  // namespace ember::tunnelling
