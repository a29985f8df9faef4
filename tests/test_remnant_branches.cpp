// The remnant-branch search on mass-shift functions whose branches are known in closed form
// (derived below), so that several branches, folds and the absence of any branch are all reached.
#include <doctest/doctest.h>

#include <cmath>

#include "ember/core/errors.hpp"
#include "ember/tunnelling/remnant_branches.hpp"
#include "support.hpp"

using namespace ember::tunnelling;
using ember::testing::close;

namespace {
// M_+(m) = c + 4 (m - 1/2)^2 for a seed of 1: the branches are m = 1/2 -+ sqrt((1 - c)/4) and
// dM_+/dM_- = 8 (m - 1/2) there (derived).
MassShiftFn folded(double c) {
  return [c](double m) -> std::optional<double> { return c + 4 * (m - 0.5) * (m - 0.5) - m; };
}
}  // namespace

TEST_CASE("remnant branches: two branches of a folded M_+(M_-) are both found") {
  const RemnantSearch r = find_remnants(1.0, folded(0.8));
  REQUIRE(r.roots.size() == 2);
  CHECK(r.scanned);
  const double h = std::sqrt(0.05);
  CHECK(close(r.roots[0].remnant_mass, 0.5 - h, 1e-9));
  CHECK(close(r.roots[1].remnant_mass, 0.5 + h, 1e-9));
  REQUIRE(r.roots[0].slope);
  CHECK(close(*r.roots[0].slope, -8 * h, 1e-6));
  CHECK(close(*r.roots[1].slope, 8 * h, 1e-6));
  CHECK_FALSE(r.roots[0].near_branch_point);
  CHECK(close(r.roots[1].mass_shift, 1 - (0.5 + h), 1e-8));
}

TEST_CASE("remnant branches: just above a fold, both branches fall between scan points and are flagged") {
  // Seed 1 with c = 1 - 4e-6: branches at 1/2 -+ 1e-3, slopes -+ 8e-3, inside one scan interval.
  const RemnantSearch r = find_remnants(1.0, folded(1 - 4e-6));
  REQUIRE(r.roots.size() == 2);
  CHECK(close(r.roots[0].remnant_mass, 0.499, 1e-7));
  CHECK(close(r.roots[1].remnant_mass, 0.501, 1e-7));
  CHECK(r.roots[0].near_branch_point);
  CHECK(r.roots[1].near_branch_point);
  // Just below the fold there is no branch at all.
  CHECK(find_remnants(1.0, folded(1 + 4e-6)).roots.empty());
}

TEST_CASE("remnant branches: weak back-reaction settles by fixed point without a scan") {
  // DeltaM = 1e-12 M_-: the one branch is M_- = M_+ / (1 + 1e-12) (derived).
  const MassShiftFn weak = [](double m) -> std::optional<double> { return 1e-12 * m; };
  const RemnantSearch r = find_remnants(7.0, weak);
  REQUIRE(r.roots.size() == 1);
  CHECK_FALSE(r.scanned);
  CHECK(close(r.roots[0].remnant_mass, 7.0 / (1 + 1e-12), 1e-15));
  CHECK(r.evaluations <= 3);
  // No static bubble anywhere: no branch.
  CHECK(find_remnants(7.0, [](double) -> std::optional<double> { return std::nullopt; }).roots.empty());
  RemnantSearchOptions bad;
  bad.scan_points = 2;
  CHECK_THROWS_WITH_AS(bad.validate(), doctest::Contains("scan_points"), ember::InputError);
}

TEST_CASE("remnant branches: a solver failure inside a root search reaches the caller") {
  // The failure sits around the lower branch (0.276), between scan points (0.215 and 0.316), so it
  // is met inside GSL's root finder and must come out of it unchanged.
  const MassShiftFn shift = [](double m) -> std::optional<double> {
    if (m > 0.27 && m < 0.28) throw ember::NumericalError("test solver", "failed near the lower branch");
    return 0.8 + 4 * (m - 0.5) * (m - 0.5) - m;
  };
  CHECK_THROWS_WITH_AS(find_remnants(1.0, shift), doctest::Contains("failed near the lower branch"),
                       ember::NumericalError);
}
