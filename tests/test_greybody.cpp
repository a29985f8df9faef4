// Greybody factors: limits from the literature, internal consistency, and the shipped table.
#include <doctest/doctest.h>
#include <unistd.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <filesystem>
#include <fstream>

#include "ember/core/errors.hpp"
#include "ember/core/gsl_tools.hpp"
#include "ember/core/input_file.hpp"
#include "ember/core/odeint.hpp"
#include "ember/greybody/emission.hpp"
#include "ember/greybody/solver.hpp"
#include "ember/greybody/spheroidal.hpp"
#include "ember/greybody/table.hpp"
#include "ember/greybody/table_cache.hpp"
#include "support.hpp"

using namespace ember::greybody;
using ember::Estimate;
using ember::testing::close;
using ember::testing::source_dir;

namespace {
constexpr double pi = 3.141592653589793;

Mode mode_of(double spin, double l, Potential p) {
  Mode m = make_mode(spin, l);
  m.potential = p;
  return m;
}

double gamma(double spin, double l, double x) {
  return solve_transmission(make_mode(spin, l), x).gamma.value;
}

const Table& shipped() {
  static const Table table = load_table(source_dir / "data/greybody.tsv");
  return table;
}
}  // namespace

TEST_CASE("low-frequency limits") {
  const double x = 1e-5;
  // s = 0, l = 0: sigma = pi Gamma / omega^2 -> the horizon area 16 pi M^2, i.e. Gamma -> 16 x^2
  // (Das, Gibbons & Mathur, PRL 78 (1997) 417).
  CHECK(close(pi * gamma(0, 0, x) / (x * x), 16 * pi, 1e-3));
  // s = 1/2: sigma = (pi/omega^2) sum_j (2j+1) Gamma_j -> 2 pi M^2 (Doran, Lasenby, Dolan & Hinder,
  // PRD 71 (2005) 124020); the j = 1/2 wave carries it: 2 pi Gamma / x^2 -> 2 pi.
  CHECK(close(pi * 2 * gamma(0.5, 0.5, x) / (x * x), 2 * pi, 1e-3));
  // Leading powers: x^4 for s = 1, l = 1 and x^6 for s = 2, l = 2 (Page, PRD 13 (1976) 198); in
  // general x^(2l+2) for bosons and x^(2j+1) for spin 1/2 (same source).
  const auto slope = [](double s, double l) { return std::log(gamma(s, l, 2e-5) / gamma(s, l, 1e-5)) / std::log(2.0); };
  CHECK(slope(1, 1) == doctest::Approx(4).epsilon(1e-3));
  CHECK(slope(2, 2) == doctest::Approx(6).epsilon(1e-3));
  CHECK(slope(0, 2) == doctest::Approx(6).epsilon(1e-3));
  CHECK(slope(0.5, 1.5) == doctest::Approx(4).epsilon(1e-3));
}

TEST_CASE("high-frequency limit: the capture cross-section 27 pi M^2") {
  // sigma_total = sum_l (2l+1) pi Gamma_l / omega^2 -> 27 pi M^2, the geometric-optics capture
  // cross-section of the photon sphere (common practice; Misner, Thorne & Wheeler (1973), from memory).
  // The approach oscillates with an amplitude falling as 1/x; at x = 8 it is below 0.3%.
  for (const int ts : {0, 1, 2, 4}) {
    CAPTURE(ts);
    double sum = 0;
    for (Mode m = lowest_mode(ts);; m.twice_l += 2) {
      const double g = solve_transmission(m, 8.0).gamma.value;
      sum += m.degeneracy() * g;
      if (g < 1e-13) break;
    }
    CHECK(close(pi * sum / 64.0, 27 * pi, 5e-3));
  }
}

