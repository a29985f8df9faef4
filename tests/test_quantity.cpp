// The quantity-with-units parser: the forms users write, and an error for each kind of mistake.
#include <doctest/doctest.h>

#include <algorithm>

#include "ember/units/constants.hpp"
#include "ember/units/quantity.hpp"
#include "support.hpp"

using namespace ember::units;
using ember::testing::close;

namespace {

std::string error_of(std::string_view text, Kind kind, Sign sign = Sign::positive) {
  try {
    parse_quantity(text, kind, sign);
  } catch (const QuantityError& e) {
    return e.what();
  }
  return "";
}
}  // namespace

TEST_CASE("the forms users write parse to internal units") {
  // Conversions through CODATA 2018 (see test_constants.cpp for the constants themselves).
  CHECK(close(parse_quantity("1e15 g", mass).value, 1e15 * gram));
  CHECK(close(parse_quantity("1e15g", mass).value, 1e15 * gram));
  CHECK(close(parse_quantity("3.2e-19 Msun", mass).value, 3.2e-19 * solar_mass));
  CHECK(close(parse_quantity("1e5 Mpl", mass).value, 1e5 * planck_mass));
  CHECK(close(parse_quantity("2 kg", mass).value, 2 * kilogram));
  CHECK(close(parse_quantity("13.8 Gyr", ember::units::time).value, 13.8e9 * year));
  CHECK(close(parse_quantity("1e-23 s", ember::units::time).value, 1e-23 * second));
  CHECK(close(parse_quantity("125.1 GeV", mass).value, 125.1));
  CHECK(close(parse_quantity("1e10 GeV", energy).value, 1e10));
  CHECK(close(parse_quantity("2.7255 K", temperature).value, 2.7255 * kelvin));
  CHECK(close(parse_quantity("  +2 TeV ", energy).value, 2000));
  CHECK(close(parse_quantity("1e40 GeV^4", {Dimension::energy, 4}).value, 1e40));
  CHECK(close(parse_quantity("1 TeV^3", {Dimension::energy, 3}).value, 1e9));
  // 1 g = 5.60958860e23 GeV (CODATA 2018 electron volt-kilogram relationship, inverted).
  CHECK(close(parse_quantity("1 g", mass).value, 5.609588606e23, 1e-9));
  // 1 s = 1.519267448e24 GeV^-1 (CODATA 2018 hbar = 6.582119569e-16 eV s, inverted).
  CHECK(close(parse_quantity("1 s", ember::units::time).value, 1.519267448e24, 1e-9));
}

TEST_CASE("the number and unit are kept as written") {
  const Quantity q = parse_quantity("1e15g", mass);
  CHECK(q.number == 1e15);
  CHECK(q.unit == "g");
  CHECK(format_quantity(q.number, q.unit) == "1e15 g");
  CHECK(format_quantity(125.2, "GeV") == "125.2 GeV");
}

TEST_CASE("conversion back to a unit inverts parsing") {
  const double m = parse_quantity("1 Msun", mass).value;
  CHECK(close(in_unit(m, "kg", mass), si::solar_mass));
  CHECK(close(in_unit(parse_quantity("1 Mpl", mass).value, "g", mass), 2.176434e-5, 1e-6));  // CODATA 2018
  CHECK(close(in_unit(parse_quantity("1 yr", ember::units::time).value, "s", ember::units::time),
              31557600.0));  // Julian year
}

TEST_CASE("each mistake gets its own message naming the text") {
  CHECK(error_of("1e15 gram", mass).find("unknown unit \"gram\"") != std::string::npos);
  CHECK(error_of("125 Gev", mass).find("did you mean \"GeV\"") != std::string::npos);
  CHECK(error_of("g", mass).find("missing number") != std::string::npos);
  CHECK(error_of("", mass).find("empty") != std::string::npos);
  CHECK(error_of("1e15", mass).find("missing unit") != std::string::npos);
  CHECK(error_of("13.8 Gyr", mass).find("is a time; expected a mass") != std::string::npos);
  CHECK(error_of("1e15 g", ember::units::time).find("is a mass; expected a time") != std::string::npos);
  CHECK(error_of("1 J", mass).find("is an energy; expected a mass") != std::string::npos);
  CHECK(error_of("1 GeV^4", {Dimension::energy, 3}).find("is an energy^4") != std::string::npos);
  CHECK(error_of("nan g", mass).find("not a finite number") != std::string::npos);
  CHECK(error_of("inf g", mass).find("not a finite number") != std::string::npos);
  CHECK(error_of("-1 g", mass).find("must be positive") != std::string::npos);
  CHECK(error_of("0 g", mass).find("must be positive") != std::string::npos);
  CHECK(error_of("-1 g", mass, Sign::non_negative).find("must not be negative") != std::string::npos);
  CHECK(error_of("1e999 g", mass).find("overflows") != std::string::npos);
  CHECK(error_of("1e300 Msun", mass).find("overflows") != std::string::npos);
  CHECK(error_of("1 GeV^x", energy).find("unknown unit") != std::string::npos);
  // Sign::any admits zero and negative values; Sign::non_negative admits zero.
  CHECK(parse_quantity("-3 GeV", energy, Sign::any).value == -3.0);
  CHECK(parse_quantity("0 g", mass, Sign::non_negative).value == 0.0);
  // Every message says what was expected.
  CHECK(error_of("1e15 s", mass).find("; expected a mass in g, kg") != std::string::npos);
}

TEST_CASE("units are listed by dimension") {
  const auto masses = units_for(mass);
  CHECK(std::find(masses.begin(), masses.end(), "Msun") != masses.end());
  CHECK(std::find(masses.begin(), masses.end(), "s") == masses.end());
  CHECK(describe(energy) == "an energy");
  CHECK(describe({Dimension::energy, 4}) == "an energy^4");
  CHECK(name_of(ember::units::time) == "time");
}
