#include "ember/scenario/resolve.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <map>
#include <system_error>

#include "ember/core/text.hpp"

namespace ember::scenario {

std::string Diagnostic::format() const {
  return fmt::format("{}:{}:{}: {}: {}; expected {}", file, line, column, path, problem, expected);
}

namespace {
std::string join_lines(const std::vector<Diagnostic>& diagnostics) {
  std::string out;
  for (const auto& d : diagnostics) out += (out.empty() ? "" : "\n") + d.format();
  return out;
}
}  // namespace

ScenarioError::ScenarioError(std::vector<Diagnostic> diagnostics)
    : InputError(join_lines(diagnostics)), diagnostics_(std::move(diagnostics)) {}

namespace {

std::string join_path(const std::string& parent, const std::string& name) {
  return parent.empty() ? name : parent + "." + name;
}

std::string node_kind(const YAML::Node& node) {
  switch (node.Type()) {
    case YAML::NodeType::Map: return "a section (mapping)";
    case YAML::NodeType::Sequence: return "a list";
    case YAML::NodeType::Null: return "no value";
    default: return fmt::format("\"{}\"", node.Scalar());
  }
}

std::string suggestion(const std::string& word, const std::vector<std::string>& candidates) {
  const std::string near = closest_match(word, candidates);
  return near.empty() ? "" : fmt::format(" (did you mean \"{}\"?)", near);
}

// A location to report: the value's own mark when it has one, else the key's.
struct Where {
  YAML::Mark mark;
};

Where where_of(const YAML::Node& value, const YAML::Mark& key_mark) {
  if (value && value.Type() != YAML::NodeType::Null && !value.Mark().is_null()) return {value.Mark()};
  return {key_mark};
}

class Resolver {
 public:
  Resolver(const ResolveContext& context, std::vector<Diagnostic>& errors) : context_(context), errors_(errors) {}

  void error(const Where& at, const std::string& path, std::string problem, std::string expected) {
    Diagnostic d;
    d.file = context_.file_label;
    d.line = at.mark.is_null() ? 1 : at.mark.line + 1;
    d.column = at.mark.is_null() ? 1 : at.mark.column + 1;
    d.path = path.empty() ? "(document)" : printable(path);
    d.problem = printable(problem);
    d.expected = std::move(expected);
    errors_.push_back(std::move(d));
  }

