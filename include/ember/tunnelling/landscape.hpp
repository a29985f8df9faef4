// The shape of a potential on the true-vacuum side of the false vacuum at phi = 0 (V(0) = 0):
// where the barrier peaks, where V comes back down through zero (the escape point), and the
// true minimum beyond, if the potential has one in range.
//
// Units: phi in GeV, V in GeV^4 (any potential from the higgs module).
#pragma once

#include <optional>
#include <string>

#include "ember/higgs/potential.hpp"

namespace ember::tunnelling {

struct Landscape {
  double barrier_top = 0;              // phi of the largest V between 0 and the escape point
  double barrier_height = 0;           // V there
  double escape = 0;                   // smallest phi > barrier_top with V(phi) = 0
  std::optional<double> true_minimum;  // first minimum beyond the escape point, if in range
  double false_mass_squared = 0;       // V''(0+) estimated at the low end of the scan
};

// Scans ln phi from `from` to the potential's field_max in steps of `step`, then refines each
// point by Brent's method. Throws InputError when there is no barrier or no region below V = 0.
Landscape analyse_landscape(const higgs::Potential& potential, double from, double step = 0.01);

}  // namespace ember::tunnelling
