#include "ember/units/quantity.hpp"

#include <fmt/format.h>

#include <array>
#include <charconv>
#include <cmath>
#include <optional>

#include "ember/core/text.hpp"
#include "ember/units/constants.hpp"

namespace ember::units {

namespace {

enum : unsigned { m_mass = 1, m_energy = 2, m_time = 4, m_length = 8, m_temperature = 16 };
constexpr unsigned m_energylike = m_mass | m_energy | m_temperature;

struct Unit {
  std::string_view symbol;
  double factor;        // internal units per one of this unit (power 1)
  unsigned dimensions;  // bit mask of the dimensions it can express
};

constexpr double ly = si::c * si::julian_year * meter;  // light year (Julian year), GeV^-1

constexpr Unit table[] = {
    {"g", gram, m_mass},
    {"kg", kilogram, m_mass},
    {"Msun", solar_mass, m_mass},
    {"Mpl", planck_mass, m_mass | m_energy},
    {"eV", 1e-9, m_energylike},
    {"keV", 1e-6, m_energylike},
    {"MeV", 1e-3, m_energylike},
    {"GeV", 1.0, m_energylike},
    {"TeV", 1e3, m_energylike},
    {"PeV", 1e6, m_energylike},
    {"J", joule, m_energy},
    {"erg", 1e-7 * joule, m_energy},
    {"K", kelvin, m_temperature},
    {"s", second, m_time},
    {"ms", 1e-3 * second, m_time},
    {"us", 1e-6 * second, m_time},
    {"ns", 1e-9 * second, m_time},
    {"ps", 1e-12 * second, m_time},
    {"fs", 1e-15 * second, m_time},
    {"min", 60 * second, m_time},
    {"hr", 3600 * second, m_time},
    {"day", 86400 * second, m_time},
    {"yr", year, m_time},
    {"kyr", 1e3 * year, m_time},
    {"Myr", 1e6 * year, m_time},
    {"Gyr", 1e9 * year, m_time},
    {"m", meter, m_length},
    {"cm", 1e-2 * meter, m_length},
    {"km", 1e3 * meter, m_length},
    {"pc", parsec, m_length},
    {"kpc", 1e3 * parsec, m_length},
    {"Mpc", 1e6 * parsec, m_length},
    {"Gpc", 1e9 * parsec, m_length},
    {"ly", ly, m_length},
};

unsigned mask_of(Dimension d) {
  switch (d) {
    case Dimension::mass: return m_mass;
    case Dimension::energy: return m_energy;
    case Dimension::time: return m_time;
    case Dimension::length: return m_length;
    case Dimension::temperature: return m_temperature;
  }
  return 0;
}

std::string_view dimension_name(unsigned mask) {
  if (mask & m_mass) return "a mass";
  if (mask & m_energy) return "an energy";
  if (mask & m_time) return "a time";
  if (mask & m_length) return "a length";
  return "a temperature";
}

const Unit* find_unit(std::string_view symbol) {
  for (const auto& u : table)
    if (u.symbol == symbol) return &u;
  return nullptr;
}

std::string example_for(Kind kind) {
  switch (kind.dimension) {
    case Dimension::mass: return "\"1e15 g\"";
    case Dimension::energy: return kind.power == 1 ? "\"1e10 GeV\"" : fmt::format("\"1 GeV^{}\"", kind.power);
    case Dimension::time: return "\"13.8 Gyr\"";
    case Dimension::length: return "\"14 Gpc\"";
    case Dimension::temperature: return "\"2.7255 K\"";
  }
  return "";
}

std::string expectation(Kind kind) {
  return fmt::format("{} in {}, e.g. {}", describe(kind), join_alternatives(units_for(kind)), example_for(kind));
}

// Splits "GeV^4" into ("GeV", 4). A missing exponent means 1.
std::optional<std::pair<std::string, int>> split_power(std::string_view unit) {
  const auto caret = unit.find('^');
  if (caret == std::string_view::npos) return std::pair{std::string(unit), 1};
  int power = 0;
  const auto digits = unit.substr(caret + 1);
  const auto [end, ec] = std::from_chars(digits.data(), digits.data() + digits.size(), power);
  if (ec != std::errc{} || end != digits.data() + digits.size() || digits.empty()) return std::nullopt;
  return std::pair{std::string(unit.substr(0, caret)), power};
}

double unit_factor(std::string_view unit_text, Kind kind, std::string_view whole_text) {
  const auto split = split_power(unit_text);
  const Unit* unit = split ? find_unit(split->first) : nullptr;
  if (!unit) {
    std::vector<std::string> known;
    for (const auto& u : table) known.emplace_back(u.symbol);
    const std::string near = split ? closest_match(split->first, known) : std::string{};
    throw QuantityError(fmt::format("\"{}\": unknown unit \"{}\"{}", whole_text, unit_text,
                                    near.empty() ? "" : fmt::format(" (did you mean \"{}\"?)", near)),
                        expectation(kind));
  }
  const int power = split->second;
  if (!(unit->dimensions & mask_of(kind.dimension)) || power != kind.power) {
    // Name the dimension the unit has; when it could be the expected one, only the power is wrong.
    const std::string base = (unit->dimensions & mask_of(kind.dimension))
                                 ? describe(Kind{kind.dimension, 1})
                                 : std::string(dimension_name(unit->dimensions));
    const std::string what = power == 1 ? base : fmt::format("{}^{}", base, power);
    throw QuantityError(fmt::format("\"{}\" is {}", whole_text, what), expectation(kind));
  }
  return std::pow(unit->factor, power);
}

}  // namespace

std::string name_of(Kind kind) {
  static constexpr std::array<std::string_view, 5> names{"mass", "energy", "time", "length", "temperature"};
  const std::string base(names[static_cast<std::size_t>(kind.dimension)]);
  return kind.power == 1 ? base : fmt::format("{}^{}", base, kind.power);
}

std::string describe(Kind kind) {
  return (kind.dimension == Dimension::energy ? "an " : "a ") + name_of(kind);
}

std::vector<std::string> units_for(Kind kind) {
  std::vector<std::string> out;
  for (const auto& u : table)
    if (u.dimensions & mask_of(kind.dimension))
      out.push_back(kind.power == 1 ? std::string(u.symbol) : fmt::format("{}^{}", u.symbol, kind.power));
  return out;
}

Quantity parse_quantity(std::string_view raw, Kind kind, Sign sign) {
  const std::string text = trim(raw);
  if (text.empty()) throw QuantityError("empty text", expectation(kind));

  std::string_view rest = text;
  if (rest.front() == '+') rest.remove_prefix(1);  // from_chars does not take a leading '+'
  double number = 0;
  const auto [end, ec] = std::from_chars(rest.data(), rest.data() + rest.size(), number);
  if (ec == std::errc::result_out_of_range)
    throw QuantityError(fmt::format("\"{}\": the number overflows a double", text), expectation(kind));
  if (ec != std::errc{})
    throw QuantityError(fmt::format("\"{}\": missing number before the unit", text), expectation(kind));
  if (!std::isfinite(number))
    throw QuantityError(fmt::format("\"{}\": {} is not a finite number", text, number), expectation(kind));

  const std::string unit_text = trim(std::string_view(end, rest.data() + rest.size() - end));
  if (unit_text.empty()) throw QuantityError(fmt::format("\"{}\": missing unit", text), expectation(kind));
  const double factor = unit_factor(unit_text, kind, text);

  if (sign == Sign::positive && !(number > 0))
    throw QuantityError(fmt::format("\"{}\": must be positive", text),
                        fmt::format("{} greater than zero", describe(kind)));
  if (sign == Sign::non_negative && number < 0)
    throw QuantityError(fmt::format("\"{}\": must not be negative", text),
                        fmt::format("{} of zero or more", describe(kind)));

  const double value = number * factor;
  if (!std::isfinite(value) || (number != 0 && value == 0))
    throw QuantityError(fmt::format("\"{}\" overflows in internal units (GeV^{})", text, kind.power),
                        expectation(kind));
  return Quantity{number, unit_text, value};
}

double in_unit(double internal_value, std::string_view unit, Kind kind) {
  return internal_value / unit_factor(unit, kind, unit);
}

std::string format_quantity(double number, std::string_view unit) {
  return fmt::format("{} {}", format_real(number), unit);
}

}  // namespace ember::units