  // Resolves a section or choice. Returns a map node (possibly partial when errors occurred).
  YAML::Node mapping(const Key& spec, const YAML::Node& node, const Where& at, const std::string& path) {
    YAML::Node out(YAML::NodeType::Map);
    if (node && node.Type() != YAML::NodeType::Null && !node.IsMap()) {
      error(at, path, fmt::format("got {}", node_kind(node)), expect_section(spec));
      return out;
    }

    // Gather the entries, reporting keys given twice.
    std::map<std::string, std::pair<YAML::Node, YAML::Mark>> given;
    std::vector<std::string> order;
    if (node && node.IsMap()) {
      for (auto it = node.begin(); it != node.end(); ++it) {
        const YAML::Mark key_mark = it->first.Mark();
        if (!it->first.IsScalar()) {
          error({key_mark}, path, "a key that is not a plain name",
                "key names such as " + join_alternatives(key_names(spec)));
          continue;
        }
        const std::string name = it->first.Scalar();
        if (auto previous = given.find(name); previous != given.end()) {
          error({key_mark}, join_path(path, name),
                fmt::format("duplicate key (first given at line {})", previous->second.second.line + 1),
                "each key once");
          continue;
        }
        given.emplace(name, std::pair{it->second, key_mark});
        order.push_back(name);
      }
    }

    // The keys that apply here: the shared ones, and for a choice the selected variant's.
    std::vector<const Key*> keys;
    for (const auto& child : spec.children) keys.push_back(&child);
    std::vector<std::string> allowed;
    const Variant* variant = nullptr;
    if (spec.type == ValueType::choice) {
      variant = select_variant(spec, given, at, path, out);
      if (!variant) return out;
      for (const auto& key : variant->keys) keys.push_back(&key);
      allowed.push_back(spec.selector);
    }
    for (const Key* k : keys) allowed.push_back(k->name);
    const std::vector<std::string> anywhere = key_names(spec);

    // Unknown keys. A misspelling suggests a key, whose "missing" report would only repeat it.
    std::vector<std::string> suggested;
    for (const auto& name : order) {
      if (std::find(allowed.begin(), allowed.end(), name) != allowed.end()) continue;
      const YAML::Mark key_mark = given.at(name).second;
      const std::string expected = fmt::format("one of {}", join_alternatives(allowed));
      if (variant && std::find(anywhere.begin(), anywhere.end(), name) != anywhere.end()) {
        error({key_mark}, join_path(path, name),
              fmt::format("does not apply when {} is {}", spec.selector, variant->name), expected);
      } else {
        const std::string near = closest_match(name, allowed);
        if (!near.empty()) suggested.push_back(near);
        error({key_mark}, join_path(path, name),
              "unknown key" + (near.empty() ? "" : fmt::format(" (did you mean \"{}\"?)", near)), expected);
      }
      given.erase(name);
    }

    for (const Key* key : keys) {
      const std::string key_path = join_path(path, key->name);
      if (auto found = given.find(key->name); found != given.end()) {
        const auto& [value, key_mark] = found->second;
        // A section is reported at its key's line: that is where a missing key belongs.
        const bool nested = key->type == ValueType::section || key->type == ValueType::choice;
        const Where value_at = nested ? Where{key_mark} : where_of(value, key_mark);
        if (auto resolved = resolve_value(*key, value, value_at, key_path)) out[key->name] = *resolved;
      } else if (key->required || (key->type == ValueType::section && has_required(*key))) {
        if (std::find(suggested.begin(), suggested.end(), key->name) == suggested.end())
          error(at, key_path, "missing required key", expect_value(*key));
      } else if (auto resolved = resolve_default(*key, at, key_path)) {
        out[key->name] = *resolved;
      }
    }
    check_orderings(spec, out, given, at, path);
    return out;
  }

 private:
  const ResolveContext& context_;
  std::vector<Diagnostic>& errors_;

  std::string expect_section(const Key& spec) const {
    return fmt::format("a section with keys {}", join_alternatives(key_names(spec), "and"));
  }

  std::string expect_value(const Key& key) const {
    switch (key.type) {
      case ValueType::section:
      case ValueType::choice: return expect_section(key);
      case ValueType::number: return "a number " + key.range.describe();
      case ValueType::integer: return "a whole number " + key.range.describe();
      case ValueType::quantity:
        return fmt::format("{} {}{}", units::describe(key.kind), key.range.describe(key.unit),
                           key.example.empty() ? "" : fmt::format(", e.g. \"{}\"", key.example));
      case ValueType::text: return "a text";
      case ValueType::path: return key.input_file ? "the path of an existing file" : "a path";
      case ValueType::flag: return "true or false";
      case ValueType::option: return "one of " + join_alternatives(key.options);
      case ValueType::option_list:
        return fmt::format("a list of distinct values out of {}", join_alternatives(key.options, "and"));
      case ValueType::number_list: return "a list of numbers " + key.range.describe();
    }
    return "a value";
  }

  const Variant* select_variant(const Key& spec, const std::map<std::string, std::pair<YAML::Node, YAML::Mark>>& given,
                                const Where& at, const std::string& path, YAML::Node& out) {
    const std::string selector_path = join_path(path, spec.selector);
    std::string name;
    if (auto found = given.find(spec.selector); found != given.end()) {
      const auto& [value, key_mark] = found->second;
      const Where value_at = where_of(value, key_mark);
      if (!value.IsScalar()) {
        error(value_at, selector_path, fmt::format("got {}", node_kind(value)),
              "one of " + join_alternatives(spec.options));
        return nullptr;
      }
      name = value.Scalar();
      if (std::find(spec.options.begin(), spec.options.end(), name) == spec.options.end()) {
        error(value_at, selector_path,
              fmt::format("unknown {} \"{}\"{}", spec.selector, name, suggestion(name, spec.options)),
              "one of " + join_alternatives(spec.options));
        return nullptr;
      }
    } else if (spec.fallback) {
      name = *spec.fallback;
    } else {
      // A misspelt selector is reported as such, not as a missing one.
      for (const auto& [given_name, entry] : given) {
        if (closest_match(given_name, {spec.selector}) == spec.selector) {
          error({entry.second}, join_path(path, given_name),
                fmt::format("unknown key (did you mean \"{}\"?)", spec.selector),
                fmt::format("{}: one of {}", spec.selector, join_alternatives(spec.options)));
          return nullptr;
        }
      }
      error(at, selector_path, "missing required key", "one of " + join_alternatives(spec.options));
      return nullptr;
    }
    out[spec.selector] = name;
    for (const auto& variant : spec.variants)
      if (variant.name == name) return &variant;
    return nullptr;
  }

