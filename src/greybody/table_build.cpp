// Building the greybody table from direct solves (`ember greybody --rebuild`).
#include <fmt/format.h>

#include <chrono>
#include <cmath>

#include "ember/core/errors.hpp"
#include "ember/core/progress.hpp"
#include "ember/greybody/emission.hpp"
#include "ember/greybody/table.hpp"

namespace ember::greybody {

void BuildOptions::validate() const {
  const auto require = [](bool ok, const char* field, const std::string& rule) {
    if (!ok) throw InputError(fmt::format("greybody table options: {}: {}", field, rule));
  };
  require(x_min > 0 && std::isfinite(x_min), "x_min", "must be a finite x > 0");
  require(x_max > x_min && std::isfinite(x_max), "x_max", "must be finite and above x_min");
  require(points_per_mode >= 8 && points_per_mode <= 100000, "points_per_mode", "must lie in [8, 100000]");
  require(power_fraction_cut > 0 && power_fraction_cut < 0.1, "power_fraction_cut", "must lie in (0, 0.1)");
  require(unit_transmission > 0 && unit_transmission < 1e-6, "unit_transmission", "must lie in (0, 1e-6)");
  solver.validate();
}

namespace {

constexpr int spins[] = {0, 1, 2, 4};
// Progress is counted in solves; a typical spin needs about this many modes.
constexpr int expected_modes_per_spin = 5;

struct ModeBuild {
  std::vector<TableRow> rows;
  double worst_midpoint = 0;
};

[[noreturn]] void not_converged(const Transmission& t) {
  throw NumericalError("greybody solver", t.summary.message);
}

Transmission solve_checked(const Mode& mode, double x, const BuildOptions& o, BuildSummary& s) {
  const Transmission t = solve_transmission(mode, x, o.solver);
  ++s.solves;
  s.rhs_evaluations += t.summary.rhs_evaluations;
  if (t.summary.status != SolveStatus::converged) not_converged(t);
  return t;
}

ModeBuild build_mode(const Mode& mode, const BuildOptions& o, BuildSummary& s, Progress& progress) {
  ModeBuild b;
  const double step = std::log(o.x_max / o.x_min) / (o.points_per_mode - 1);
  for (int i = 0; i < o.points_per_mode; ++i) {
    const double x = o.x_min * std::exp(step * i);
    const Transmission t = solve_checked(mode, x, o, s);
    b.rows.push_back({mode.twice_spin, mode.twice_l, x, t.gamma.value, t.reflection, t.gamma.error});
    progress.advance(s.solves, describe(mode));
    if (t.reflection < o.unit_transmission) break;
  }
  // Check the interpolation at every interval midpoint against a direct solve.
  const Table single(TableHeader{o.x_min, o.x_max, o.points_per_mode, 0.0, o.solver.ode_relative}, b.rows);
  for (std::size_t i = 0; i + 1 < b.rows.size(); ++i) {
    const double x = std::sqrt(b.rows[i].x * b.rows[i + 1].x);
    const Transmission t = solve_checked(mode, x, o, s);
    const double interpolated = single.transmission(mode.twice_spin, mode.twice_l, x).value;
    b.worst_midpoint = std::max(b.worst_midpoint, std::abs(interpolated - t.gamma.value) / t.gamma.value);
    progress.advance(s.solves, describe(mode));
  }
  return b;
}

double mode_power(const std::vector<TableRow>& rows, const BuildOptions& o, const Mode& mode) {
  const Table single(TableHeader{o.x_min, o.x_max, o.points_per_mode, 0.0, o.solver.ode_relative}, rows);
  const std::function<Estimate(double)> s = [&](double x) {
    const Estimate g = single.transmission(mode.twice_spin, mode.twice_l, x);
    return Estimate{mode.degeneracy() * g.value, 0.0};
  };
  return thermal_moment(s, mode.fermion(), 1).value;
}

// Rounded up to two digits, so the table in memory states what the file states.
double stated(double worst_midpoint) {
  const double v = std::max(2.0 * worst_midpoint, 1e-9);
  const double scale = std::pow(10.0, std::floor(std::log10(v)) - 1);
  return std::ceil(v / scale) * scale;
}

}  // namespace

Table build_table(const BuildOptions& o, BuildSummary* summary) {
  o.validate();
  const auto start = std::chrono::steady_clock::now();
  BuildSummary s;
  Progress progress("greybody table", 4L * expected_modes_per_spin * (2L * o.points_per_mode), o.quiet);
  std::vector<TableRow> rows;
  std::string per_spin;
  for (const int ts : spins) {
    double total = 0;
    for (Mode mode = lowest_mode(ts);; mode.twice_l += 2) {
      ModeBuild b = build_mode(mode, o, s, progress);
      const double power = mode_power(b.rows, o, mode);
      s.max_midpoint_error = std::max(s.max_midpoint_error, b.worst_midpoint);
      rows.insert(rows.end(), b.rows.begin(), b.rows.end());
      ++s.modes;
      total += power;
      if (power < o.power_fraction_cut * total) {
        per_spin += fmt::format("{}spin {}: up to {} = {}", per_spin.empty() ? "" : "; ", spin_text(ts),
                                mode.fermion() ? "j" : "l", 0.5 * mode.twice_l);
        break;
      }
    }
  }
  progress.finish();
  s.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  const TableHeader header{o.x_min, o.x_max, o.points_per_mode, stated(s.max_midpoint_error), o.solver.ode_relative};
  s.message = fmt::format("{} modes ({}), {} solves, {} evaluations, {:.1f} s; largest midpoint deviation {:.2e}",
                          s.modes, per_spin, s.solves, s.rhs_evaluations, s.seconds, s.max_midpoint_error);
  if (summary) *summary = s;
  return Table(header, std::move(rows));
}

}  // namespace ember::greybody
