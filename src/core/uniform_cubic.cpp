#include "ember/core/uniform_cubic.hpp"

#include <gsl/gsl_spline.h>

#include <memory>

#include "ember/core/errors.hpp"

namespace ember {

UniformCubic::UniformCubic(double x0, double x1, const std::vector<double>& y) : x0_(x0), x1_(x1) {
  const std::size_t n = y.size();
  if (n < 3 || !(x1 > x0)) throw InputError("uniform cubic spline: expected at least 3 nodes over x0 < x1");
  const double dx = (x1 - x0) / static_cast<double>(n - 1);
  inv_dx_ = 1 / dx;
  last_piece_ = static_cast<double>(n - 2);
  std::vector<double> x(n), y2(n, 0.0);
  for (std::size_t i = 0; i < n; ++i) x[i] = x0 + (x1 - x0) * static_cast<double>(i) / static_cast<double>(n - 1);
  // GSL solves the natural spline's tridiagonal system; its second derivatives at the nodes are
  // all the pieces need (zero at both ends: a natural spline).
  const std::unique_ptr<gsl_spline, decltype(&gsl_spline_free)> s(gsl_spline_alloc(gsl_interp_cspline, n),
                                                                  gsl_spline_free);
  gsl_spline_init(s.get(), x.data(), y.data(), n);
  for (std::size_t i = 1; i + 1 < n; ++i) y2[i] = gsl_spline_eval_deriv2(s.get(), x[i], nullptr);
  // y(u) = (1-u) y_i + u y_{i+1} + [((1-u)^3 - (1-u)) y2_i + (u^3 - u) y2_{i+1}] dx^2/6, expanded in u.
  const double h = dx * dx / 6;
  pieces_.resize(n - 1);
  for (std::size_t i = 0; i + 1 < n; ++i)
    pieces_[i] = {y[i], y[i + 1] - y[i] - h * (2 * y2[i] + y2[i + 1]), 3 * h * y2[i], h * (y2[i + 1] - y2[i])};
}

}  // namespace ember