  std::optional<YAML::Node> resolve_default(const Key& key, const Where& at, const std::string& path) {
    if (key.type == ValueType::section || key.type == ValueType::choice) return mapping(key, YAML::Node(), at, path);
    if (!key.fallback) return std::nullopt;
    const bool is_list = key.type == ValueType::option_list || key.type == ValueType::number_list;
    return resolve_value(key, is_list ? YAML::Load(*key.fallback) : YAML::Node(*key.fallback), at, path);
  }

  bool require_scalar(const Key& key, const YAML::Node& value, const Where& at, const std::string& path) {
    if (value.IsScalar()) return true;
    error(at, path, fmt::format("got {}", node_kind(value)), expect_value(key));
    return false;
  }

  std::optional<YAML::Node> resolve_value(const Key& key, const YAML::Node& value, const Where& at,
                                          const std::string& path) {
    switch (key.type) {
      case ValueType::section:
      case ValueType::choice: return mapping(key, value, at, path);
      case ValueType::number: return resolve_number(key, value, at, path);
      case ValueType::integer: return resolve_integer(key, value, at, path);
      case ValueType::quantity: return resolve_quantity(key, value, at, path);
      case ValueType::text:
        if (!require_scalar(key, value, at, path)) return std::nullopt;
        return YAML::Node(value.Scalar());
      case ValueType::path: return resolve_path(key, value, at, path);
      case ValueType::flag: {
        if (!require_scalar(key, value, at, path)) return std::nullopt;
        const std::string& s = value.Scalar();
        if (s != "true" && s != "false") {
          error(at, path, fmt::format("got \"{}\"", s), "true or false");
          return std::nullopt;
        }
        return YAML::Node(s);
      }
      case ValueType::option: {
        if (!require_scalar(key, value, at, path)) return std::nullopt;
        const std::string& s = value.Scalar();
        if (std::find(key.options.begin(), key.options.end(), s) == key.options.end()) {
          error(at, path, fmt::format("unknown value \"{}\"{}", s, suggestion(s, key.options)), expect_value(key));
          return std::nullopt;
        }
        return YAML::Node(s);
      }
      case ValueType::option_list: return resolve_option_list(key, value, at, path);
      case ValueType::number_list: return resolve_number_list(key, value, at, path);
    }
    return std::nullopt;
  }

  std::optional<YAML::Node> resolve_number(const Key& key, const YAML::Node& value, const Where& at,
                                           const std::string& path) {
    if (!require_scalar(key, value, at, path)) return std::nullopt;
    const auto x = parse_real(value.Scalar());
    if (!x) {
      error(at, path, fmt::format("\"{}\" is not a finite number", value.Scalar()), expect_value(key));
      return std::nullopt;
    }
    if (!key.range.contains(*x)) {
      error(at, path, fmt::format("{} is out of range", format_real(*x)), expect_value(key));
      return std::nullopt;
    }
    return YAML::Node(format_real(*x));
  }

  std::optional<YAML::Node> resolve_integer(const Key& key, const YAML::Node& value, const Where& at,
                                            const std::string& path) {
    if (!require_scalar(key, value, at, path)) return std::nullopt;
    const auto n = parse_whole(value.Scalar());
    if (!n) {
      error(at, path, fmt::format("\"{}\" is not a whole number", value.Scalar()), expect_value(key));
      return std::nullopt;
    }
    if (!key.range.contains(static_cast<double>(*n))) {
      error(at, path, fmt::format("{} is out of range", *n), expect_value(key));
      return std::nullopt;
    }
    return YAML::Node(fmt::format("{}", *n));
  }

