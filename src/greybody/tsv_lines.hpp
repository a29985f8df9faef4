// What the two greybody table readers (table_io.cpp, kerr_table_io.cpp) share: a line's
// tab-separated fields, the refusal that names file, line and what was expected, and the
// "# key: value" header lines.
#pragma once

#include <map>
#include <string>
#include <vector>

namespace ember::greybody {

std::vector<std::string> split_tabs(const std::string& line);
[[noreturn]] void bad_table_line(const std::string& file, int line, const std::string& what,
                                 const std::string& expected);
// Records "# key: number" in `keys` (a key is one word); other comment lines are ignored.
void read_header_line(const std::string& line, std::map<std::string, double>& keys);

}  // namespace ember::greybody
