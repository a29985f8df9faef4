#include "ember/scenario/schema.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "ember/core/text.hpp"

namespace ember::scenario {

bool Range::contains(double x) const {
  const bool low_ok = low_open ? x > low : x >= low;
  const bool high_ok = high_open ? x < high : x <= high;
  return low_ok && high_ok;
}

bool Range::bounded() const {
  return std::isfinite(low) || std::isfinite(high);
}

std::string Range::describe(const std::string& unit) const {
  const auto with_unit = [&](double x) { return unit.empty() ? format_real(x) : format_real(x) + " " + unit; };
  const bool has_low = std::isfinite(low), has_high = std::isfinite(high);
  if (has_low && has_high) {
    if (!low_open && !high_open) return fmt::format("between {} and {}", with_unit(low), with_unit(high));
    return fmt::format("{} {} and {} {}", low_open ? "above" : "at least", with_unit(low),
                       high_open ? "below" : "at most", with_unit(high));
  }
  if (has_low) return fmt::format("{} {}", low_open ? "greater than" : "at least", with_unit(low));
  if (has_high) return fmt::format("{} {}", high_open ? "less than" : "at most", with_unit(high));
  return "any finite value";
}

Range above(double low) {
  return Range{low, std::numeric_limits<double>::infinity(), true, false};
}
Range at_least(double low) {
  return Range{low, std::numeric_limits<double>::infinity(), false, false};
}
Range between(double low, double high) {
  return Range{low, high, false, false};
}
Range above_up_to(double low, double high) {
  return Range{low, high, true, false};
}
Range any_value() {
  return Range{};
}

Key section(std::string name, std::string meaning, std::vector<Key> children) {
  Key k;
  k.name = std::move(name);
  k.type = ValueType::section;
  k.meaning = std::move(meaning);
  k.children = std::move(children);
  return k;
}

Key choice(std::string name, std::string meaning, std::string selector, std::vector<Variant> variants,
           std::optional<std::string> default_variant) {
  Key k;
  k.name = std::move(name);
  k.type = ValueType::choice;
  k.meaning = std::move(meaning);
  k.selector = std::move(selector);
  k.variants = std::move(variants);
  k.fallback = std::move(default_variant);
  for (const auto& v : k.variants) k.options.push_back(v.name);
  return k;
}

Key number(std::string name, std::string meaning, std::optional<std::string> fallback, Range range) {
  Key k;
  k.name = std::move(name);
  k.type = ValueType::number;
  k.meaning = std::move(meaning);
  k.fallback = std::move(fallback);
  k.range = range;
  return k;
}

Key integer(std::string name, std::string meaning, std::optional<std::string> fallback, Range range) {
  Key k = number(std::move(name), std::move(meaning), std::move(fallback), range);
  k.type = ValueType::integer;
  return k;
}

Key quantity(std::string name, std::string meaning, units::Kind kind, std::string unit,
             std::optional<std::string> fallback, Range range, units::Sign sign) {
  Key k = number(std::move(name), std::move(meaning), std::move(fallback), range);
  k.type = ValueType::quantity;
  k.kind = kind;
  k.unit = std::move(unit);
  k.sign = sign;
  return k;
}

Key text(std::string name, std::string meaning, std::optional<std::string> fallback) {
  Key k;
  k.name = std::move(name);
  k.type = ValueType::text;
  k.meaning = std::move(meaning);
  k.fallback = std::move(fallback);
  return k;
}

Key input_file(std::string name, std::string meaning) {
  Key k = text(std::move(name), std::move(meaning), std::nullopt);
  k.type = ValueType::path;
  k.input_file = true;
  return k;
}

Key output_path(std::string name, std::string meaning, std::string fallback) {
  Key k = text(std::move(name), std::move(meaning), std::move(fallback));
  k.type = ValueType::path;
  return k;
}

Key flag(std::string name, std::string meaning, bool fallback) {
  Key k = text(std::move(name), std::move(meaning), fallback ? "true" : "false");
  k.type = ValueType::flag;
  return k;
}

Key option(std::string name, std::string meaning, std::vector<std::string> options,
           std::optional<std::string> fallback) {
  Key k = text(std::move(name), std::move(meaning), std::move(fallback));
  k.type = ValueType::option;
  k.options = std::move(options);
  return k;
}

Key option_list(std::string name, std::string meaning, std::vector<std::string> options,
                std::vector<std::string> fallback, std::size_t min_items) {
  Key k = text(std::move(name), std::move(meaning), "[" + fmt::format("{}", fmt::join(fallback, ", ")) + "]");
  k.type = ValueType::option_list;
  k.options = std::move(options);
  k.min_items = min_items;
  return k;
}

Key number_list(std::string name, std::string meaning, Range range, std::size_t min_items) {
  Key k = number(std::move(name), std::move(meaning), std::string("[]"), range);
  k.type = ValueType::number_list;
  k.min_items = min_items;
  return k;
}

Key required(Key key, std::string example) {
  key.required = true;
  key.fallback.reset();
  key.example = std::move(example);
  return key;
}

Key with_example(Key key, std::string example) {
  key.example = std::move(example);
  return key;
}

Key ordered(Key key, std::vector<Ordering> orderings) {
  key.orderings = std::move(orderings);
  return key;
}

bool has_required(const Key& key) {
  if (key.required) return true;
  if (key.type == ValueType::section) {
    for (const auto& child : key.children)
      if (has_required(child)) return true;
  }
  return false;
}

std::vector<std::string> key_names(const Key& section) {
  std::vector<std::string> names;
  if (section.type == ValueType::choice) names.push_back(section.selector);
  for (const auto& child : section.children) names.push_back(child.name);
  for (const auto& variant : section.variants)
    for (const auto& key : variant.keys)
      if (std::find(names.begin(), names.end(), key.name) == names.end()) names.push_back(key.name);
  return names;
}

}  // namespace ember::scenario
