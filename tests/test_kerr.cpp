// Kerr greybody factors: the non-rotating limit, an independent computation through the other
// spin weight, superradiance, and limits from the literature.
#include <doctest/doctest.h>

#include <cmath>
#include <numbers>

#include "ember/core/errors.hpp"
#include "ember/greybody/kerr_solver.hpp"
#include "ember/greybody/solver.hpp"

using namespace ember::greybody;

namespace {

KerrTransmission kerr(double s, double l, double m, double x, double a, int spin_weight = 1) {
  KerrSolverOptions o;
  o.spin_weight = spin_weight;
  return solve_kerr_transmission(make_kerr_mode(s, l, m), x, a, o);
}

}  // namespace

TEST_CASE("at a* = 0 the Teukolsky solver reproduces the Schwarzschild solver for every spin and m") {
  // Two different equations (Teukolsky for spin weight +|s| against Regge-Wheeler, Zerilli-free,
  // and the Dirac superpartner potentials), with different amplitude-to-flux factors: they must
  // give the same Gamma within the two stated errors.
  struct Case {
    double s, l, x;
  };
  for (const Case c : {Case{0, 0, 0.05}, Case{0, 2, 0.3}, Case{0.5, 0.5, 0.1}, Case{0.5, 2.5, 0.7}, Case{1, 1, 0.02},
                       Case{1, 3, 0.9}, Case{2, 2, 0.2}, Case{2, 4, 1.3}, Case{2, 2, 0.05}}) {
    const Transmission schwarzschild = solve_transmission(make_mode(c.s, c.l), c.x);
    for (double m = -c.l; m <= c.l; m += 1.0) {
      CAPTURE(c.s);
      CAPTURE(c.l);
      CAPTURE(m);
      CAPTURE(c.x);
      const KerrTransmission k = kerr(c.s, c.l, m, c.x, 0.0);
      CHECK(k.summary.status == ember::SolveStatus::converged);
      const double diff = std::abs(k.gamma.value - schwarzschild.gamma.value);
      CHECK(diff <= k.gamma.error + schwarzschild.gamma.error);
      CHECK(diff <= 1e-8 * schwarzschild.gamma.value);
    }
  }
}

TEST_CASE("spin weights +|s| and -|s| give the same Gamma on a rotating hole") {
  // The two are different equations with different horizon and far-field behaviour and
  // different flux factors (kerr_solver.hpp); their agreement checks the Teukolsky-Starobinsky
  // factors at a* != 0, where no Schwarzschild value exists. At moderate x the -|s| solve loses
  // only a few digits (its stated error says how many).
  struct Case {
    double s, l, m, x, a;
  };
  for (const Case c : {Case{0.5, 0.5, 0.5, 0.2, 0.9}, Case{0.5, 1.5, 1.5, 0.4, 0.9}, Case{0.5, 1.5, -0.5, 0.6, 0.99},
                       Case{1, 1, 1, 0.2, 0.9}, Case{1, 2, -1, 0.5, 0.7}, Case{1, 1, 1, 0.3, 0.999},
                       Case{2, 2, 2, 0.3, 0.9}, Case{2, 2, -2, 0.8, 0.7}, Case{2, 3, 1, 0.9, 0.99}}) {
    CAPTURE(c.s);
    CAPTURE(c.l);
    CAPTURE(c.m);
    CAPTURE(c.x);
    CAPTURE(c.a);
    const KerrTransmission plus = kerr(c.s, c.l, c.m, c.x, c.a, 1), minus = kerr(c.s, c.l, c.m, c.x, c.a, -1);
    const double diff = std::abs(plus.gamma.value - minus.gamma.value);
    CHECK(diff <= plus.gamma.error + minus.gamma.error);
    CHECK(diff <= 1e-6 * std::abs(plus.gamma.value));
  }
}

TEST_CASE("superradiance: bosons are amplified below m Omega_H, spin 1/2 never") {
  // Zel'dovich, JETP Lett. 14 (1971) 180; Teukolsky & Press, ApJ 193 (1974) 443; the absence for
  // fermions: Unruh, PRL 31 (1973) 1265 (all from memory).
  const double a = 0.9;
  const KerrHole h = make_kerr_hole(a);
  for (const double s : {0.0, 1.0, 2.0}) {
    const double l = std::max(1.0, s), m = l, threshold = m * h.angular_velocity;
    CAPTURE(s);
    const KerrTransmission below = kerr(s, l, m, 0.98 * threshold, a), above = kerr(s, l, m, 1.02 * threshold, a);
    CHECK(below.superradiant);
    CHECK(below.gamma.value < 0);
    CHECK(!above.superradiant);
    CHECK(above.gamma.value > 0);
    // Counter-rotating modes are never amplified.
    CHECK(kerr(s, l, -m, 0.5 * threshold, a).gamma.value > 0);
  }
  const double threshold = 1.5 * h.angular_velocity;
  for (const double f : {0.3, 0.9, 0.99}) {
    const KerrTransmission k = kerr(0.5, 1.5, 1.5, f * threshold, a);
    CHECK(k.superradiant);
    CHECK(k.gamma.value > 0);
  }
}

