#include "ember/scenario/load.hpp"

#include <fmt/format.h>
#include <yaml-cpp/depthguard.h>

#include <cctype>
#include <fstream>
#include <sstream>

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

// Guards against hostile documents (a YAML bomb): deeper nesting than any scenario has, or
// anchors and aliases that expand to more values than any scenario needs. The walk stops at the
// first limit, so the cost is bounded by the limits, not by the expansion.
constexpr int max_document_depth = 32;        // the schema is at most 4 levels deep
constexpr long max_document_values = 100000;  // the largest scenarios hold a few hundred values

void check_document_size(const YAML::Node& root, const std::string& label) {
  struct Item {
    YAML::Node node;
    int depth;
  };
  std::vector<Item> stack{{root, 1}};
  long values = 0;
  while (!stack.empty()) {
    const Item item = stack.back();
    stack.pop_back();
    if (++values > max_document_values)
      throw ScenarioError({document_error(label, item.node.Mark(),
                                          fmt::format("the document expands to more than {} values (anchors repeated "
                                                      "through aliases?)",
                                                      max_document_values),
                                          "a scenario of at most a few thousand values")});
    if (item.depth > max_document_depth)
      throw ScenarioError({document_error(label, item.node.Mark(),
                                          fmt::format("values nested more than {} levels deep", max_document_depth),
                                          "a scenario (its sections nest at most 4 levels deep)")});
    if (item.node.IsSequence())
      for (const auto& child : item.node) stack.push_back({child, item.depth + 1});
    else if (item.node.IsMap())
      for (const auto& kv : item.node) {
        stack.push_back({kv.first, item.depth + 1});
        stack.push_back({kv.second, item.depth + 1});
      }
  }
}

// YAML streams hold printable characters only (YAML 1.2, sec. 5.1, c-printable): of the C0
// controls, tab, line feed and carriage return. yaml-cpp 0.7 can loop without bound, allocating
// as it goes, on a NUL byte inside a block (found by fuzzing, tests/fuzz/regressions/scenario),
// so any other control byte is refused before yaml-cpp sees the text.
void check_printable(std::string_view text, const std::string& label) {
  int line = 1, column = 1;
  const auto refuse = [&](std::string problem, std::string expected) {
    YAML::Mark mark;
    mark.line = line - 1;
    mark.column = column - 1;
    throw ScenarioError({document_error(label, mark, std::move(problem), std::move(expected))});
  };
  for (std::size_t i = 0; i < text.size();) {
    const char c = text[i];
    const auto byte = static_cast<unsigned char>(c);
    if ((byte < 0x20 && c != '\t' && c != '\n' && c != '\r') || byte == 0x7f)
      refuse(fmt::format("control character 0x{:02x}", byte),
             "printable text (of the control characters, YAML allows only tab, line feed and carriage return)");
    // YAML streams are Unicode (YAML 1.2, sec. 5.2); a stray byte would reach names and outputs.
    const std::size_t n = utf8_length_at(text, i);
    if (n == 0) refuse(fmt::format("byte 0x{:02x} is not valid UTF-8", byte), "UTF-8 text");
    if (c == '\n') {
      ++line;
      column = 1;
    } else {
      ++column;
    }
    i += n;
  }
}

// yaml-cpp 0.7 loops without end on a ',' outside flow brackets that is not inside a plain
// scalar: where a node starts (",'x'", "- a\n, x", "&a ,x") or right after a whole node at the
// top ("'',", "[a],"), all found by fuzzing (tests/fuzz/regressions/scenario). YAML never allows
// a ',' there (1.2, secs. 7.3.3 and 8.2), so it is refused first. The scan follows comments,
// quoted scalars, anchors, tags and flow brackets just far enough to know where nodes start and end.
void check_commas(std::string_view text, const std::string& label) {
  int line = 1, column = 0, flow = 0;
  bool node_start = true;  // only blanks since a place where a node may start
  bool in_plain = false;   // inside a plain scalar, the one place outside brackets a ',' may be
  const auto refuse = [&] {
    YAML::Mark mark;
    mark.line = line - 1;
    mark.column = column - 1;
    throw ScenarioError({document_error(label, mark, "a ',' outside brackets and outside a plain value",
                                        "',' only between items in brackets or inside a plain value (quote a value "
                                        "that needs it)")});
  };
  const auto word_end = [&](std::size_t& i) {  // skip an anchor, tag or alias name
    while (i + 1 < text.size() && !std::isspace(static_cast<unsigned char>(text[i + 1])) && text[i + 1] != ',' &&
           text[i + 1] != '[' && text[i + 1] != ']' && text[i + 1] != '{' && text[i + 1] != '}')
      ++i, ++column;
  };
  const auto plain_start = [](char c) {  // YAML 1.2 sec. 7.3.3: not an indicator
    return std::string_view(",[]{}#&*!|>'\"%@`").find(c) == std::string_view::npos;
  };
  for (std::size_t i = 0; i < text.size(); ++i) {
    const char c = text[i];
    ++column;
    if (c == '\n') {
      ++line;
      column = 0;
      node_start = true;
      in_plain = false;
      continue;
    }
    if (c == ' ' || c == '\t' || c == '\r') continue;
    const bool after_blank = i == 0 || text[i - 1] == ' ' || text[i - 1] == '\t' || text[i - 1] == '\n';
    if (c == '#' && after_blank) {  // a comment, to the end of the line
      while (i + 1 < text.size() && text[i + 1] != '\n') ++i;
      continue;
    }
    if (c == ',' && flow == 0 && !in_plain) refuse();
    if (node_start && (c == '\'' || c == '"')) {  // a quoted scalar, to its closing quote
      for (++i; i < text.size(); ++i) {
        ++column;
        if (text[i] == '\n') {
          ++line;
          column = 0;
        }
        if (c == '"' && text[i] == '\\') {
          ++i, ++column;
        } else if (text[i] == c && !(c == '\'' && i + 1 < text.size() && text[i + 1] == '\'')) {
          break;
        } else if (c == '\'' && text[i] == '\'') {
          ++i, ++column;
        }
      }
      node_start = in_plain = false;
      continue;
    }
    if (node_start && (c == '&' || c == '!')) {  // an anchor or tag: the node itself follows
      word_end(i);
      continue;
    }
    if (node_start && c == '*') {  // an alias: a whole node
      word_end(i);
      node_start = in_plain = false;
      continue;
    }
    const bool indicator_then_blank = (c == '-' || c == ':' || c == '?') &&
                                      (i + 1 == text.size() || std::isspace(static_cast<unsigned char>(text[i + 1])));
    if (c == '[' || c == '{') ++flow;
    if ((c == ']' || c == '}') && flow > 0) --flow;
    if (node_start && !indicator_then_blank && plain_start(c)) in_plain = true;
    if (indicator_then_blank || ((c == ']' || c == '}') && flow == 0)) in_plain = false;
    node_start = indicator_then_blank || c == '[' || c == '{' || (c == ',' && flow > 0);
  }
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
  if (const auto* t = std::get_if<TabulatedPotential>(&s.standard_model.potential))
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

}  // namespace ember::scenario
