// Reading and writing data/kerr_greybody.tsv.
#include <fmt/format.h>

#include <cmath>
#include <map>
#include <set>
#include <sstream>
#include <tuple>

#include "ember/core/data_files.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/input_file.hpp"
#include "ember/core/text.hpp"
#include "ember/greybody/kerr_table.hpp"
#include "tsv_lines.hpp"

namespace ember::greybody {

std::filesystem::path default_kerr_table_path() {
  return data_file("kerr_greybody.tsv");
}

KerrTable load_default_kerr_table() {
  return load_kerr_table(default_kerr_table_path());
}

namespace {

// As the Schwarzschild table: higher multipoles carry nothing; l above this is a damaged file.
constexpr double kerr_max_l = 30;
constexpr const char* kerr_column_line = "hole_spin\tspin\tl\tm\tx\ttransmission\terror";
// The shipped table is a few MB; a table a hundred times denser still fits.
constexpr std::uintmax_t max_kerr_table_bytes = 1024u << 20;

[[noreturn]] void kerr_bad(const std::string& file, int line, const std::string& what, const std::string& expected) {
  bad_table_line(file, line, what, expected);
}

}  // namespace

KerrTable load_kerr_table(const std::filesystem::path& file) {
  return parse_kerr_table(
      read_input_file(file, "the Kerr greybody table (rebuild it with `ember greybody --rebuild-kerr`)",
                      max_kerr_table_bytes),
      file.string());
}

KerrTable parse_kerr_table(std::string_view text, const std::string& file) {
  std::istringstream in{std::string(text)};
  std::map<std::string, double> keys;
  std::vector<KerrTableRow> rows;
  std::set<std::tuple<double, int, int, int>> seen;
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
      if (line != kerr_column_line)
        kerr_bad(file, number, "unexpected column line", std::string("the columns ") + kerr_column_line);
      columns_seen = true;
      continue;
    }
    const auto f = split_tabs(line);
    if (f.size() != 7) kerr_bad(file, number, fmt::format("{} fields", f.size()), "7 tab-separated fields");
    double v[7];
    for (std::size_t i = 0; i < 7; ++i) {
      const auto x = parse_real(f[i]);
      if (!x) kerr_bad(file, number, fmt::format("field {} is \"{}\"", i + 1, f[i]), "a finite number");
      v[i] = *x;
    }
    if (!(v[0] >= 0 && v[0] < 1)) kerr_bad(file, number, fmt::format("hole_spin {}", f[0]), "0 <= a* < 1");
    const int ts = std::abs(v[1]) <= 2 ? static_cast<int>(std::lround(2 * v[1])) : -1;
    if (2 * v[1] != ts || (ts != 0 && ts != 1 && ts != 2 && ts != 4))
      kerr_bad(file, number, fmt::format("spin {}", f[1]), "0, 0.5, 1 or 2");
    const int tl = std::abs(v[2]) <= kerr_max_l ? static_cast<int>(std::lround(2 * v[2])) : -1;
    const int tm = std::abs(v[3]) <= kerr_max_l ? static_cast<int>(std::lround(2 * v[3])) : 1000;
    if (2 * v[2] != tl || tl < ts || (tl - ts) % 2 != 0)
      kerr_bad(file, number, fmt::format("l {} for spin {}", f[2], f[1]),
               fmt::format("l >= s, in integer steps from s, at most {}", kerr_max_l));
    if (2 * v[3] != tm || std::abs(tm) > tl || (tl - tm) % 2 != 0)
      kerr_bad(file, number, fmt::format("m {} for l {}", f[3], f[2]), "m in -l, -l+1, .., l");
    if (!(v[4] > 0)) kerr_bad(file, number, fmt::format("x {}", f[4]), "x > 0");
    if (!(std::abs(v[5]) < 1e3)) kerr_bad(file, number, fmt::format("transmission {}", f[5]), "|Gamma| < 1000");
    if (!(v[6] >= 0)) kerr_bad(file, number, fmt::format("error {}", f[6]), "an error >= 0");
    const auto key = std::make_tuple(v[0], ts, tl, tm);
    const bool same = !rows.empty() && std::make_tuple(rows.back().hole_spin, rows.back().twice_spin,
                                                       rows.back().twice_l, rows.back().twice_m) == key;
    if (!same && !seen.insert(key).second)
      kerr_bad(file, number, fmt::format("a* {}, spin {}, l {}, m {} again", f[0], f[1], f[2], f[3]),
               "each mode's rows together, once");
    rows.push_back({v[0], ts, tl, tm, v[4], v[5], v[6]});
  }
  if (rows.empty()) kerr_bad(file, number, "no rows", "the Kerr greybody table's rows");
  if (rows.front().hole_spin != 0.0)
    kerr_bad(file, number, fmt::format("first node a* = {}", rows.front().hole_spin), "a* = 0 first");
  for (const char* key : {"x_min", "points_per_mode", "solver_tolerance", "interpolation_error"})
    if (!keys.count(key))
      kerr_bad(file, 1, fmt::format("no \"# {}:\" header line", key), "the header the table was written with");
  KerrTableHeader header;
  header.x_min = keys["x_min"];
  const double points = keys["points_per_mode"];
  if (!(points >= 4 && points <= 1e6 && points == std::floor(points)))
    kerr_bad(file, 1, fmt::format("points_per_mode {}", points), "a whole number from 4 to 1000000");
  header.points_per_mode = static_cast<int>(points);
  header.solver_tolerance = keys["solver_tolerance"];
  header.interpolation_error = keys["interpolation_error"];
  if (!(header.x_min > 0 && header.solver_tolerance > 0 && header.solver_tolerance < 1 &&
        header.interpolation_error >= 0 && header.interpolation_error < 1))
    kerr_bad(file, 1,
             fmt::format("x_min {}, solver_tolerance {}, interpolation_error {}", header.x_min, header.solver_tolerance,
                         header.interpolation_error),
             "x_min > 0, a solver_tolerance in (0, 1) and an interpolation_error in [0, 1)");
  try {
    return KerrTable(header, std::move(rows));
  } catch (const InputError& e) {
    throw InputError(fmt::format("{}: {}", file, e.what()));
  }
}

