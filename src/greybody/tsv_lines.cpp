#include "tsv_lines.hpp"

#include <fmt/format.h>

#include <sstream>

#include "ember/core/errors.hpp"
#include "ember/core/text.hpp"

namespace ember::greybody {

std::vector<std::string> split_tabs(const std::string& line) {
  std::vector<std::string> out;
  std::string field;
  std::istringstream in(line);
  while (std::getline(in, field, '\t')) out.push_back(trim(field));
  return out;
}

void bad_table_line(const std::string& file, int line, const std::string& what, const std::string& expected) {
  throw InputError(fmt::format("{}:{}: {}; expected {}", file, line, printable(what), expected));
}

void read_header_line(const std::string& line, std::map<std::string, double>& keys) {
  const auto colon = line.find(':');
  const std::string key = trim(line.substr(1, colon == std::string::npos ? 0 : colon - 1));
  if (colon != std::string::npos && key.find(' ') == std::string::npos && !key.empty())
    if (const auto v = parse_real(trim(line.substr(colon + 1)))) keys[key] = *v;
}

}  // namespace ember::greybody
