#include "ember/scenario/load.hpp"

#include <fmt/format.h>
#include <yaml-cpp/depthguard.h>

#include <fstream>
#include <sstream>

#include "document_guards.hpp"
#include "ember/core/hash.hpp"
#include "ember/core/input_file.hpp"
#include "ember/core/text.hpp"
#include "ember/cosmology/degrees_of_freedom.hpp"
#include "ember/higgs/potential.hpp"
#include "ember/population/mass_function.hpp"
#include "ember/version.hpp"

namespace ember::scenario {

namespace {

// Scenario files are a few kilobytes; anything this large is a mistake (or hostile).
constexpr std::uintmax_t max_scenario_bytes = 4u << 20;

std::string read_text(const std::filesystem::path& file) {
  return read_input_file(file, "a scenario file (.yaml)", max_scenario_bytes);
}

// The mark of a key in the document as written, for a message about a file it names.
YAML::Mark mark_of(const YAML::Node& document, std::initializer_list<const char*> path) {
  YAML::Node n = document;
  for (const char* key : path) {
    if (!n.IsMap() || !n[key]) return n.Mark();
    n = n[key];
  }
  return n.Mark();
}

// Tables the scenario names are read now, so `ember check` and the start of `ember run` refuse
// an unusable one with the scenario's line and key as well as the table's own line.
void check_tables(const YAML::Node& document, const Scenario& s, const std::string& label) {
  std::vector<Diagnostic> errors;
  const auto attempt = [&](std::initializer_list<const char*> path, const std::string& key, const auto& read) {
    try {
      read();
    } catch (const InputError& e) {
      // The table's message is "FILE:LINE: problem; expected ..."; keep its two halves.
      const std::string what = e.what();
      const auto split = what.rfind("; expected ");
      Diagnostic d =
          document_error(label, mark_of(document, path), "the table it names is unusable: " + what.substr(0, split),
                         split == std::string::npos ? std::string("a usable table") : what.substr(split + 11));
      d.path = key;
      errors.push_back(std::move(d));
    }
  };
  if (const auto* t = std::get_if<TabulatedSpectrum>(&s.population.spectrum))
    attempt({"population", "spectrum", "file"}, "population.spectrum.file",
            [&] { (void)population::tabulated(t->file.string(), t->mass_unit); });
  if (const auto* t = std::get_if<TabulatedForm>(&s.standard_model.potential))
    attempt({"standard_model", "potential", "file"}, "standard_model.potential.file",
            [&] { (void)higgs::TabulatedPotential(t->file); });
  if (s.dof_table)
    attempt({"cosmology", "dof_table"}, "cosmology.dof_table",
            [&] { (void)cosmology::DegreesOfFreedom::load(*s.dof_table); });
  if (!errors.empty()) throw ScenarioError(std::move(errors));
}

}  // namespace

LoadedScenario load_scenario_text(std::string_view text, const std::string& label, const std::filesystem::path& base) {
  check_printable(text, label);
  check_commas(text, label);
  std::vector<YAML::Node> documents;
  try {
    documents = YAML::LoadAll(std::string(text));
  } catch (const YAML::DeepRecursion& e) {
    throw ScenarioError({document_error(label, e.mark, fmt::format("values nested {} levels deep", e.depth()),
                                        fmt::format("a scenario (its sections nest at most 4 levels deep)"))});
  } catch (const YAML::ParserException& e) {
    throw ScenarioError({document_error(label, e.mark, "YAML syntax error: " + e.msg, "well-formed YAML")});
  }
  for (const auto& document : documents) check_document_size(document, label);
  if (documents.size() > 1)
    throw ScenarioError({document_error(label, documents[1].Mark(), fmt::format("{} YAML documents", documents.size()),
                                        "a single document")});

  const Key schema = scenario_schema();
  Resolution r = resolve(documents.empty() ? YAML::Node() : documents.front(), schema, ResolveContext{label, base});
  if (!r.errors.empty()) throw ScenarioError(std::move(r.errors));
  Scenario scenario = read_scenario(r.tree);
  check_tables(documents.front(), scenario, label);
  return LoadedScenario{label, r.tree, std::move(scenario)};
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

std::string scenario_hash(const LoadedScenario& l) {
  return fingerprint(YAML::Dump(l.resolved));
}

}  // namespace ember::scenario
