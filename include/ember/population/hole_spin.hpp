// The spins a population's holes are born with: a distribution over a* = J c / (G M^2), the
// same at every formation mass, as weighted nodes that the counts sum over (counts.hpp).
//
// Units: a* is dimensionless.
//
// A named distribution is integrated by Gauss-Legendre quadrature (GSL glfixed) with
// `quadrature_nodes` nodes over its support; a table by the trapezoidal rule on its own rows. The
// weights are normalised to sum to 1, so a distribution need not be.
//
// The seeded rates Ember has are for non-rotating seeds. Along a spinning hole's trajectory they
// are counted only once a* has fallen to `spin_limit` (decay.hpp); there the Kerr horizon area
// 8 pi M^2 (1 + sqrt(1 - a*^2)) (G = c = 1) differs from the Schwarzschild 16 pi M^2 by
// a*^2 / 4 to leading order (derived), 0.25% at the default 0.1, well inside the spread between
// prescriptions. It is Ember's choice, not a published bound.
#pragma once

#include <string>
#include <string_view>
#include <vector>

namespace ember::population {

struct SpinNode {
  double spin = 0;    // a*
  double weight = 1;  // share of the holes (the nodes' weights sum to 1)
};

struct SpinDistribution {
  std::vector<SpinNode> nodes{SpinNode{}};  // default: every hole born without spin
  std::string description = "a* = 0 (non-rotating)";

  bool spinning() const;  // some node has a* > 0
  double median() const;  // the weighted median node's a*
  double mean() const;    // the weighted mean a*
  std::size_t median_node() const;
};

inline constexpr double spin_limit = 0.1;    // default: see the header comment
inline constexpr int quadrature_nodes = 8;   // Gauss-Legendre nodes for a named distribution
inline constexpr double gaussian_reach = 5;  // a truncated Gaussian is integrated over mean +- 5 widths

SpinDistribution fixed_spin(double spin);
// Uniform on [low, high].
SpinDistribution uniform_spin(double low, double high);
// exp(-(a - mean)^2 / (2 width^2)) truncated to [0, max_spin].
SpinDistribution gaussian_spin(double mean, double width, double max_spin);
// Rows of (a*, density) with increasing a* in [0, max_spin]; throws InputError naming the file
// and line. `label` names the file in messages.
SpinDistribution tabulated_spin(std::string_view text, const std::string& label, double max_spin);

}  // namespace ember::population