TEST_CASE("emission per degree of freedom matches Page 1976") {
  // Page, PRD 13 (1976) 198: total 2.011e-4 hbar c^6/(G^2 M^2) for four two-component neutrino
  // states, two photon and two graviton helicities, split 81% / 17% / 2%; per state:
  const Emission nu = emission_per_dof(shipped(), 1), photon = emission_per_dof(shipped(), 2),
                 graviton = emission_per_dof(shipped(), 4), scalar = emission_per_dof(shipped(), 0);
  CHECK(close(nu.power.value, 4.09e-5, 5e-3));
  CHECK(close(photon.power.value, 1.69e-5, 1e-2));
  CHECK(close(graviton.power.value, 1.9e-6, 3e-2));
  CHECK(close(4 * nu.power.value + 2 * photon.power.value + 2 * graviton.power.value, 2.011e-4, 5e-3));
  // Massless scalar: 7.44e-5 (Taylor, Chambers & Hiscock, PRD 58 (1998) 044012).
  CHECK(close(scalar.power.value, 7.44e-5, 5e-3));
  // The quoted errors are small against these tolerances.
  CHECK(nu.power.error < 1e-4 * nu.power.value);
  CHECK(photon.number.error < 1e-4 * photon.number.value);
}

TEST_CASE("flux conservation |T|^2 + |R|^2 = 1 (derived: the Wronskian is conserved)") {
  for (double s : {0.0, 0.5, 1.0, 2.0})
    for (double x : {1e-3, 0.05, 0.2, 0.4, 1.0, 3.0}) {
      const Mode m = make_mode(s, s == 0.5 ? 1.5 : std::max(s, 1.0));
      const Transmission t = solve_transmission(m, x);
      CAPTURE(t.summary.message);
      CHECK(t.flux_defect < 1e-8);
      CHECK(t.summary.status == ember::SolveStatus::converged);
    }
}

TEST_CASE("superpartner and polar potentials transmit alike (derived)") {
  for (double x : {0.01, 0.1, 0.25, 0.5, 1.0}) {
    CAPTURE(x);
    for (double j : {0.5, 1.5, 3.5}) {
      const double plus = solve_transmission(mode_of(0.5, j, Potential::dirac_plus), x).gamma.value;
      const double minus = solve_transmission(mode_of(0.5, j, Potential::dirac_minus), x).gamma.value;
      CHECK(close(plus, minus, 1e-7));
    }
    for (double l : {2.0, 3.0, 5.0}) {
      const double axial = solve_transmission(mode_of(2, l, Potential::regge_wheeler), x).gamma.value;
      const double polar = solve_transmission(mode_of(2, l, Potential::zerilli), x).gamma.value;
      CHECK(close(axial, polar, 1e-7));
    }
  }
}

TEST_CASE("solutions converge as the tolerance is refined, within their stated error") {
  for (double x : {0.002, 0.15, 0.6}) {
    const Mode m = make_mode(1, 2);
    SolverOptions loose, tight;
    loose.ode_relative = 1e-8;
    tight.ode_relative = 1e-13;
    const Transmission a = solve_transmission(m, x, loose), b = solve_transmission(m, x, {}),
                       c = solve_transmission(m, x, tight);
    CAPTURE(x);
    CHECK(std::abs(a.gamma.value - c.gamma.value) <= a.gamma.error + c.gamma.error);
    CHECK(std::abs(b.gamma.value - c.gamma.value) <= b.gamma.error + c.gamma.error);
    CHECK(std::abs(b.gamma.value - c.gamma.value) <= std::abs(a.gamma.value - c.gamma.value) + 1e-15 * c.gamma.value);
    CHECK(b.gamma.error < 1e-6 * b.gamma.value);
  }
}

TEST_CASE("solver options are validated by name") {
  SolverOptions o;
  o.ode_relative = 0.5;
  CHECK_THROWS_WITH_AS(o.validate(), doctest::Contains("ode_relative"), ember::InputError);
  CHECK_THROWS_AS(solve_transmission(make_mode(0, 0), -1.0), ember::InputError);
  CHECK_THROWS_AS(make_mode(1.5, 1.5), ember::InputError);
  CHECK_THROWS_AS(make_mode(1, 0), ember::InputError);
  CHECK_THROWS_AS(make_mode(0.5, 1), ember::InputError);
}

