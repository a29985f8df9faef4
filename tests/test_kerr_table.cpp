// The Kerr greybody table: its non-rotating node against the Schwarzschild table, its stated
// interpolation error against direct solves, superradiance, the emission sums, and its file format.
#include <doctest/doctest.h>

#include <cmath>
#include <string>

#include "ember/core/errors.hpp"
#include "ember/greybody/emission.hpp"
#include "ember/greybody/kerr_emission.hpp"
#include "ember/greybody/kerr_table.hpp"
#include "ember/greybody/table.hpp"

using namespace ember::greybody;
using ember::Estimate;

namespace {

const KerrTable& shipped() {
  static const KerrTable table = load_default_kerr_table();
  return table;
}

std::size_t node_of(double a) {
  const auto& spins = shipped().hole_spins();
  for (std::size_t i = 0; i < spins.size(); ++i)
    if (spins[i] == a) return i;
  FAIL("no node at a* = " << a);
  return 0;
}

}  // namespace

TEST_CASE("the shipped Kerr table starts at a* = 0 and covers the four spins at every node") {
  const auto& spins = shipped().hole_spins();
  REQUIRE(spins.size() >= 4);
  CHECK(spins.front() == 0.0);
  CHECK(spins.back() >= 0.99);
  for (std::size_t n = 0; n < spins.size(); ++n)
    for (const int ts : {0, 1, 2, 4}) CHECK(!shipped().modes(n, ts).empty());
  CHECK(shipped().header().interpolation_error > 0);
  CHECK(shipped().header().interpolation_error < 1e-3);
}

TEST_CASE("at a* = 0 the Kerr table's modes add up to the Schwarzschild table's (2l+1) Gamma_l") {
  // Two tables built by different solvers on different grids: at a* = 0 every m of an l carries
  // the Schwarzschild Gamma_l, so sum_m must equal (2l+1) Gamma_l within both stated errors.
  const Table schwarzschild = load_default_table();
  const std::size_t n = node_of(0.0);
  for (const int ts : {0, 1, 2, 4})
    for (const double x : {0.004, 0.05, 0.2, 0.45, 0.9}) {
      for (const int tl : {ts, ts + 2}) {
        double sum = 0, error = 0;
        for (int tm = -tl; tm <= tl; tm += 2) {
          const Estimate g = shipped().transmission(n, KerrMode{ts, tl, tm}, x);
          sum += g.value;
          error += g.error;
        }
        const Estimate s = schwarzschild.transmission(ts, tl, x);
        CAPTURE(ts);
        CAPTURE(tl);
        CAPTURE(x);
        CHECK(std::abs(sum - (tl + 1) * s.value) <= error + (tl + 1) * s.error + 1e-14);
      }
    }
}

TEST_CASE("interpolated Kerr Gamma matches direct solves within the stated error, superradiant modes too") {
  // Points between grid nodes (x chosen off any grid), at slow and fast spins; the stated error
  // is twice the worst midpoint deviation found when the table was built.
  struct Case {
    double a;
    KerrMode mode;
    double x;
  };
  const double stated = shipped().header().interpolation_error;
  for (const Case c : {Case{0.5, {0, 2, 2}, 0.2137}, Case{0.5, {1, 1, -1}, 0.3713}, Case{0.9, {2, 2, 2}, 0.2911},
                       Case{0.9, {4, 4, 4}, 0.6071}, Case{0.99, {2, 2, 2}, 0.8231}, Case{0.99, {0, 4, 4}, 1.5177},
                       Case{0.99, {1, 3, 3}, 1.0473}, Case{0.7, {4, 6, -2}, 0.9377}}) {
    const std::size_t n = node_of(c.a);
    const Estimate t = shipped().transmission(n, c.mode, c.x);
    const KerrTransmission d = solve_kerr_transmission(c.mode, c.x, c.a);
    CAPTURE(describe(c.mode));
    CAPTURE(c.a);
    CAPTURE(c.x);
    CHECK(std::abs(t.value - d.gamma.value) <= stated * std::abs(d.gamma.value) + d.gamma.error);
    CHECK(std::signbit(t.value) == d.superradiant);
  }
}