  std::optional<YAML::Node> resolve_quantity(const Key& key, const YAML::Node& value, const Where& at,
                                             const std::string& path) {
    if (!require_scalar(key, value, at, path)) return std::nullopt;
    try {
      const units::Quantity q = units::parse_quantity(value.Scalar(), key.kind, key.sign);
      const double in_range_unit = units::in_unit(q.value, key.unit, key.kind);
      if (!key.range.contains(in_range_unit)) {
        const std::string shown = units::format_quantity(q.number, q.unit);
        error(at, path,
              q.unit == key.unit
                  ? shown + " is out of range"
                  : fmt::format("{} ({} {}) is out of range", shown, format_real(in_range_unit), key.unit),
              expect_value(key));
        return std::nullopt;
      }
      return YAML::Node(units::format_quantity(q.number, q.unit));
    } catch (const units::QuantityError& e) {
      error(at, path, e.problem(), e.expected());
      return std::nullopt;
    }
  }

  std::optional<YAML::Node> resolve_path(const Key& key, const YAML::Node& value, const Where& at,
                                         const std::string& path) {
    if (!require_scalar(key, value, at, path)) return std::nullopt;
    const std::string& s = value.Scalar();
    if (s.empty()) {
      error(at, path, "an empty path", expect_value(key));
      return std::nullopt;
    }
    if (!key.input_file) return YAML::Node(s);
    std::filesystem::path p(s);
    if (p.is_relative()) p = context_.base_directory / p;
    p = p.lexically_normal();
    std::error_code ec;
    const auto status = std::filesystem::status(p, ec);
    if (ec || !std::filesystem::exists(status)) {
      error(at, path, fmt::format("no file at \"{}\"", p.string()),
            expect_value(key) + " (relative paths start at the scenario's folder)");
      return std::nullopt;
    }
    if (!std::filesystem::is_regular_file(status)) {
      error(at, path,
            fmt::format("\"{}\" is {}", p.string(),
                        std::filesystem::is_directory(status) ? "a directory" : "not a regular file"),
            expect_value(key));
      return std::nullopt;
    }
    return YAML::Node(std::filesystem::absolute(p, ec).lexically_normal().string());
  }

  std::optional<YAML::Node> resolve_option_list(const Key& key, const YAML::Node& value, const Where& at,
                                                const std::string& path) {
    if (!value.IsSequence()) {
      error(at, path, fmt::format("got {}", node_kind(value)), expect_value(key) + ", written as [a, b]");
      return std::nullopt;
    }
    YAML::Node out(YAML::NodeType::Sequence);
    std::vector<std::string> seen;
    bool ok = true;
    for (std::size_t i = 0; i < value.size(); ++i) {
      const YAML::Node item = value[i];
      const Where item_at = where_of(item, at.mark);
      const std::string item_path = fmt::format("{}[{}]", path, i);
      if (!item.IsScalar()) {
        error(item_at, item_path, fmt::format("got {}", node_kind(item)), "one of " + join_alternatives(key.options));
        ok = false;
        continue;
      }
      const std::string& s = item.Scalar();
      if (std::find(key.options.begin(), key.options.end(), s) == key.options.end()) {
        error(item_at, item_path, fmt::format("unknown value \"{}\"{}", s, suggestion(s, key.options)),
              "one of " + join_alternatives(key.options));
        ok = false;
      } else if (std::find(seen.begin(), seen.end(), s) != seen.end()) {
        error(item_at, item_path, fmt::format("\"{}\" is listed twice", s), "each value once");
        ok = false;
      } else {
        seen.push_back(s);
        out.push_back(s);
      }
    }
    if (ok && value.size() < key.min_items) {
      error(at, path, fmt::format("a list of {} item(s)", value.size()), fmt::format("at least {}", key.min_items));
      ok = false;
    }
    if (!ok) return std::nullopt;
    out.SetStyle(YAML::EmitterStyle::Flow);
    return out;
  }