TEST_CASE("the shipped table interpolates direct solves to 1e-4 over 1e-3 <= x <= 5") {
  const Table& t = shipped();
  CHECK(t.header().interpolation_error < 1e-4);
  const auto& rows = t.rows();
  int checked = 0;
  for (std::size_t i = 0; i + 1 < rows.size(); i += 5) {
    if (rows[i + 1].twice_spin != rows[i].twice_spin || rows[i + 1].twice_l != rows[i].twice_l) continue;
    const double x = std::sqrt(rows[i].x * rows[i + 1].x);
    const Mode m{rows[i].twice_spin, rows[i].twice_l,
                 rows[i].twice_spin == 1 ? Potential::dirac_plus : Potential::regge_wheeler};
    const double direct = solve_transmission(m, x).gamma.value;
    const ember::Estimate looked = t.transmission(m.twice_spin, m.twice_l, x);
    CAPTURE(describe(m));
    CAPTURE(x);
    CHECK(std::abs(looked.value - direct) <= 1e-4 * direct);
    CHECK(std::abs(looked.value - direct) <= looked.error + 1e-12 * direct);
    ++checked;
  }
  CHECK(checked > 100);
  // Beyond each mode's last row Gamma = 1: check up to x = 5.
  for (const int ts : {0, 1, 2, 4})
    for (const int tl : t.twice_ls(ts)) {
      const Mode m{ts, tl, ts == 1 ? Potential::dirac_plus : Potential::regge_wheeler};
      CHECK(std::abs(t.transmission(ts, tl, 5.0).value - solve_transmission(m, 5.0).gamma.value) < 1e-4);
    }
}

TEST_CASE("below the table, the power-law tail is honest about its error") {
  for (const int ts : {0, 1, 2, 4}) {
    const Mode m = lowest_mode(ts);
    const ember::Estimate looked = shipped().transmission(ts, m.twice_l, 1e-4);
    const double direct = solve_transmission(m, 1e-4).gamma.value;
    CAPTURE(describe(m));
    CHECK(std::abs(looked.value - direct) <= looked.error);
    CHECK(std::abs(looked.value - direct) <= 1e-2 * direct);
  }
}

TEST_CASE("the table holds each spin up to where further l add under 1e-6 of the power") {
  // The build rule (greybody/table.hpp): the last tabulated l of each spin carries under 1e-6 of its power,
  // and the one before it more.
  for (const int ts : {0, 1, 2, 4}) {
    const auto ls = shipped().twice_ls(ts);
    const auto share = [&](int tl) {
      const std::function<ember::Estimate(double)> one = [&](double x) {
        return ember::Estimate{(tl + 1) * shipped().transmission(ts, tl, x).value, 0};
      };
      return thermal_moment(one, ts % 2 == 1, 1).value / emission_per_dof(shipped(), ts).power.value;
    };
    CAPTURE(ts);
    REQUIRE(ls.size() >= 2);
    CHECK(share(ls.back()) < 1e-6);
    CHECK(share(ls[ls.size() - 2]) >= 1e-6);
  }
}

