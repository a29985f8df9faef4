// Quantities with units, as users write them: "1e15 g", "1e15g", "3.2e-19 Msun", "1e5 Mpl",
// "2 kg", "13.8 Gyr", "1e-23 s", "125.1 GeV", "1e10 GeV", "2.7255 K", "1e40 GeV^4".
//
// Values are converted to the internal natural units of constants.hpp (GeV^power).
// Mass, energy and temperature share the eV family of units (E = m c^2 = k_B T); grams and
// solar masses are masses only, joules and ergs energies only, kelvin temperatures only.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "ember/core/errors.hpp"

namespace ember::units {

enum class Dimension { mass, energy, time, length, temperature };

// A dimension raised to a power, e.g. {energy, 4} for a vacuum energy density in GeV^4.
struct Kind {
  Dimension dimension;
  int power = 1;
  friend bool operator==(const Kind&, const Kind&) = default;
};

inline constexpr Kind mass{Dimension::mass};
inline constexpr Kind energy{Dimension::energy};
inline constexpr Kind time{Dimension::time};
inline constexpr Kind length{Dimension::length};
inline constexpr Kind temperature{Dimension::temperature};

enum class Sign { positive, non_negative, any };

struct Quantity {
  double number = 0;  // the number as written
  std::string unit;   // the unit as written, canonical spelling, e.g. "GeV^4"
  double value = 0;   // in internal units
};

// A malformed quantity. problem() says what is wrong and expected() what would be right, so
// callers can prefix the location (a file line, a command-line option).
class QuantityError : public InputError {
 public:
  QuantityError(std::string problem, std::string expected)
      : InputError(problem + "; expected " + expected), problem_(std::move(problem)), expected_(std::move(expected)) {}
  const std::string& problem() const { return problem_; }
  const std::string& expected() const { return expected_; }

 private:
  std::string problem_, expected_;
};

// Parses `text` as a quantity of the given kind. Throws QuantityError on an unknown unit, a
// missing number or unit, the wrong dimension, a non-finite number, or a sign `sign` forbids.
Quantity parse_quantity(std::string_view text, Kind kind, Sign sign = Sign::positive);

// Internal value expressed in `unit` (which must suit `kind`).
double in_unit(double internal_value, std::string_view unit, Kind kind);

// "1e+15 g": the shortest text that reads back to the same number, then the unit.
std::string format_quantity(double number, std::string_view unit);

// "mass", "energy^4" ...
std::string name_of(Kind kind);
// "a mass", "an energy^4" ...
std::string describe(Kind kind);

// The unit symbols that suit `kind`, in table order.
std::vector<std::string> units_for(Kind kind);

}  // namespace ember::units