  std::optional<YAML::Node> resolve_number_list(const Key& key, const YAML::Node& value, const Where& at,
                                                const std::string& path) {
    if (!value.IsSequence()) {
      error(at, path, fmt::format("got {}", node_kind(value)), expect_value(key) + ", written as [1, 2]");
      return std::nullopt;
    }
    YAML::Node out(YAML::NodeType::Sequence);
    bool ok = true;
    for (std::size_t i = 0; i < value.size(); ++i) {
      const YAML::Node item = value[i];
      const Where item_at = where_of(item, at.mark);
      const std::string item_path = fmt::format("{}[{}]", path, i);
      const auto x = item.IsScalar() ? parse_real(item.Scalar()) : std::nullopt;
      if (!x) {
        error(item_at, item_path, fmt::format("got {}", node_kind(item)), "a number " + key.range.describe());
        ok = false;
      } else if (!key.range.contains(*x)) {
        error(item_at, item_path, fmt::format("{} is out of range", format_real(*x)),
              "a number " + key.range.describe());
        ok = false;
      } else {
        out.push_back(format_real(*x));
      }
    }
    if (ok && value.size() < key.min_items) {
      error(at, path, fmt::format("a list of {} item(s)", value.size()), fmt::format("at least {}", key.min_items));
      ok = false;
    }
    if (!ok) return std::nullopt;
    out.SetStyle(YAML::EmitterStyle::Flow);
    return out;
  }

  // Ordering rules compare resolved values, in internal units for quantities.
  void check_orderings(const Key& spec, const YAML::Node& out,
                       const std::map<std::string, std::pair<YAML::Node, YAML::Mark>>& given, const Where& at,
                       const std::string& path) {
    for (const auto& rule : spec.orderings) {
      const Key* lesser = find_key(spec, rule.lesser);
      const Key* greater = find_key(spec, rule.greater);
      if (!lesser || !greater || !out[rule.lesser] || !out[rule.greater]) continue;
      const double a = internal_value(*lesser, out[rule.lesser].Scalar());
      const double b = internal_value(*greater, out[rule.greater].Scalar());
      if (rule.strict ? a < b : a <= b) continue;
      const auto found = given.find(rule.greater);
      const Where rule_at = found != given.end() ? where_of(found->second.first, found->second.second) : at;
      error(rule_at, join_path(path, rule.greater),
            fmt::format("{} is not {} {} ({})", out[rule.greater].Scalar(), rule.strict ? "above" : "at least",
                        rule.lesser, out[rule.lesser].Scalar()),
            fmt::format("{} {} {}", rule.greater, rule.strict ? ">" : ">=", rule.lesser));
    }
  }

  static const Key* find_key(const Key& spec, const std::string& name) {
    for (const auto& k : spec.children)
      if (k.name == name) return &k;
    for (const auto& v : spec.variants)
      for (const auto& k : v.keys)
        if (k.name == name) return &k;
    return nullptr;
  }

  static double internal_value(const Key& key, const std::string& text) {
    if (key.type == ValueType::quantity) return units::parse_quantity(text, key.kind, units::Sign::any).value;
    return parse_real(text).value_or(0.0);
  }
};

}  // namespace

Resolution resolve(const YAML::Node& document, const Key& schema, const ResolveContext& context) {
  Resolution result;
  Resolver resolver(context, result.errors);
  const Where top{document && !document.Mark().is_null() ? document.Mark() : YAML::Mark()};
  if (!document || document.IsNull()) {
    resolver.error(top, "", "the file is empty",
                   fmt::format("a mapping with keys {}", join_alternatives(key_names(schema), "and")));
  } else {
    result.tree = resolver.mapping(schema, document, top, "");
  }
  std::stable_sort(result.errors.begin(), result.errors.end(), [](const Diagnostic& a, const Diagnostic& b) {
    return a.line != b.line ? a.line < b.line : a.column < b.column;
  });
  return result;
}

}  // namespace ember::scenario
