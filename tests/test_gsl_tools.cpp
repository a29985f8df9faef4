// The GSL wrappers (core/gsl_tools): each search stops by the rule given at its call, errors from
// the searched function come back as C++ exceptions once GSL has returned, and refused input is an
// InputError naming what was being built.
#include <doctest/doctest.h>

#include <cmath>
#include <stdexcept>
#include <vector>

#include "ember/core/errors.hpp"
#include "ember/core/gsl_tools.hpp"

TEST_CASE("Brent's root search meets its interval tolerance") {
  // x^2 = 2 on [1, 2]: the root is sqrt(2) (exact).
  for (const double tol : {1e-4, 1e-10, 1e-14}) {
    const ember::BrentResult r = ember::brent_root([](double x) { return x * x - 2; }, 1, 2, tol);
    CHECK(r.converged);
    CHECK(r.upper - r.lower <= tol * (1 + 1e-9));
    CHECK(std::abs(r.x - std::sqrt(2.0)) <= tol);
  }
  // Too few iterations for 1e-14: not converged, and said so.
  CHECK_FALSE(ember::brent_root([](double x) { return x * x - 2; }, 1, 2, 1e-14, 2).converged);
  // No sign change: GSL's own error code, not an abort.
  CHECK(ember::brent_root([](double x) { return x * x + 1; }, 1, 2, 1e-8).status != 0);
}

TEST_CASE("Brent's minimiser finds a minimum and can stop early below a level") {
  // (x - 0.3)^2 - 1 has its minimum at x = 0.3 (exact).
  const auto f = [](double x) { return (x - 0.3) * (x - 0.3) - 1; };
  const ember::BrentResult r = ember::brent_minimum(f, 0.5, -1, 2, 1e-8);
  CHECK(r.converged);
  CHECK(std::abs(r.x - 0.3) < 1e-7);
  CHECK(r.f_minimum == doctest::Approx(-1).epsilon(1e-12));
  // Stopping once f < -0.5: the first iterate already qualifies, far from converged.
  const double level = -0.5;
  const ember::BrentResult early = ember::brent_minimum(f, 0.5, -1, 2, 1e-12, 100, &level);
  CHECK(early.f_minimum < level);
  CHECK_FALSE(early.converged);
}

TEST_CASE("an exception from the searched function reaches the caller intact") {
  int calls = 0;
  const auto f = [&](double x) {
    if (++calls == 3) throw std::runtime_error("third call");
    return x - 0.25;
  };
  CHECK_THROWS_WITH(ember::brent_root(f, 0, 1, 1e-12), "third call");
  CHECK(calls == 3);  // GSL was not driven on after the throw
  CHECK_THROWS_AS(ember::gauss_kronrod21([](double) -> double { throw ember::NumericalError("s", "d"); }, 0, 1),
                  ember::NumericalError);
}

TEST_CASE("splines and the Gauss-Kronrod rule") {
  const std::vector<double> x{0, 1, 2, 3}, y{0, 2, 4, 6};
  for (const auto kind : {ember::Spline::Kind::linear, ember::Spline::Kind::cubic, ember::Spline::Kind::steffen}) {
    const ember::Spline s(kind, x, y);
    CHECK(s.value(1.5) == doctest::Approx(3).epsilon(1e-14));  // a line is reproduced by all three
    CHECK(s.slope(2.2) == doctest::Approx(2).epsilon(1e-12));
  }
  CHECK_THROWS_AS(ember::Spline(ember::Spline::Kind::cubic, {0, 2, 1, 3}, y, "test table"), ember::InputError);
  CHECK_THROWS_WITH(ember::Spline(ember::Spline::Kind::linear, {0, 1}, y, "test table"),
                    doctest::Contains("test table"));
  // 21-point Gauss-Kronrod integrates polynomials to degree 31 exactly: x^7 on [0, 1] is 1/8.
  CHECK(ember::gauss_kronrod21([](double t) { return std::pow(t, 7); }, 0, 1) == doctest::Approx(0.125).epsilon(1e-15));
}
