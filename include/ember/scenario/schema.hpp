// The scenario schema: a declarative tree of keys, each with its type, unit, default, allowed
// range and one-line meaning. One tree drives validation (resolve.hpp), the typed reader
// (scenario.hpp) and the documented reference (reference.hpp), so they cannot drift apart.
//
// Units: quantities are written with units (see units/quantity.hpp); a quantity's range is
// stated in its `unit`.
#pragma once

#include <limits>
#include <optional>
#include <string>
#include <vector>

#include "ember/units/quantity.hpp"

namespace ember::scenario {

enum class ValueType {
  section,      // a mapping of named keys
  choice,       // a mapping whose `selector` key picks one of several variants of further keys
  number,       // a real number
  integer,      // a whole number
  quantity,     // a number with a unit
  text,         // free text
  path,         // a file path; relative paths are taken from the scenario file's folder
  flag,         // true or false
  option,       // one word out of `options`
  option_list,  // a list of distinct words out of `options`
  number_list,  // a list of numbers
};

struct Range {
  double low = -std::numeric_limits<double>::infinity();
  double high = std::numeric_limits<double>::infinity();
  bool low_open = false;
  bool high_open = false;

  bool contains(double x) const;
  bool bounded() const;
  // "greater than 0", "between 0 and 1", "at least 1 Mpl" ...
  std::string describe(const std::string& unit = "") const;
};

Range above(double low);
Range at_least(double low);
Range between(double low, double high);      // closed
Range above_up_to(double low, double high);  // (low, high]
Range any_value();

struct Key;

struct Variant {
  std::string name;
  std::string meaning;
  std::vector<Key> keys;
};

// A rule between two keys of one section: value(lesser) < value(greater) (or <=).
struct Ordering {
  std::string lesser, greater;
  bool strict = true;
};

struct Key {
  std::string name;
  ValueType type = ValueType::text;
  std::string meaning;
  std::optional<std::string> fallback;  // the default, written as in a scenario; none if absent
  bool required = false;
  std::string example;                       // shown in the reference for keys without a default
  Range range;                               // number, integer, quantity, number_list items
  units::Kind kind = units::mass;            // quantity
  units::Sign sign = units::Sign::positive;  // quantity
  std::string unit;                          // quantity: the unit `range` is written in
  std::vector<std::string> options;          // option, option_list
  std::size_t min_items = 0;                 // option_list, number_list
  bool input_file = false;                   // path: must name an existing regular file
  std::vector<Key> children;                 // section; choice: keys shared by every variant
  std::string selector;                      // choice: the key naming the variant
  std::vector<Variant> variants;             // choice
  std::vector<Ordering> orderings;           // section and choice
};

// Builders, so the schema reads as a table.
Key section(std::string name, std::string meaning, std::vector<Key> children);
Key choice(std::string name, std::string meaning, std::string selector, std::vector<Variant> variants,
           std::optional<std::string> default_variant = std::nullopt);
Key number(std::string name, std::string meaning, std::optional<std::string> fallback, Range range);
Key integer(std::string name, std::string meaning, std::optional<std::string> fallback, Range range);
Key quantity(std::string name, std::string meaning, units::Kind kind, std::string unit,
             std::optional<std::string> fallback, Range range, units::Sign sign = units::Sign::positive);
Key text(std::string name, std::string meaning, std::optional<std::string> fallback);
Key input_file(std::string name, std::string meaning);
Key output_path(std::string name, std::string meaning, std::string fallback);
Key flag(std::string name, std::string meaning, bool fallback);
Key option(std::string name, std::string meaning, std::vector<std::string> options,
           std::optional<std::string> fallback);
Key option_list(std::string name, std::string meaning, std::vector<std::string> options,
                std::vector<std::string> fallback, std::size_t min_items = 1);
Key number_list(std::string name, std::string meaning, Range range, std::size_t min_items = 0);

// Marks a key as required, with an example value for the reference.
Key required(Key key, std::string example);
// Gives an optional key without a default an example value for the reference.
Key with_example(Key key, std::string example);
// Gives a section or choice ordering rules between its keys.
Key ordered(Key key, std::vector<Ordering> orderings);

// True when the key, or anything below it, must be given.
bool has_required(const Key& key);

// Names of a section's keys (a choice: the selector, shared keys and every variant's keys).
std::vector<std::string> key_names(const Key& section);

// The whole scenario schema (scenario_keys.cpp).
Key scenario_schema();

}  // namespace ember::scenario