TEST_CASE("malformed tables are rejected with the file and line") {
  const auto dir = source_dir / "tests/data/bad_tables";
  const std::pair<const char*, const char*> cases[] = {
      {"bad_number.tsv", ":29: field 3 is \"abc\""}, {"five_fields.tsv", ":28: 5 fields"},
      {"x_not_increasing.tsv", ":29: x 1e-3 after"}, {"bad_spin.tsv", ":28: spin 0.7"},
      {"missing_key.tsv", "interpolation_error"},    {"transmission_above_one.tsv", ":28: transmission 1.6"},
  };
  for (const auto& [file, fragment] : cases) {
    const std::string name = file;  // clang 14 cannot capture a structured binding in a lambda
    CAPTURE(name);
    CHECK_THROWS_WITH_AS(load_table(dir / file), doctest::Contains(fragment), ember::InputError);
  }
  CHECK_THROWS_WITH_AS(load_table(dir / "no-such.tsv"), doctest::Contains("no such file"), ember::InputError);
  CHECK_THROWS_WITH_AS(load_table(dir), doctest::Contains("is a directory"), ember::InputError);

  // Damage found by fuzzing the reader (tests/fuzz/): each is refused with a message, not a crash.
  const std::string good =
      ember::read_input_file(source_dir / "tests/fuzz/corpus/greybody_table/seed_small.tsv", "a table", 1 << 20);
  REQUIRE_NOTHROW(parse_table(good, "small.tsv"));
  const auto damaged = [&](const std::string& from, const std::string& to) {
    std::string t = good;
    const auto at = t.find(from);
    REQUIRE(at != std::string::npos);
    return t.replace(at, from.size(), to);
  };
  CHECK_THROWS_WITH_AS(parse_table(damaged("# points_per_mode: 161", "# points_per_mode: 1e300"), "t.tsv"),
                       doctest::Contains("points_per_mode 1e+300"), ember::InputError);
  CHECK_THROWS_WITH_AS(parse_table(damaged("0.5\t0.5\t1.000000000000e-03", "0.5\t40.5\t1.000000000000e-03"), "t.tsv"),
                       doctest::Contains("at most 30"), ember::InputError);
  CHECK_THROWS_WITH_AS(parse_table(damaged("0.5\t0.5\t1.894186557945e-03", "0\t0\t1.894186557945e-03"), "t.tsv"),
                       doctest::Contains("again"), ember::InputError);
  CHECK_THROWS_WITH_AS(parse_table(damaged("# x_max: 5", "# x_max: -5"), "t.tsv"),
                       doctest::Contains("0 < x_min < x_max"), ember::InputError);
}

TEST_CASE("cached greybody tables: a hit is bit for bit, a changed option misses, damage is rebuilt") {
  const auto dir = std::filesystem::temp_directory_path() / ("ember-greybody-cache-" + std::to_string(::getpid()));
  std::filesystem::remove_all(dir);
  BuildOptions o;
  o.points_per_mode = 12;  // a coarse grid keeps the test fast; the cache does not care
  o.quiet = true;
  const CachedGreybody first = cached_table(o, dir);
  const CachedGreybody second = cached_table(o, dir);
  CHECK_FALSE(first.hit);
  CHECK(second.hit);
  CHECK(format_table(first.table, {}) == format_table(second.table, {}));
  for (const double x : {3e-4, 0.07, 0.31, 2.2})  // identical numbers, not merely close
    CHECK(first.table.weighted_sum(1, x).value == second.table.weighted_sum(1, x).value);
  // Every option that changes the table changes the key; `quiet` does not.
  const std::string key = table_key(o);
  BuildOptions changed = o;
  changed.points_per_mode = 13;
  CHECK(table_key(changed) != key);
  changed = o;
  changed.x_min = 2e-3;
  CHECK(table_key(changed) != key);
  changed = o;
  changed.solver.ode_relative = 1e-10;
  CHECK(table_key(changed) != key);
  changed = o;
  changed.power_fraction_cut = 1e-5;
  CHECK(table_key(changed) != key);
  changed = o;
  changed.quiet = false;
  CHECK(table_key(changed) == key);
  {  // one digit of one transmission: the checksum no longer holds, so the entry is rebuilt
    std::ifstream in(dir / key);
    std::string text((std::istreambuf_iterator<char>(in)), {});
    const auto at = text.find("\n0\t0\t");
    REQUIRE(at != std::string::npos);
    text[text.find('e', at + 7) - 1] ^= 1;
    std::ofstream(dir / key) << text;
  }
  const CachedGreybody third = cached_table(o, dir);
  CHECK_FALSE(third.hit);
  CHECK(format_table(third.table, {}) == format_table(first.table, {}));
  CHECK(cached_table(o, dir).hit);
  // No directory: built, nothing stored.
  CHECK_FALSE(cached_table(o, std::nullopt).hit);
  std::filesystem::remove_all(dir);
}

// ---- Spin-weighted spheroidal separation constants (spheroidal.hpp), Teukolsky's A convention.

