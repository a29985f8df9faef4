// The uniform-grid spline against GSL's natural cubic spline through the same points: the same
// polynomial pieces (Press et al., Numerical Recipes 3rd ed., sec. 3.3, eq. 3.3.3, derived), so
// values and derivatives agree to rounding.
#include <doctest/doctest.h>
#include <gsl/gsl_spline.h>

#include <cmath>
#include <memory>
#include <random>
#include <vector>

#include "ember/core/errors.hpp"
#include "ember/core/uniform_cubic.hpp"

TEST_CASE("the uniform cubic is GSL's natural cubic spline, without the search") {
  const double x0 = -3, x1 = 9;
  const std::size_t n = 61;
  std::vector<double> x(n), y(n);
  for (std::size_t i = 0; i < n; ++i) {
    x[i] = x0 + (x1 - x0) * static_cast<double>(i) / static_cast<double>(n - 1);
    y[i] = std::sin(x[i]) + 0.1 * x[i] * x[i] - 3;
  }
  const ember::UniformCubic fast(x0, x1, y);
  const std::unique_ptr<gsl_spline, decltype(&gsl_spline_free)> g(gsl_spline_alloc(gsl_interp_cspline, n),
                                                                  gsl_spline_free);
  gsl_spline_init(g.get(), x.data(), y.data(), n);
  std::mt19937_64 random(7);
  std::uniform_real_distribution<double> where(x0, x1);
  for (int k = 0; k < 2000; ++k) {
    const double at = k == 0 ? x0 : k == 1 ? x1 : where(random);
    CAPTURE(at);
    const ember::UniformCubic::Point p = fast.at(at);
    CHECK(std::abs(p.value - gsl_spline_eval(g.get(), at, nullptr)) < 1e-13);
    CHECK(std::abs(fast.value(at) - p.value) < 1e-15);
    CHECK(std::abs(p.first - gsl_spline_eval_deriv(g.get(), at, nullptr)) < 1e-12);
    CHECK(std::abs(p.second - gsl_spline_eval_deriv2(g.get(), at, nullptr)) < 1e-10);
  }
  for (std::size_t i = 0; i < n; ++i) CHECK(std::abs(fast.value(x[i]) - y[i]) < 1e-14);
  CHECK_THROWS_AS(ember::UniformCubic(0, 1, {1.0, 2.0}), ember::InputError);
  CHECK_THROWS_AS(ember::UniformCubic(1, 1, {1.0, 2.0, 3.0}), ember::InputError);
}
