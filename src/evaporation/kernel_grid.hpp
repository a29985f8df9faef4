// What the Schwarzschild and Kerr mass-loss kernels share: the order of the four particle spins
// and the variable their kernels are tabulated in.
#pragma once

#include <cmath>

namespace ember::evaporation::kernel_grid {

// Twice the particle spin, in the order the kernels are stored.
inline constexpr int spin_order[] = {0, 1, 2, 4};

inline int spin_index(int twice_spin) {
  return twice_spin == 4 ? 3 : twice_spin;
}

// v = ln a below a = 1 and a - 1 above: uniform nodes in v are log-spaced where a kernel is flat
// and evenly spaced where it falls like e^{-8 pi a}; the map is C^1 at a = 1.
inline double v_of(double a) {
  return a < 1 ? std::log(a) : a - 1;
}
inline double a_of(double v) {
  return v < 0 ? std::exp(v) : v + 1;
}

}  // namespace ember::evaporation::kernel_grid