namespace {

SpheroidalEigenvalue spheroidal(double s, double l, double m, double c, const SpheroidalOptions& o = {}) {
  return spheroidal_eigenvalue(s, l, m, c, o);
}

// An independent solution of Teukolsky's angular equation (ApJ 185 (1973) 635, eq. 4.10; from
// memory) by shooting: integrate S'' = -cot S' - V S from each pole, starting on the regular
// Frobenius branch S ~ theta^|m + s| (1 + b theta^2), and match by the Wronskian at theta = 1.2,
// off the equator, where a solution of definite parity may have its node. The far pole is the
// same problem in pi - theta with (m, c) -> (-m, -c).
using AngularState = std::array<double, 2>;  // S, dS/dtheta

struct AngularEquation {
  double s, m, c, a;
  void operator()(const AngularState& y, AngularState& dy, double theta) const {
    const double x = std::cos(theta), sn = std::sin(theta);
    const double v = c * c * x * x - 2 * c * s * x - (m + s * x) * (m + s * x) / (sn * sn) + s + a;
    dy[0] = y[1];
    dy[1] = -x / sn * y[1] - v * y[0];
  }
};

struct PoleSolution {
  AngularState at_match;
  int nodes;
};

PoleSolution shoot_from_pole(const AngularEquation& eq, double theta_end, double ode_tolerance) {
  namespace odeint = boost::numeric::odeint;
  const double theta0 = 1e-3;  // the start's neglected term is ~ theta0^4 = 1e-12 relative
  const double alpha = std::abs(eq.m + eq.s), mu = eq.m + eq.s;
  // Series S = theta^alpha (1 + b theta^2): b (4 alpha + 4) = alpha/3 - v0, with v0 the regular part
  // of V at the pole (derived by substituting the series; (m + s cos)^2/sin^2 = mu^2/theta^2 + mu^2/3
  // - mu s + O(theta^2)).
  const double v0 = eq.c * eq.c - 2 * eq.c * eq.s - mu * mu / 3 + mu * eq.s + eq.s + eq.a;
  const double b = (alpha / 3 - v0) / (4 * alpha + 4);
  AngularState y = {1 + b * theta0 * theta0, (alpha + (alpha + 2) * b * theta0 * theta0) / theta0};
  int nodes = 0;
  double last = y[0];
  auto stepper = odeint::make_controlled<odeint::runge_kutta_fehlberg78<AngularState>>(ode_tolerance, ode_tolerance);
  odeint::integrate_adaptive(stepper, eq, y, theta0, theta_end, 1e-4, [&](const AngularState& state, double) {
    if (state[0] * last < 0) ++nodes;
    if (state[0] != 0) last = state[0];
  });
  return {y, nodes};
}

struct ShotEigenvalue {
  double a;
  int nodes;
  bool bracketed;
};

// The root of the Wronskian in [guess - 0.05, guess + 0.05]: a bracket narrow against
// the eigenvalue spacing, so a matrix eigenvalue off by more than 0.05 fails the check.
ShotEigenvalue shoot_eigenvalue(double s, double m, double c, double guess, double ode_tolerance) {
  const double theta_match = 1.2;
  const auto mismatch = [&](double a) {
    const PoleSolution north = shoot_from_pole({s, m, c, a}, theta_match, ode_tolerance);
    const PoleSolution south = shoot_from_pole({s, -m, -c, a}, pi - theta_match, ode_tolerance);
    // d/dtheta = -d/d(pi - theta) on the southern solution.
    return north.at_match[0] * -south.at_match[1] - north.at_match[1] * south.at_match[0];
  };
  const double lo = guess - 0.05, hi = guess + 0.05;
  if (mismatch(lo) * mismatch(hi) >= 0) return {guess, -1, false};
  const ember::BrentResult root = ember::brent_root(mismatch, lo, hi, 1e-13);
  const int nodes = shoot_from_pole({s, m, c, root.x}, theta_match, ode_tolerance).nodes +
                    shoot_from_pole({s, -m, -c, root.x}, pi - theta_match, ode_tolerance).nodes;
  return {root.x, nodes, root.converged};
}

// Berti, Cardoso & Casals, PRD 73 (2006) 024013, the small-c series of sA_lm to O(c^2) (from
// memory): A = l(l+1) - s(s+1) - 2 c s^2 m / (l(l+1)) + c^2 [H(l+1) - H(l) - 1],
// H(l) = 2 (l^2 - m^2)(l^2 - s^2)^2 / ((2l - 1) l^3 (2l + 1)), and H = 0 at the lowest l, where
// its numerator vanishes. (For s = 0 this is Abramowitz & Stegun 21.7.6 with c -> i c; from memory.)
double small_c_series(double s, double l, double m, double c) {
  const double lowest = std::max(std::abs(s), std::abs(m));
  const auto h = [&](double k) {
    if (k <= lowest) return 0.0;
    return 2 * (k * k - m * m) * (k * k - s * s) * (k * k - s * s) / ((2 * k - 1) * k * k * k * (2 * k + 1));
  };
  const double first = l > 0 ? -2 * c * s * s * m / (l * (l + 1)) : 0.0;
  return l * (l + 1) - s * (s + 1) + first + c * c * (h(l + 1) - h(l) - 1);
}

struct SpheroidalCase {
  double s, l, m;
};

}  // namespace