TEST_CASE("Kerr emission from the table agrees with emission from direct solves") {
  // kerr_emission_per_dof with the table's Gamma and with Gamma solved at every quadrature point
  // (QAGS on either side of the threshold): the table's interpolation against none.
  const std::size_t n = node_of(0.9);
  const KerrHole hole = make_kerr_hole(0.9);
  const std::vector<KerrMode> modes{{2, 2, 2}};
  const KerrEmission table =
      kerr_emission_per_dof(hole, modes, [&](const KerrMode& m, double x) { return shipped().transmission(n, m, x); });
  const KerrEmission direct = kerr_emission_per_dof(
      hole, modes, [&](const KerrMode& m, double x) { return solve_kerr_transmission(m, x, hole.a).gamma; });
  CHECK(table.power.value == doctest::Approx(direct.power.value).epsilon(2e-4));
  CHECK(table.torque.value == doctest::Approx(direct.torque.value).epsilon(2e-4));
  // The co-rotating dipole carries angular momentum out: Z = P / Omega_H for a single m at the
  // threshold, and more generally Z / P = m <1/omega> > m / (m Omega_H + 72 T) (derived).
  CHECK(table.torque.value > 0);
}

TEST_CASE("a Kerr table built, written and read back gives the same lookups") {
  KerrBuildOptions o;
  o.hole_spins = {0.0, 0.6};
  o.twice_spins = {0};
  o.points_per_mode = 12;
  o.power_fraction_cut = 1e-3;
  o.quiet = true;
  KerrBuildSummary summary;
  const KerrTable built = build_kerr_table(o, &summary);
  CHECK(summary.solves > 0);
  CHECK(summary.max_midpoint_error <= o.refine_relative * 1.0000001);
  const KerrTable read = parse_kerr_table(format_kerr_table(built, {"a note"}), "round trip");
  CHECK(read.hole_spins() == built.hole_spins());
  CHECK(read.rows().size() == built.rows().size());
  const KerrMode mode{0, 2, 2};
  for (const double x : {0.01, 0.3, 0.8})
    CHECK(read.transmission(1, mode, x).value == doctest::Approx(built.transmission(1, mode, x).value).epsilon(1e-9));
}

TEST_CASE("bad Kerr table files are refused with the line and what was expected") {
  const std::string head =
      "# x_min: 0.001\n# points_per_mode: 9\n# solver_tolerance: 1e-11\n# interpolation_error: 2e-4\n"
      "hole_spin\tspin\tl\tm\tx\ttransmission\terror\n";
  const auto refuses = [&](const std::string& rows, const std::string& expected) {
    try {
      parse_kerr_table(head + rows, "bad.tsv");
      FAIL("accepted");
    } catch (const ember::InputError& e) {
      CAPTURE(e.what());
      CHECK(std::string(e.what()).find(expected) != std::string::npos);
    }
  };
  refuses("0\t0\t0\t0\t0.1\t0.5\n", "bad.tsv:6: 6 fields");
  refuses("0\t3\t0\t0\t0.1\t0.5\t1e-9\n", "0, 0.5, 1 or 2");
  refuses("0\t1\t1\t2\t0.1\t0.5\t1e-9\n", "m in -l");
  refuses("1.2\t0\t0\t0\t0.1\t0.5\t1e-9\n", "0 <= a* < 1");
  refuses("0.5\t0\t0\t0\t0.1\t0.5\t1e-9\n0.5\t0\t0\t0\t0.2\t0.6\t1e-9\n0.5\t0\t0\t0\t0.3\t0.7\t1e-9\n", "a* = 0 first");
  CHECK_THROWS_AS(shipped().transmission(0, KerrMode{0, 0, 0}, 50.0), ember::InputError);  // above the top
}