TEST_CASE("spin 0: Gamma + |R|^2 = 1 on a rotating hole, also where |R|^2 > 1") {
  // For s = 0 both amplitudes are fluxes (the Wronskian of R and its conjugate is conserved):
  // a check of the integration that does not use the flux factor.
  for (const double x : {0.1, 0.25, 0.6}) {
    const KerrTransmission k = kerr(0, 1, 1, x, 0.9);
    REQUIRE(k.reflection);
    CHECK(*k.flux_defect < 1e-10);
    if (k.superradiant) CHECK(*k.reflection > 1.0);
  }
}

TEST_CASE("the l = 0 scalar absorbs the horizon area at low frequency") {
  // sigma = pi Gamma_{000} / omega^2 -> A = 8 pi r_+ M (Das, Gibbons & Mathur, PRL 78 (1997) 417,
  // from memory): Gamma / (A x^2 / pi) -> 1, with a correction linear in x.
  for (const double a : {0.0, 0.5, 0.99}) {
    const KerrHole h = make_kerr_hole(a);
    double previous = 0;
    for (const double x : {1e-2, 1e-3, 1e-4}) {
      CAPTURE(a);
      CAPTURE(x);
      const double ratio = kerr(0, 0, 0, x, a).gamma.value / (h.area() / std::numbers::pi * x * x);
      CHECK(std::abs(ratio - 1) < 10 * x);
      if (previous != 0) CHECK(std::abs(ratio - 1) < 0.2 * std::abs(previous - 1));  // shrinks with x
      previous = ratio;
    }
  }
}

TEST_CASE("electromagnetic superradiance peaks near 4.4 per cent on a near-extremal hole") {
  // Largest amplification of the l = m = 1 photon mode as a* -> 1: 4.4% (Teukolsky & Press, ApJ
  // 193 (1974) 443; Brito, Cardoso & Pani, Lect. Notes Phys. 906 (2015), both from memory). At
  // a* = 0.9999 the maximum is found by golden-section search on x below m Omega_H.
  const double a = 0.9999;
  const double threshold = make_kerr_hole(a).angular_velocity;
  const auto amplification = [&](double x) { return -kerr(1, 1, 1, x, a).gamma.value; };
  double lo = 0.6 * threshold, hi = 0.99 * threshold;
  const double g = (std::sqrt(5.0) - 1) / 2;
  for (int i = 0; i < 40; ++i) {
    const double x1 = hi - g * (hi - lo), x2 = lo + g * (hi - lo);
    if (amplification(x1) > amplification(x2))
      hi = x2;
    else
      lo = x1;
  }
  const double peak = amplification(0.5 * (lo + hi));
  CHECK(peak > 0.042);
  CHECK(peak < 0.046);
}

TEST_CASE("Kerr solutions converge under refinement within their stated error") {
  KerrSolverOptions fine;
  fine.ode_relative = 1e-13;
  for (const double a : {0.5, 0.99}) {
    const KerrMode mode = make_kerr_mode(2, 2, 2);
    const KerrTransmission k = solve_kerr_transmission(mode, 0.4, a), f = solve_kerr_transmission(mode, 0.4, a, fine);
    CHECK(std::abs(k.gamma.value - f.gamma.value) <= k.gamma.error);
  }
}

TEST_CASE("bad Kerr input is rejected by name") {
  using ember::InputError;
  CHECK_THROWS_WITH_AS(make_kerr_hole(1.0), doctest::Contains("a* = 1"), InputError);
  CHECK_THROWS_WITH_AS(make_kerr_hole(-0.1), doctest::Contains("0 <= a* < 1"), InputError);
  CHECK_THROWS_WITH_AS(make_kerr_mode(1, 1, 2), doctest::Contains("m = 2"), InputError);
  CHECK_THROWS_WITH_AS(make_kerr_mode(0.5, 0.5, 0), doctest::Contains("m = 0"), InputError);
  CHECK_THROWS_AS(make_kerr_mode(1, 0, 0), InputError);
  const KerrHole h = make_kerr_hole(0.7);
  CHECK_THROWS_WITH_AS(solve_kerr_transmission(make_kerr_mode(1, 1, 1), h.angular_velocity, 0.7),
                       doctest::Contains("superradiant threshold"), InputError);
  CHECK_THROWS_WITH_AS(solve_kerr_transmission(make_kerr_mode(1, 1, 1), -0.1, 0.7), doctest::Contains("x = -0.1"),
                       InputError);
  KerrSolverOptions o;
  o.spin_weight = 0;
  CHECK_THROWS_WITH_AS(solve_kerr_transmission(make_kerr_mode(1, 1, 1), 0.2, 0.7, o), doctest::Contains("spin_weight"),
                       InputError);
}
