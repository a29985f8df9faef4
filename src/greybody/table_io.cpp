// Reading and writing data/greybody.tsv.
#include <fmt/format.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <map>
#include <set>
#include <sstream>

#include "ember/core/data_files.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/input_file.hpp"
#include "ember/core/text.hpp"
#include "ember/greybody/table.hpp"
#include "tsv_lines.hpp"

namespace ember::greybody {

std::filesystem::path default_table_path() {
  return data_file("greybody.tsv");
}

Table load_default_table() {
  return load_table(default_table_path());
}

namespace {

// Higher multipoles carry nothing at any x the table reaches (Gamma ~ x^(2l+2)); l above this is
// a damaged file, and its power would overflow.
constexpr double max_l = 30;

constexpr const char* column_line = "spin\tl\tx\ttransmission\treflection\terror";

[[noreturn]] void bad(const std::string& file, int line, const std::string& what, const std::string& expected) {
  bad_table_line(file, line, what, expected);
}

}  // namespace

// The shipped table is ~200 kB; a table a thousand times denser still fits.
constexpr std::uintmax_t max_table_bytes = 256u << 20;

Table load_table(const std::filesystem::path& file) {
  return parse_table(
      read_input_file(file, "the greybody table (rebuild it with `ember greybody --rebuild`)", max_table_bytes),
      file.string());
}

Table parse_table(std::string_view text, const std::string& file) {
  std::istringstream in{std::string(text)};
  TableHeader header;
  std::map<std::string, double> keys;
  std::vector<TableRow> rows;
  std::set<std::pair<int, int>> modes_seen;
  std::string line;
  int number = 0;
  bool columns_seen = false;
  while (std::getline(in, line)) {
    ++number;
    if (line.empty()) continue;
    if (line[0] == '#') {
      read_header_line(line, keys);
      continue;
    }
    if (!columns_seen) {
      if (line != column_line) bad(file, number, "unexpected column line", std::string("the columns ") + column_line);
      columns_seen = true;
      continue;
    }
    const auto f = split_tabs(line);
    if (f.size() != 6) bad(file, number, fmt::format("{} fields", f.size()), "6 tab-separated fields");
    double v[6];
    for (int i = 0; i < 6; ++i) {
      const auto x = parse_real(f[static_cast<std::size_t>(i)]);
      if (!x)
        bad(file, number, fmt::format("field {} is \"{}\"", i + 1, f[static_cast<std::size_t>(i)]), "a finite number");
      v[i] = *x;
    }
    const int ts = std::abs(v[0]) <= 2 ? static_cast<int>(std::lround(2 * v[0])) : -1;
    const int tl = std::abs(v[1]) <= max_l ? static_cast<int>(std::lround(2 * v[1])) : -1;
    if (2 * v[0] != ts || (ts != 0 && ts != 1 && ts != 2 && ts != 4))
      bad(file, number, fmt::format("spin {}", f[0]), "0, 0.5, 1 or 2");
    if (!(v[1] >= 0 && v[1] <= max_l) || 2 * v[1] != tl || tl < ts || (tl - ts) % 2 != 0)
      bad(file, number, fmt::format("l {} for spin {}", f[1], f[0]),
          fmt::format("l >= s, in integer steps from s, at most {}", max_l));
    if (!(v[2] > 0)) bad(file, number, fmt::format("x {}", f[2]), "x > 0");
    if (!(v[3] > 0 && v[3] <= 1 + 1e-6)) bad(file, number, fmt::format("transmission {}", f[3]), "0 < Gamma <= 1");
    if (!(v[4] > 0 && v[4] <= 1)) bad(file, number, fmt::format("reflection {}", f[4]), "0 < |R|^2 <= 1");
    if (!(v[5] >= 0)) bad(file, number, fmt::format("error {}", f[5]), "an error >= 0");
    const bool same_mode = !rows.empty() && rows.back().twice_spin == ts && rows.back().twice_l == tl;
    if (same_mode && !(std::log(v[2]) > std::log(rows.back().x)))
      bad(file, number, fmt::format("x {} after {}", f[2], rows.back().x), "x increasing within a mode");
    if (!same_mode && !modes_seen.insert({ts, tl}).second)
      bad(file, number, fmt::format("spin {}, l {} again", f[0], f[1]), "each mode's rows together, once");
    rows.push_back({ts, tl, v[2], v[3], v[4], v[5]});
  }
  if (rows.empty()) bad(file, number, "no rows", "the greybody table's rows");
  for (const char* key : {"x_min", "x_max", "points_per_mode", "solver_tolerance", "interpolation_error"})
    if (!keys.count(key))
      bad(file, 1, fmt::format("no \"# {}:\" header line", key), "the header the table was written with");
  header.x_min = keys["x_min"];
  header.x_max = keys["x_max"];
  if (!(header.x_min > 0 && header.x_max > header.x_min))
    bad(file, 1, fmt::format("x_min {}, x_max {}", header.x_min, header.x_max), "0 < x_min < x_max");
  const double points = keys["points_per_mode"];
  if (!(points >= 4 && points <= 1e6 && points == std::floor(points)))
    bad(file, 1, fmt::format("points_per_mode {}", points), "a whole number from 4 to 1000000");
  header.points_per_mode = static_cast<int>(points);
  header.solver_tolerance = keys["solver_tolerance"];
  header.interpolation_error = keys["interpolation_error"];
  if (!(header.solver_tolerance > 0 && header.solver_tolerance < 1 && header.interpolation_error >= 0 &&
        header.interpolation_error < 1))
    bad(file, 1,
        fmt::format("solver_tolerance {}, interpolation_error {}", header.solver_tolerance, header.interpolation_error),
        "a solver_tolerance in (0, 1) and an interpolation_error in [0, 1)");
  try {
    return Table(header, std::move(rows));
  } catch (const InputError& e) {
    throw InputError(fmt::format("{}: {}", file, e.what()));
  }
}

std::string format_table(const Table& table, const std::vector<std::string>& notes) {
  const TableHeader& h = table.header();
  std::string out =
      "# Ember greybody table: transmission probabilities Gamma_{s,l}(x) of a Schwarzschild black hole\n"
      "# for massless fields of spin 0, 1/2, 1 and 2, solved from the radial wave equations.\n"
      "# Generated by `ember greybody --rebuild`; the file that ships is the one that command writes.\n"
      "#\n"
      "# Units: G = c = hbar = 1; x = G M omega / c^3; Gamma and |R|^2 are dimensionless.\n"
      "# Columns (tab-separated):\n"
      "#   spin          0, 0.5, 1 or 2\n"
      "#   l             orbital l (spins 0, 1, 2) or total angular momentum j (spin 1/2)\n"
      "#   x             G M omega / c^3\n"
      "#   transmission  Gamma = 1/|A_in|^2, with unit amplitude at the horizon\n"
      "#   reflection    |R|^2 = |A_out|^2/|A_in|^2 (Gamma + |R|^2 = 1 up to the solver's error)\n"
      "#   error         estimated absolute error of Gamma\n"
      "# Potentials: Regge-Wheeler for spins 0, 1 and 2 (axial); W^2 + dW/dr* for spin 1/2.\n"
      "# Method: purely ingoing wave at the horizon, Runge-Kutta-Fehlberg 7(8) outward in ln(r/2M - 1),\n"
      "#   decomposed far out into the asymptotic series e^{-+i w r*} sum c_n r^-n; the error combines\n"
      "#   a 100x looser solve, a second matching radius, the series truncation and the horizon start.\n"
      "# Grid: each mode on points_per_mode log-uniform x in [x_min, x_max], stopping once 1 - Gamma\n"
      "#   < 1e-14 (Gamma = 1 beyond); each spin's l run until a further l adds < 1e-6 of its power.\n"
      "# Interpolation: natural cubic spline of ln(Gamma/|R|^2) in ln x; interpolation_error is the\n"
      "#   stated relative error, twice the largest deviation from direct solves at every interval\n"
      "#   midpoint. Below x_min: Gamma = C x^p (p = 2l+2, or 2j+1 for spin 1/2), C fitted at x_min.\n";
  for (const auto& n : notes) out += "# " + n + "\n";
  out += fmt::format(
      "# x_min: {}\n# x_max: {}\n# points_per_mode: {}\n# solver_tolerance: {}\n# interpolation_error: {}\n",
      format_real(h.x_min), format_real(h.x_max), h.points_per_mode, format_real(h.solver_tolerance),
      fmt::format("{:.2e}", h.interpolation_error));
  out += std::string(column_line) + "\n";
  for (const auto& r : table.rows())
    out += fmt::format("{}\t{}\t{:.12e}\t{:.12e}\t{:.12e}\t{:.3e}\n", format_real(0.5 * r.twice_spin),
                       format_real(0.5 * r.twice_l), r.x, r.transmission, r.reflection, r.error);
  return out;
}

}  // namespace ember::greybody
