// The numerical guard (core/finite.hpp): non-finite values become errors naming where they came
// from; words that merely contain "inf" or "nan" are left alone. Expected texts are derived from
// the guard's documented message forms.
#include <doctest/doctest.h>

#include <cmath>
#include <limits>

#include "ember/core/errors.hpp"
#include "ember/core/finite.hpp"

using namespace ember;

TEST_CASE("require_finite passes finite values and names module, inputs and hint otherwise") {
  CHECK(require_finite(2.5, "m", "x", "y", "z") == 2.5);
  CHECK_THROWS_WITH_AS(require_finite(std::nan(""), "evaporation", "alpha(M)", "M = 1e10 g", "a larger mass"),
                       doctest::Contains("alpha(M) = nan for M = 1e10 g; try a larger mass"), NumericalError);
  try {
    require_finite(-std::numeric_limits<double>::infinity(), "higgs", "lambda", "mu = 1e19 GeV", "fewer loops");
  } catch (const NumericalError& e) {
    CHECK(e.solver() == "higgs");
  }
}

TEST_CASE("require_finite_json names the path of a non-finite number") {
  nlohmann::ordered_json j{{"a", 1.0}, {"b", {{"c", std::vector<double>{1.0, 2.0}}}}, {"title", "inf nan"}};
  CHECK_NOTHROW(require_finite_json(j, "s.json"));
  j["b"]["c"][1] = std::nan("");
  CHECK_THROWS_WITH_AS(require_finite_json(j, "s.json"), doctest::Contains("s.json: b.c[1] = nan"), NumericalError);
}

TEST_CASE("require_finite_text finds nan and inf tokens in data lines only") {
  CHECK_NOTHROW(require_finite_text("# title: inf nan\nmass,info\n1e+10,infant\n", "a.csv"));
  CHECK_NOTHROW(require_finite_text("x,y\n1.5e+300,-2\n", "a.csv"));
  CHECK_THROWS_WITH_AS(require_finite_text("x,y\n1,2\n3,nan\n", "a.csv"), doctest::Contains("a.csv:3:"),
                       NumericalError);
  CHECK_THROWS_AS(require_finite_text("x,y\n1,-inf\n", "a.csv"), NumericalError);
  CHECK_THROWS_AS(require_finite_text("x\nINF\n", "a.csv"), NumericalError);
  CHECK_THROWS_AS(require_finite_text("x\n1,Infinity", "a.csv"), NumericalError);
}