std::string format_kerr_table(const KerrTable& table, const std::vector<std::string>& notes) {
  const KerrTableHeader& h = table.header();
  std::string out =
      "# Ember Kerr greybody table: transmission probabilities Gamma_{s,l,m}(x) of a rotating black hole\n"
      "# of spin a* = J c / (G M^2) for massless fields of spin 0, 1/2, 1 and 2, solved from the\n"
      "# Teukolsky radial equation with computed spin-weighted spheroidal eigenvalues.\n"
      "# Generated by `ember greybody --rebuild-kerr`; the file that ships is the one that command writes.\n"
      "#\n"
      "# Units: G = c = hbar = M = 1; x = G M omega / c^3; Gamma is dimensionless.\n"
      "# Columns (tab-separated):\n"
      "#   hole_spin     a*, the node\n"
      "#   spin          0, 0.5, 1 or 2\n"
      "#   l             spheroidal l (spins 0, 1, 2) or j (spin 1/2)\n"
      "#   m             azimuthal number, -l .. l; m > 0 co-rotates with the hole\n"
      "#   x             G M omega / c^3\n"
      "#   transmission  Gamma, the absorbed share of the incident flux; negative where a boson mode is\n"
      "#                 superradiant (x < m Omega_H)\n"
      "#   error         estimated absolute error of Gamma (a looser solve, the matching radius, the series)\n"
      "# Method: purely ingoing horizon series, Runge-Kutta-Fehlberg 7(8) outward in ln(r - r_+),\n"
      "#   decomposed far out into the asymptotic series; flux factors from the conserved Wronskian\n"
      "#   and the Teukolsky-Starobinsky identities.\n"
      "# Grid: per mode, points_per_mode x uniform in ln x + x / (4 T_H) from x_min to\n"
      "#   max(m Omega_H, 0) + 72 T_H; l run until a further l adds < 1e-6 of the spin's power.\n"
      "# Interpolation: natural cubic spline of ln G in ln x, G = Gamma x / (x - m Omega_H) for bosons\n"
      "#   and Gamma for spin 1/2; interpolation_error is twice the largest relative deviation from\n"
      "#   direct solves at every interval midpoint. Below x_min: G = C x^p from the first interval.\n";
  for (const auto& n : notes) out += "# " + n + "\n";
  out += fmt::format("# x_min: {}\n# points_per_mode: {}\n# solver_tolerance: {}\n# interpolation_error: {}\n",
                     format_real(h.x_min), h.points_per_mode, format_real(h.solver_tolerance),
                     fmt::format("{:.2e}", h.interpolation_error));
  out += std::string(kerr_column_line) + "\n";
  for (const auto& r : table.rows())
    out += fmt::format("{}\t{}\t{}\t{}\t{:.12e}\t{:.12e}\t{:.2e}\n", format_real(r.hole_spin),
                       format_real(0.5 * r.twice_spin), format_real(0.5 * r.twice_l), format_real(0.5 * r.twice_m), r.x,
                       r.transmission, r.error);
  return out;
}

}  // namespace ember::greybody
