#include "document_guards.hpp"

#include <fmt/format.h>
#include <yaml-cpp/depthguard.h>

#include <cctype>
#include <vector>

#include "ember/core/text.hpp"

namespace ember::scenario {

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

}  // namespace ember::scenario
