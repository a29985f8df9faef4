// Spinning populations: the spin distributions, the Kerr clock with its Schwarzschild handover,
// and the seeded decay of a spinning hole with its spin gate.
#include <doctest/doctest.h>

#include <cmath>

#include "ember/core/errors.hpp"
#include "ember/evaporation/spinning_clock.hpp"
#include "ember/population/counts.hpp"
#include "ember/units/constants.hpp"
#include "support.hpp"

using namespace ember;
namespace u = ember::units;
using ember::testing::close;
using ember::testing::source_dir;
using ember::testing::standard_model;

namespace {
const cosmology::Background& background() {
  return ember::testing::planck_background();
}
const evaporation::MassLoss& mass_loss() {
  return ember::testing::shipped_mass_loss();
}
const evaporation::KerrMassLoss& kerr() {
  static const evaporation::KerrMassLoss ml(greybody::load_kerr_table(source_dir / "data/kerr_greybody.tsv"),
                                            evaporation::load_particles(source_dir / "data/particles.yaml"));
  return ml;
}
const tunnelling::ActionTable& probe_table() {
  return ember::testing::coarse_probe_table();
}
population::ResponseContext context(double spin) {
  population::ResponseContext c;
  c.background = &background();
  c.mass_loss = &mass_loss();
  c.decay.grid_points = 500;
  c.hole_spin = population::fixed_spin(spin);
  c.spinning.kerr = &kerr();
  c.spinning.schwarzschild = &mass_loss();
  return c;
}
double gram(double g) {
  return g * u::gram;
}
}  // namespace

TEST_CASE("spin distributions: quadrature nodes, weights and bad tables") {
  // Gauss-Legendre is exact for polynomials of degree < 2n (derived): the mean of a uniform
  // distribution is its midpoint, of a symmetric truncated Gaussian its centre.
  const auto uniform = population::uniform_spin(0.2, 0.6);
  CHECK(uniform.nodes.size() == population::quadrature_nodes);
  CHECK(uniform.mean() == doctest::Approx(0.4).epsilon(1e-13));
  double total = 0;
  for (const auto& n : uniform.nodes) {
    CHECK(n.spin > 0.2);
    CHECK(n.spin < 0.6);
    total += n.weight;
  }
  CHECK(total == doctest::Approx(1.0).epsilon(1e-14));
  CHECK(population::gaussian_spin(0.5, 0.05, 0.99).mean() == doctest::Approx(0.5).epsilon(1e-12));
  // Truncated at a* = 0 the Gaussian's mean moves up (derived: the half-normal mean is
  // sqrt(2/pi) width for mean 0).
  CHECK(population::gaussian_spin(0.0, 0.1, 0.99).mean() == doctest::Approx(0.1 * std::sqrt(2 / u::pi)).epsilon(2e-3));
  CHECK_FALSE(population::fixed_spin(0).spinning());
  CHECK(population::fixed_spin(0.3).spinning());
  // A table: trapezoidal weights on its own rows (derived: 0.25, 0.5, 0.25 for equal densities).
  const auto table = population::tabulated_spin("# a*, density\n0.1 1\n0.3 1\n0.5 1\n", "spins.tsv", 0.99);
  REQUIRE(table.nodes.size() == 3);
  CHECK(table.nodes[0].weight == doctest::Approx(0.25));
  CHECK(table.nodes[1].weight == doctest::Approx(0.5));
  CHECK(table.median() == doctest::Approx(0.3));
  CHECK_THROWS_WITH_AS(population::tabulated_spin("0.1 1\n0.995 1\n", "spins.tsv", 0.99),
                       doctest::Contains("spins.tsv:2"), InputError);
  CHECK_THROWS_WITH_AS(population::tabulated_spin("0.3 1\n0.2 1\n", "spins.tsv", 0.99),
                       doctest::Contains("expected increasing a*"), InputError);
  CHECK_THROWS_WITH_AS(population::tabulated_spin("0.1 0\n0.2 0\n", "spins.tsv", 0.99),
                       doctest::Contains("positive total"), InputError);
}

