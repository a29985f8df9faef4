// Every tolerance and grid density of the evaporation module, in one place, with its rule.
#pragma once

namespace ember::evaporation::tolerance {

// Emission kernels J_s(a) = (1/2pi) int_a^inf x S_s(x) / (e^{8 pi x} -+ 1) dx: nodes this far apart
// in v = ln a (a < 1), a - 1 (a >= 1); each interval integrated by 21-point Gauss-Kronrod.
inline constexpr double kernel_node_spacing = 0.02;
inline constexpr double kernel_a_min = 1e-7;  // below: J(a) = J(a_min) (differs by O(a^3))
inline constexpr double kernel_a_max = 27.0;  // above: J(a) = 0 (J < e^{-8 pi a} ~ 1e-295)

// Momentum option: each window integral by GSL QAG to this relative accuracy.
inline constexpr double window_quadrature_relative = 1e-9;

// Mass-loss table: nodes per decade of mass, over [table_min_gram, table_max_gram]; beyond the
// ends alpha is constant (every species massless below, only massless ones emitted above).
inline constexpr int mass_nodes_per_decade = 40;
inline constexpr double table_min_gram = 1e-6;
inline constexpr double table_max_gram = 1e41;

// Trajectories: ln(time remaining) against ln M by Dormand-Prince 5(4) with dense output; a
// step is accepted when its error is below this relative (and absolute, in ln tau) bound.
inline constexpr double trajectory_relative = 1e-11;

}  // namespace ember::evaporation::tolerance