TEST_CASE("spheroidal eigenvalues at c = 0 are the spin-weighted spherical ones") {
  // sA_lm(0) = l(l+1) - s(s+1) (Teukolsky, ApJ 185 (1973) 635, below eq. 4.10; Goldberg et al.,
  // J. Math. Phys. 8 (1967) 2155; both from memory).
  for (const SpheroidalCase& k : {SpheroidalCase{0, 0, 0},
                                  {0, 3, -2},
                                  {0.5, 0.5, -0.5},
                                  {-0.5, 2.5, 1.5},
                                  {1, 1, 0},
                                  {-1, 4, 3},
                                  {2, 2, 2},
                                  {-2, 2, -1},
                                  {-2, 5, 0}}) {
    const SpheroidalEigenvalue e = spheroidal(k.s, k.l, k.m, 0.0);
    CAPTURE(k.s);
    CAPTURE(k.l);
    CAPTURE(k.m);
    CHECK(std::abs(e.separation.value - (k.l * (k.l + 1) - k.s * (k.s + 1))) <= e.separation.error + 1e-13);
    CHECK(e.separation.error < 1e-12);
  }
}

TEST_CASE("spheroidal eigenvalues follow the small-c series to O(c^3)") {
  // The series' neglected term is O(c^3) (O(c^4) for s = 0, where A is even in c). At c = 1e-2 the
  // first- and second-order terms are up to 1e-2 and 1e-4: the residual must be below 1e-6 (an
  // error of 1e-2 in the c^2 coefficient would show), and doubling c must multiply it by 8 to 16,
  // not by 4 (a wrong c^2 term) or 2 (a wrong c term).
  for (const SpheroidalCase& k : {SpheroidalCase{0, 0, 0},
                                  {0, 2, 1},
                                  {0.5, 1.5, 0.5},
                                  {-0.5, 1.5, -1.5},
                                  {1, 1, 1},
                                  {-1, 2, -1},
                                  {2, 2, 2},
                                  {-2, 2, 1},
                                  {-2, 3, -2}}) {
    CAPTURE(k.s);
    CAPTURE(k.l);
    CAPTURE(k.m);
    for (const double c : {1e-2, -1e-2}) {
      CAPTURE(c);
      const double d1 = spheroidal(k.s, k.l, k.m, c).separation.value - small_c_series(k.s, k.l, k.m, c);
      const double d2 = spheroidal(k.s, k.l, k.m, 2 * c).separation.value - small_c_series(k.s, k.l, k.m, 2 * c);
      MESSAGE("residual at c: " << d1 << ", at 2c: " << d2);
      CHECK(std::abs(d1) < 1e-6);
      CHECK(d2 / d1 > 7);
      CHECK(d2 / d1 < 17);
    }
  }
}

