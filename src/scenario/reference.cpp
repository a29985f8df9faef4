#include "ember/scenario/reference.hpp"

#include <fmt/format.h>

#include "ember/core/text.hpp"
#include "ember/version.hpp"

namespace ember::scenario {

namespace {

std::string unit_text(const Key& key) {
  switch (key.type) {
    case ValueType::number: return "number";
    case ValueType::integer: return "whole number";
    case ValueType::quantity: {
      return units::name_of(key.kind);
    }
    case ValueType::text: return "text";
    case ValueType::path:
      return key.input_file ? "path of an existing file, relative to the scenario's folder" : "path";
    case ValueType::flag: return "true or false";
    case ValueType::option: return "one of " + join_alternatives(key.options);
    case ValueType::option_list: return "list of " + join_alternatives(key.options, "and");
    case ValueType::number_list: return "list of numbers";
    default: return "";
  }
}

std::string status_text(const Key& key) {
  if (key.required) return "required";
  if (key.fallback) return "default " + (key.fallback->empty() ? std::string("\"\"") : *key.fallback);
  return "optional, no default";
}

std::string range_text(const Key& key) {
  switch (key.type) {
    case ValueType::number:
    case ValueType::integer:
    case ValueType::number_list: return key.range.bounded() ? " | range: " + key.range.describe() : "";
    case ValueType::quantity: return " | range: " + key.range.describe(key.unit);
    case ValueType::option_list: return key.min_items > 0 ? fmt::format(" | at least {}", key.min_items) : "";
    default: return "";
  }
}

std::string shown_value(const Key& key) {
  const std::string v = key.required ? key.example : key.fallback.value_or("");
  return v.empty() ? "\"\"" : v;
}

std::string unit_legend() {
  std::string out;
  for (const auto kind : {units::mass, units::energy, units::temperature, units::time, units::length})
    out += fmt::format("#   {:<12} {}\n", units::name_of(kind) + ":", fmt::join(units::units_for(kind), ", "));
  return out + "#   energy^n:    any energy unit with ^n, e.g. GeV^4\n";
}

class Writer {
 public:
  std::string out;

  void keys(const std::vector<const Key*>& list, int depth, bool commented) {
    for (const Key* k : list) key(*k, depth, commented);
  }

  void key(const Key& k, int depth, bool commented) {
    const std::string pad(2 * static_cast<std::size_t>(depth), ' ');
    const std::string lead = commented ? "# " : "";
    line(pad, "# " + k.meaning);
    if (k.type == ValueType::section) {
      if (has_required(k)) line(pad, "# required section");
      line(pad, lead + k.name + ":");
      std::vector<const Key*> children;
      for (const auto& c : k.children) children.push_back(&c);
      keys(children, depth + 1, commented);
      return;
    }
    if (k.type == ValueType::choice) {
      choice(k, depth, commented);
      return;
    }
    line(pad, fmt::format("# {} | {}{}", unit_text(k), status_text(k), range_text(k)));
    if (!k.required && !k.fallback) {
      line(pad, fmt::format("# {}: {}", k.name, k.example.empty() ? "(absent)" : k.example));
      return;
    }
    line(pad, fmt::format("{}{}: {}", lead, k.name, shown_value(k)));
  }

  void choice(const Key& k, int depth, bool commented) {
    const std::string pad(2 * static_cast<std::size_t>(depth), ' ');
    const std::string inner(2 * static_cast<std::size_t>(depth + 1), ' ');
    const std::string lead = commented ? "# " : "";
    line(pad, fmt::format("# {} | {}: one of {} | {}", "section", k.selector, join_alternatives(k.options),
                          k.required ? "required" : "default " + k.fallback.value_or("")));
    line(pad, lead + k.name + ":");
    const std::string shown = k.fallback.value_or(k.variants.front().name);
    for (const auto& v : k.variants) {
      const bool live = v.name == shown && !commented;
      line(inner, fmt::format("# {} = {}: {}", k.selector, v.name, v.meaning));
      line(inner, fmt::format("{}{}: {}", live ? "" : "# ", k.selector, v.name));
      std::vector<const Key*> list;
      for (const auto& c : k.children) list.push_back(&c);
      for (const auto& c : v.keys) list.push_back(&c);
      keys(list, depth + 1, !live);
    }
  }

 private:
  void line(const std::string& pad, const std::string& text) { out += pad + text + "\n"; }
};

nlohmann::ordered_json key_json(const Key& k);

nlohmann::ordered_json keys_json(const std::vector<Key>& keys) {
  nlohmann::ordered_json out = nlohmann::ordered_json::object();
  for (const auto& k : keys) out[k.name] = key_json(k);
  return out;
}

nlohmann::ordered_json key_json(const Key& k) {
  static const char* type_names[] = {"section", "choice", "number", "integer",     "quantity",   "text",
                                     "path",    "flag",   "option", "option_list", "number_list"};
  nlohmann::ordered_json j;
  j["type"] = type_names[static_cast<int>(k.type)];
  j["meaning"] = k.meaning;
  if (k.type == ValueType::section) {
    j["keys"] = keys_json(k.children);
    j["required"] = has_required(k);
    return j;
  }
  j["required"] = k.required;
  if (k.fallback) j["default"] = *k.fallback;
  if (k.required && !k.example.empty()) j["example"] = k.example;
  if (k.type == ValueType::choice) {
    j["selector"] = k.selector;
    for (const auto& v : k.variants) j["variants"][v.name] = {{"meaning", v.meaning}, {"keys", keys_json(v.keys)}};
    return j;
  }
  if (k.type == ValueType::quantity) {
    j["dimension"] = units::describe(k.kind);
    j["units"] = units::units_for(k.kind);
    j["range_unit"] = k.unit;
  }
  if (k.type == ValueType::number || k.type == ValueType::integer || k.type == ValueType::quantity ||
      k.type == ValueType::number_list)
    j["range"] = k.range.describe(k.unit);
  if (!k.options.empty()) j["options"] = k.options;
  return j;
}

}  // namespace

std::string reference_yaml(const Key& schema) {
  Writer w;
  w.out = fmt::format(
      "# Ember scenario reference (ember {}): every key, with its unit, default, allowed range and meaning.\n"
      "# Generated by `ember schema`; a test keeps configs/reference.yaml identical to it.\n"
      "#\n"
      "# Quantities carry a unit: \"1e15 g\", \"3.2e-19 Msun\", \"1e5 Mpl\", \"125.2 GeV\", \"13.8 Gyr\".\n"
      "{}"
      "# Keys marked required have no default; the values shown for them are examples, so this file\n"
      "# loads as a scenario. Where a section offers variants, the ones not shown are commented out.\n\n",
      version, unit_legend());
  std::vector<const Key*> top;
  for (const auto& c : schema.children) top.push_back(&c);
  for (const Key* k : top) {
    w.key(*k, 0, false);
    w.out += "\n";
  }
  return w.out;
}

nlohmann::ordered_json reference_json(const Key& schema) {
  return nlohmann::ordered_json{{"ember_version", version}, {"keys", keys_json(schema.children)}};
}

}  // namespace ember::scenario
