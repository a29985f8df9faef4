// A natural cubic spline on evenly spaced nodes, evaluated without a search: the piece is one
// multiplication away. For hot loops (the potential inside the bounce shooting), where GSL's
// interpolation, with its binary search per call, dominated the run time.
//
// The pieces are those of GSL's natural cubic spline (gsl_interp_cspline) through the same
// points: GSL solves for the second derivatives at the nodes, and each piece is the cubic fixed
// by the values and second derivatives at its two ends (e.g. Press et al., Numerical Recipes,
// 3rd ed., sec. 3.3, eq. 3.3.3), stored expanded in powers of u. Values agree with GSL's to
// rounding (tests/test_core.cpp).
#pragma once

#include <algorithm>
#include <array>
#include <cmath>
#include <cstddef>
#include <vector>

namespace ember {

class UniformCubic {
 public:
  struct Point {
    double value = 0, first = 0, second = 0;  // y, dy/dx, d2y/dx2
  };

  // Nodes x0 + i (x1 - x0) / (n - 1), i = 0 .. n - 1, with n = y.size() >= 3.
  UniformCubic(double x0, double x1, const std::vector<double>& y);

  // x outside [x0, x1]: the end piece, extended. Inline: these are called in hot loops.
  double value(double x) const {
    double u = 0;
    const Piece& c = pieces_[piece(x, u)];
    return c[0] + u * (c[1] + u * (c[2] + u * c[3]));
  }
  Point at(double x) const {
    double u = 0;
    const Piece& c = pieces_[piece(x, u)];
    return {c[0] + u * (c[1] + u * (c[2] + u * c[3])), (c[1] + u * (2 * c[2] + 3 * u * c[3])) * inv_dx_,
            (2 * c[2] + 6 * u * c[3]) * inv_dx_ * inv_dx_};
  }
  double x0() const { return x0_; }
  double x1() const { return x1_; }

 private:
  // Each piece as a cubic in u = (x - x_i)/dx, u in [0, 1]: one cache line per lookup.
  using Piece = std::array<double, 4>;
  double x0_, x1_, inv_dx_ = 0, last_piece_ = 0;
  std::vector<Piece> pieces_;
  // The piece holding x, and x's place in it.
  std::size_t piece(double x, double& u) const {
    const double r = (x - x0_) * inv_dx_;
    const double k = std::clamp(std::floor(r), 0.0, last_piece_);
    u = r - k;
    return k >= 0 ? static_cast<std::size_t>(k) : 0;  // NaN: piece 0, and u stays NaN
  }
};

}  // namespace ember