TEST_CASE("spheroidal eigenvalues agree with shooting on the angular equation") {
  // Independent method: the shooter above (Boost.Odeint RKF78 at 1e-12, Brent on the Wronskian at
  // theta = 1.2). Its own error, from the start's theta0^4 term and the ODE tolerance, is estimated
  // by repeating at a 100 times looser tolerance; the agreement must be within the matrix's error
  // plus that, with a floor of 1e-10 for the start. The node count checks the label:
  // l - max(|s|, |m|) zeros in (0, pi) (Sturm-Liouville oscillation theorem, common practice).
  for (const SpheroidalCase& k : {SpheroidalCase{0, 0, 0},
                                  {0, 2, 1},
                                  {0, 3, -2},
                                  {-2, 2, 1},
                                  {-2, 3, -2},
                                  {-2, 2, 2},
                                  {1, 2, -1},
                                  {-0.5, 1.5, 0.5}}) {
    for (const double c : {0.5, 2.0, -1.5}) {
      CAPTURE(k.s);
      CAPTURE(k.l);
      CAPTURE(k.m);
      CAPTURE(c);
      const SpheroidalEigenvalue e = spheroidal(k.s, k.l, k.m, c);
      const ShotEigenvalue fine = shoot_eigenvalue(k.s, k.m, c, e.separation.value, 1e-12);
      const ShotEigenvalue loose = shoot_eigenvalue(k.s, k.m, c, e.separation.value, 1e-10);
      REQUIRE(fine.bracketed);
      const double shooting_error = std::abs(fine.a - loose.a) + 1e-10;
      const double difference = std::abs(e.separation.value - fine.a);
      MESSAGE("A = " << e.separation.value << " +- " << e.separation.error << ", shooting " << fine.a
                     << " (|difference| " << difference << ", shooting error " << shooting_error << ")");
      CHECK(difference <= e.separation.error + shooting_error);
      CHECK(fine.nodes == static_cast<int>(k.l - std::max(std::abs(k.s), std::abs(k.m))));
    }
  }
}

TEST_CASE("spheroidal eigenvalues obey the symmetries of the angular equation") {
  // Derived from Teukolsky's eq. 4.10: theta -> pi - theta maps the equation for (s, m, c) onto
  // that for (s, -m, -c) with the same A, and onto that for (-s, m, c) with A + 2s (the "+ s" term
  // is the only one odd under s -> -s once cos -> -cos). The second is also Berti, Cardoso &
  // Casals, PRD 73 (2006) 024013 (from memory): -sA_lm = sA_lm + 2s.
  for (const SpheroidalCase& k : {SpheroidalCase{2, 3, 1}, {1, 2, -2}, {0.5, 2.5, -0.5}, {2, 2, 0}}) {
    for (const double c : {0.7, -2.5}) {
      CAPTURE(k.s);
      CAPTURE(k.l);
      CAPTURE(k.m);
      CAPTURE(c);
      const Estimate a = spheroidal(k.s, k.l, k.m, c).separation;
      const Estimate mirrored = spheroidal(k.s, k.l, -k.m, -c).separation;
      const Estimate flipped = spheroidal(-k.s, k.l, k.m, c).separation;
      const Estimate both = spheroidal(-k.s, k.l, -k.m, -c).separation;
      CHECK(std::abs(a.value - mirrored.value) <= a.error + mirrored.error);
      CHECK(std::abs(a.value + 2 * k.s - flipped.value) <= a.error + flipped.error);
      CHECK(std::abs(a.value + 2 * k.s - both.value) <= a.error + both.error);
      // And the symmetry is not trivial: changing the sign of c alone moves A at first order in c
      // when s m != 0 (the -2 c s^2 m / (l(l+1)) term).
      if (k.s * k.m != 0) CHECK(std::abs(a.value - spheroidal(k.s, k.l, k.m, -c).separation.value) > 1e-3);
    }
  }
}