TEST_CASE("the spinning clock: Kerr until the spin is gone, then Schwarzschild") {
  const double m0 = gram(1e12);
  const evaporation::SpinningClock clock(kerr(), mass_loss(), m0, 0.9);
  REQUIRE(clock.handover_mass());
  // The handover does not move the lifetime: the Kerr trajectory run to the cutoff agrees (its
  // rates at a* <= 1e-4 are Schwarzschild's to a*^2; kerr_mass_loss.hpp states 2e-4 at a* = 0).
  const evaporation::KerrTrajectory whole(kerr(), m0, 0.9);
  CHECK(close(clock.lifetime(), whole.lifetime(), 2e-4));
  // age + time left = lifetime, and the mass comes back from the time left, on both sides of the
  // handover (derived).
  for (const double m : {0.95 * m0, 0.6 * m0, 1e-3 * m0, 1e-9 * m0}) {
    CAPTURE(m / m0);
    CHECK(close(clock.age_at(m) + clock.time_left(m), clock.lifetime(), 1e-9));
    CHECK(close(clock.mass_at_time_left(clock.time_left(m)), m, 1e-7));
    // From the age only while the time left is not lost to rounding against the lifetime.
    if (m > 1e-3 * m0) CHECK(close(clock.mass_at_age(clock.age_at(m)), m, 1e-7));
  }
  // The spin falls through the spin limit before most of the mass is gone (Page, PRD 14 (1976)
  // 3260, abstract: the spin is shed first), and the clock's Gamma_H is the Kerr rate there.
  const double gate = clock.mass_at_spin(population::spin_limit);
  CHECK(gate > 0.5 * m0);
  CHECK(gate < m0);
  CHECK(clock.spin_at(gate) == doctest::Approx(population::spin_limit).epsilon(1e-6));
  CHECK(close(clock.evaporation_rate(gate), kerr().alpha(gate, population::spin_limit) / std::pow(gate, 3), 1e-6));
  // The mass that ends today at a* = 0.9: the Kerr trajectory run to the cutoff gives it the same
  // lifetime (2e-4, as above), and it lies above the non-rotating survivor mass (Page 1976: spin
  // shortens the life).
  const double today = 13.787e9 * u::year;
  const double ending = evaporation::spinning_mass_with_lifetime(kerr(), mass_loss(), 0.9, today);
  CHECK(close(evaporation::KerrTrajectory(kerr(), ending, 0.9).lifetime(), today, 2e-4));
  CHECK(ending > 1.1 * evaporation::mass_with_lifetime(mass_loss(), today));
  // a* -> 0: the Schwarzschild lifetime, to the Kerr table's a* = 0 node (within 2e-4 of the
  // Schwarzschild table: test_kerr_evaporation.cpp).
  const evaporation::SpinningClock slow(kerr(), mass_loss(), m0, 1e-3);
  CHECK(close(slow.lifetime(), evaporation::Trajectory(mass_loss(), m0).lifetime(), 2e-4));
}

TEST_CASE("seeded decay of spinning holes: the hazard integrals agree and the gate holds") {
  for (const double m : {1.0, 1e3, 1e9}) {
    for (const double a : {0.05, 0.5, 0.9}) {
      CAPTURE(m);
      CAPTURE(a);
      const auto c = context(a);
      const population::Response r = population::response_at(gram(m), probe_table(), c);
      REQUIRE(r.decay.evaporated);
      CHECK(r.decay.probability == doctest::Approx(1.0));
      // int Gamma_D dt against int (Gamma_D / Gamma_H) d ln M over the gated masses (derived).
      CHECK(close(r.decay.hazard_in_time, r.decay.hazard, 1e-5));
      const evaporation::SpinningClock clock(kerr(), mass_loss(), gram(m), a);
      CHECK(close(r.decay.lifetime, clock.lifetime(), 1e-12));
      // Nothing decays before the spin has fallen to the limit.
      if (a > population::spin_limit) {
        CHECK(r.decay.gate_mass < gram(m));
        CHECK(r.decay.decay_time >= r.formation.time + clock.age_at(r.decay.gate_mass) * (1 - 1e-9));
      } else {
        CHECK(r.decay.gate_mass == gram(m));
      }
      // A 1 g hole outruns evaporation from formation (test_population.cpp): at a* above the
      // limit that crossover is flagged, and all its N comes from such points. At 1e3 g and up the
      // crossover is near 30 g, long after the spin has gone.
      const bool flagged = m == 1.0 && a > population::spin_limit;
      CHECK(r.decay.spinning_crossover == flagged);
      CHECK(r.lightcone_per_beta_spinning == (flagged ? r.lightcone_per_beta : 0.0));
    }
  }
}

TEST_CASE("spinning populations: the a* -> 0 limit and the survival mass") {
  // a* -> 0: the non-rotating counts (derived: the rates are even in a*, so 1e-3 moves them by
  // ~1e-6; the Kerr table's a* = 0 node is within 2e-4 of the Schwarzschild table).
  for (const double m : {1e3, 1e14}) {
    CAPTURE(m);
    const auto still = population::response_at(gram(m), probe_table(), context(0));
    const auto slow = population::response_at(gram(m), probe_table(), context(1e-3));
    CHECK(close(slow.lightcone_per_beta, still.lightcone_per_beta, 2e-4));
    CHECK(close(slow.decay.lifetime, still.decay.lifetime, 2e-4));
  }
  // A 6.2e14 g hole born at a* = 0.9 ends its life before today, one born still does not (the
  // survival mass is 5.3e14 g without spin, 6.4e14 g at a* = 0.9: `ember evaporate --lifetime
  // "13.787 Gyr"`; Page, PRD 14 (1976) 3260: a spinning hole's lifetime is shorter).
  const auto still = population::response_at(gram(6.2e14), probe_table(), context(0));
  const auto fast = population::response_at(gram(6.2e14), probe_table(), context(0.9));
  CHECK_FALSE(still.decay.evaporated);
  CHECK(still.lightcone_per_beta == 0.0);
  CHECK(fast.decay.evaporated);
  CHECK(fast.decay.probability == doctest::Approx(1.0));
  CHECK(fast.lightcone_per_beta > 0.0);
  // Two spins half and half: the counts are the weighted sum of the two populations' (counts.hpp).
  auto mixed = context(0);
  mixed.hole_spin = population::tabulated_spin("0 1\n0.9 1\n", "two spins", 0.99);
  const auto both = population::response_at(gram(6.2e14), probe_table(), mixed);
  CHECK(close(both.lightcone_per_beta, 0.5 * (still.lightcone_per_beta + fast.lightcone_per_beta), 1e-12));
  CHECK(both.decay.probability == doctest::Approx(0.5 * fast.decay.probability));
}
