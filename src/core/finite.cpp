#include "ember/core/finite.hpp"

#include <fmt/format.h>

#include <cctype>
#include <cmath>

#include "ember/core/errors.hpp"

namespace ember {

void throw_non_finite(double value, std::string_view module, std::string_view what, std::string_view inputs,
                      std::string_view hint) {
  throw NumericalError(std::string(module), fmt::format("{} = {} for {}; try {}", what, value, inputs, hint));
}

namespace {

void walk(const nlohmann::ordered_json& j, const std::string& path, std::string_view document) {
  if (j.is_number_float() && !std::isfinite(j.get<double>()))
    throw NumericalError("output", fmt::format("{}: {} = {}; a non-finite value reached the output (a bug: please "
                                               "report it with the scenario)",
                                               document, path.empty() ? "(top)" : path, j.get<double>()));
  if (j.is_object())
    for (const auto& [key, value] : j.items()) walk(value, path.empty() ? key : path + "." + key, document);
  else if (j.is_array())
    for (std::size_t i = 0; i < j.size(); ++i) walk(j[i], fmt::format("{}[{}]", path, i), document);
}

bool word_char(char c) {
  return std::isalnum(static_cast<unsigned char>(c)) || c == '_';
}

// A standalone "nan", "inf" or "infinity" (any case, any sign), as printf writes them.
bool non_finite_token(std::string_view text, std::size_t at) {
  for (const std::string_view word : {"infinity", "nan", "inf"}) {
    if (at + word.size() > text.size()) continue;
    bool same = true;
    for (std::size_t k = 0; k < word.size() && same; ++k)
      same = std::tolower(static_cast<unsigned char>(text[at + k])) == word[k];
    if (same && (at == 0 || !word_char(text[at - 1])) &&
        (at + word.size() == text.size() || !word_char(text[at + word.size()])))
      return true;
  }
  return false;
}

}  // namespace

void require_finite_json(const nlohmann::ordered_json& j, std::string_view document) {
  walk(j, "", document);
}

void require_finite_text(std::string_view text, std::string_view document) {
  std::size_t line = 1, line_start = 0;
  for (std::size_t i = 0; i < text.size(); ++i) {
    if (text[i] == '\n') {
      ++line;
      line_start = i + 1;
      continue;
    }
    // Comment lines carry the user's own words (a title, a path); only data lines are checked.
    if (text[line_start] == '#') continue;
    if (non_finite_token(text, i))
      throw NumericalError(
          "output",
          fmt::format("{}:{}: a non-finite value in \"{}\" (a bug: please report it with "
                      "the scenario)",
                      document, line, text.substr(line_start, std::min<std::size_t>(120, text.size() - line_start))));
  }
}

}  // namespace ember