TEST_CASE("the spheroidal error bounds the difference to a much larger basis") {
  // Small first bases and steps, so that at the looser tolerances the truncation, not rounding,
  // decides the error; the reference is 100 terms larger and carries its own rounding floor.
  SpheroidalOptions big;
  big.initial_terms = 100;
  for (const double change : {5e-4, 1e-5, 1e-7, 1e-12}) {
    SpheroidalOptions o;
    o.change = change;
    o.initial_terms = 1;
    o.step_terms = 2;
    for (const SpheroidalCase& k : {SpheroidalCase{0, 0, 0}, {-2, 2, 2}, {-2, 4, -1}, {0.5, 3.5, 0.5}}) {
      for (const double c : {0.3, 1.0, -3.0, 8.0, -20.0}) {
        CAPTURE(change);
        CAPTURE(k.s);
        CAPTURE(k.l);
        CAPTURE(k.m);
        CAPTURE(c);
        const SpheroidalEigenvalue e = spheroidal(k.s, k.l, k.m, c, o);
        const SpheroidalEigenvalue r = spheroidal(k.s, k.l, k.m, c, big);
        const double reference = r.separation.value;
        MESSAGE("error " << e.separation.error << " vs |difference| " << std::abs(e.separation.value - reference)
                         << " with " << e.summary.terms << " terms (reference rounding " << r.summary.rounding << ")");
        CHECK(std::abs(e.separation.value - reference) <= e.separation.error + r.summary.rounding);
        // Each basis is a leading block of the next, so by Cauchy interlacing the truncated
        // eigenvalue can only fall as terms are added (common practice): it lies above the limit.
        CHECK(e.separation.value >= reference - e.summary.rounding - r.summary.rounding);
        CHECK(e.separation.error <= 10 * change * std::max(1.0, std::abs(e.separation.value)) + e.summary.rounding);
      }
    }
  }
}

TEST_CASE("the radial equation's constant is A + c^2 - 2 m c") {
  // At c = 0: lambda = (l - s)(l + s + 1), the Schwarzschild value of the Teukolsky radial
  // equation (Teukolsky & Press, ApJ 193 (1974) 443; from memory).
  CHECK(radial_separation_constant(spheroidal(-2, 3, 1, 0.0).separation, 1, 0.0).value ==
        doctest::Approx((3 + 2) * (3 - 2 + 1)));
  const Estimate a = spheroidal(-1, 2, 1, 0.8).separation;
  const Estimate lambda = radial_separation_constant(a, 1, 0.8);
  CHECK(lambda.value == doctest::Approx(a.value + 0.64 - 1.6).epsilon(1e-14));
  CHECK(lambda.error == a.error);
}

TEST_CASE("bad spheroidal arguments are rejected by name") {
  using ember::InputError;
  CHECK_THROWS_WITH_AS(spheroidal(2, 1, 0, 0.1), doctest::Contains("l = 1: must be at least |s| = 2"), InputError);
  CHECK_THROWS_WITH_AS(spheroidal(0, -1, 0, 0.1), doctest::Contains("l = -1: must be at least |s| = 0"), InputError);
  CHECK_THROWS_WITH_AS(spheroidal(0, 2, 3, 0.1), doctest::Contains("m = 3: |m| must not exceed l = 2"), InputError);
  CHECK_THROWS_WITH_AS(spheroidal(0.5, 1, 0.5, 0.1), doctest::Contains("l = 1: l - s must be a whole number"),
                       InputError);
  CHECK_THROWS_WITH_AS(spheroidal(1, 2, 0.5, 0.1), doctest::Contains("m = 0.5: m - s must be a whole number"),
                       InputError);
  CHECK_THROWS_WITH_AS(spheroidal(0, 2.3, 0, 0.1), doctest::Contains("l = 2.3: must be a whole or half-whole"),
                       InputError);
  CHECK_THROWS_WITH_AS(spheroidal(3, 3, 0, 0.1), doctest::Contains("s = 3: spin weight"), InputError);
  CHECK_THROWS_WITH_AS(spheroidal(0, 1, 0, std::nan("")), doctest::Contains("c = nan: must be finite"), InputError);
  SpheroidalOptions o;
  o.change = 0;
  CHECK_THROWS_WITH_AS(spheroidal(0, 1, 0, 0.1, o), doctest::Contains("change = 0"), InputError);
  o = SpheroidalOptions{};
  o.step_terms = 3;
  CHECK_THROWS_WITH_AS(spheroidal(0, 1, 0, 0.1, o), doctest::Contains("step_terms = 3: must be even"), InputError);
  o = SpheroidalOptions{};
  o.max_terms = 20;
  CHECK_THROWS_WITH_AS(spheroidal(0, 1, 0, 50.0, o), doctest::Contains("max_terms = 20"), ember::NumericalError);
}
