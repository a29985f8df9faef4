#include "ember/scenario/load.hpp"

#include <fmt/format.h>

#include <fstream>
#include <sstream>

#include "ember/core/text.hpp"
#include "ember/version.hpp"

namespace ember::scenario {

namespace {

// Scenario files are a few kilobytes; anything this large is a mistake (or hostile).
constexpr std::uintmax_t max_scenario_bytes = 4u << 20;

std::string read_text(const std::filesystem::path& file) {
  std::error_code ec;
  const auto status = std::filesystem::status(file, ec);
  if (ec || !std::filesystem::exists(status))
    throw InputError(fmt::format("{}: no such file; expected a scenario file (.yaml)", file.string()));
  if (std::filesystem::is_directory(status))
    throw InputError(fmt::format("{}: is a directory; expected a scenario file (.yaml)", file.string()));
  const auto size = std::filesystem::file_size(file, ec);
  if (!ec && size > max_scenario_bytes)
    throw InputError(
        fmt::format("{}: {} bytes; expected a scenario file under {} bytes", file.string(), size, max_scenario_bytes));
  std::ifstream in(file, std::ios::binary);
  if (!in) throw InputError(fmt::format("{}: cannot be read; expected a readable scenario file", file.string()));
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

Diagnostic document_error(const std::string& label, const YAML::Mark& mark, std::string problem, std::string expected) {
  Diagnostic d;
  d.file = label;
  d.line = mark.is_null() ? 1 : mark.line + 1;
  d.column = mark.is_null() ? 1 : mark.column + 1;
  d.path = "(document)";
  d.problem = std::move(problem);
  d.expected = std::move(expected);
  return d;
}

}  // namespace

LoadedScenario load_scenario_text(std::string_view text, const std::string& label, const std::filesystem::path& base) {
  std::vector<YAML::Node> documents;
  try {
    documents = YAML::LoadAll(std::string(text));
  } catch (const YAML::ParserException& e) {
    throw ScenarioError({document_error(label, e.mark, "YAML syntax error: " + e.msg, "well-formed YAML")});
  }
  if (documents.size() > 1)
    throw ScenarioError({document_error(label, documents[1].Mark(), fmt::format("{} YAML documents", documents.size()),
                                        "a single document")});

  const Key schema = scenario_schema();
  Resolution r = resolve(documents.empty() ? YAML::Node() : documents.front(), schema, ResolveContext{label, base});
  if (!r.errors.empty()) throw ScenarioError(std::move(r.errors));
  return LoadedScenario{label, r.tree, read_scenario(r.tree)};
}

LoadedScenario load_scenario_file(const std::filesystem::path& file) {
  const std::string text = read_text(file);
  std::filesystem::path base = file.parent_path();
  if (base.empty()) base = ".";
  return load_scenario_text(text, file.string(), base);
}

std::string resolved_yaml(const LoadedScenario& loaded) {
  YAML::Emitter out;
  out << YAML::Comment(
             fmt::format("Resolved by ember {} from {}: every key, defaults filled in.", version, loaded.source))
      << YAML::Newline << loaded.resolved;
  return std::string(out.c_str()) + "\n";
}

namespace {

nlohmann::ordered_json scalar_json(const Key& key, const std::string& text) {
  switch (key.type) {
    case ValueType::number: return parse_real(text).value();
    case ValueType::integer: return parse_whole(text).value();
    case ValueType::flag: return text == "true";
    default: return text;
  }
}

nlohmann::ordered_json tree_json(const Key& spec, const YAML::Node& node) {
  nlohmann::ordered_json out = nlohmann::ordered_json::object();
  std::vector<const Key*> keys;
  for (const auto& k : spec.children) keys.push_back(&k);
  if (spec.type == ValueType::choice) {
    const std::string chosen = node[spec.selector].Scalar();
    out[spec.selector] = chosen;
    for (const auto& v : spec.variants)
      if (v.name == chosen)
        for (const auto& k : v.keys) keys.push_back(&k);
  }
  for (const Key* k : keys) {
    const YAML::Node value = node[k->name];
    if (!value) continue;
    if (k->type == ValueType::section || k->type == ValueType::choice) {
      out[k->name] = tree_json(*k, value);
    } else if (value.IsSequence()) {
      nlohmann::ordered_json list = nlohmann::ordered_json::array();
      for (const auto& item : value)
        list.push_back(k->type == ValueType::number_list ? nlohmann::ordered_json(parse_real(item.Scalar()).value())
                                                         : nlohmann::ordered_json(item.Scalar()));
      out[k->name] = list;
    } else {
      out[k->name] = scalar_json(*k, value.Scalar());
    }
  }
  return out;
}

}  // namespace

nlohmann::ordered_json resolved_json(const YAML::Node& resolved) {
  return tree_json(scenario_schema(), resolved);
}

}  // namespace ember::scenario
