// Building the Kerr greybody table from direct solves (`ember greybody --rebuild-kerr`).
#include <fmt/format.h>

#include <chrono>
#include <cmath>

#include "ember/core/errors.hpp"
#include "ember/core/gsl_tools.hpp"
#include "ember/core/parallel.hpp"
#include "ember/core/progress.hpp"
#include "ember/greybody/kerr_emission.hpp"
#include "ember/greybody/kerr_table.hpp"

namespace ember::greybody {

void KerrBuildOptions::validate() const {
  const auto require = [](bool ok, const char* field, const std::string& rule) {
    if (!ok) throw InputError(fmt::format("Kerr greybody table options: {}: {}", field, rule));
  };
  require(!hole_spins.empty() && hole_spins.front() == 0.0, "hole_spins", "must start at a* = 0");
  for (std::size_t i = 1; i < hole_spins.size(); ++i)
    require(hole_spins[i] > hole_spins[i - 1] && hole_spins[i] < 1, "hole_spins", "must increase and stay below 1");
  require(!twice_spins.empty(), "twice_spins", "must name at least one spin");
  for (const int ts : twice_spins)
    require(ts == 0 || ts == 1 || ts == 2 || ts == 4, "twice_spins", "must be 0, 1, 2 or 4 (spins 0, 1/2, 1, 2)");
  require(x_min > 0 && x_min < 0.1, "x_min", "must lie in (0, 0.1)");
  require(points_per_mode >= 8 && points_per_mode <= 100000, "points_per_mode", "must lie in [8, 100000]");
  require(refine_relative > 0 && refine_relative < 0.1, "refine_relative", "must lie in (0, 0.1)");
  require(refine_passes >= 0 && refine_passes <= 30, "refine_passes", "must lie in [0, 30]");
  require(power_fraction_cut > 0 && power_fraction_cut < 0.1, "power_fraction_cut", "must lie in (0, 0.1)");
  require(threads >= 1, "threads", "must be at least 1");
  solver.validate();
}

namespace {

// v = ln x + x / w (see kerr_table.hpp) and its inverse, by Brent's method: v is increasing.
double grid_width(const KerrHole& hole) {
  return 4.0 * hole.temperature();
}
double grid_v(double x, double w) {
  return std::log(x) + x / w;
}
double grid_x(double v, double w, double x_lo, double x_hi) {
  const BrentResult r = brent_root([&](double x) { return grid_v(x, w) - v; }, x_lo, x_hi, 1e-15 * x_hi);
  return r.x;
}

// Keeps a solve point off the superradiant threshold, where the integer-spin solver refuses x.
constexpr double threshold_clearance = 1e-6;
double clear_of_threshold(const KerrHole& hole, const KerrMode& mode, double x) {
  const double threshold = mode.m() * hole.angular_velocity;
  if (mode.twice_spin % 2 == 0 && std::abs(x - threshold) < threshold_clearance)
    return x < threshold ? threshold - threshold_clearance : threshold + threshold_clearance;
  return x;
}

struct KerrModeBuild {
  std::vector<KerrTableRow> rows;
  double worst_midpoint = 0;
  double power = 0;
  long solves = 0;
};

KerrTransmission kerr_solve_checked(const KerrMode& mode, double x, double a, const KerrBuildOptions& o) {
  const KerrTransmission t = solve_kerr_transmission(mode, x, a, o.solver);
  // The row keeps its own error; what the table needs is that error well below what the
  // interpolation may add.
  if (t.summary.status != SolveStatus::converged &&
      !(t.gamma.error < tolerance::kerr_table_solve_relative * std::abs(t.gamma.value)))
    throw NumericalError("Kerr greybody solver", t.summary.message);
  return t;
}

KerrTableRow kerr_row(const KerrHole& hole, const KerrMode& mode, double x, const KerrBuildOptions& o) {
  const KerrTransmission t = kerr_solve_checked(mode, x, hole.a, o);
  return {hole.a, mode.twice_spin, mode.twice_l, mode.twice_m, x, t.gamma.value, t.gamma.error};
}

// The grid starts at points_per_mode points (kerr_mode_grid) and is refined where it is needed:
// each interval's midpoint (in v) is solved directly and compared with the spline; where they
// differ by more than `refine_relative` the midpoint becomes a node and both halves are checked
// again, until every interval passes or `refine_passes` rounds are spent. The worst deviation of
// the intervals that passed, and of any left unresolved, is what the table states.
KerrModeBuild build_kerr_mode(const KerrHole& hole, const KerrMode& mode, const KerrBuildOptions& o) {
  KerrModeBuild b;
  for (const double x : kerr_mode_grid(hole, mode, o.x_min, o.points_per_mode))
    b.rows.push_back(kerr_row(hole, mode, x, o));
  b.solves += static_cast<long>(b.rows.size());
  const double w = grid_width(hole);
  std::vector<bool> verified(b.rows.size() - 1, false);
  for (int pass = 0; pass <= o.refine_passes; ++pass) {
    const KerrTable single(KerrTableHeader{o.x_min, o.points_per_mode, 0.0, o.solver.ode_relative}, b.rows);
    std::vector<KerrTableRow> rows{b.rows.front()};
    std::vector<bool> next;
    for (std::size_t i = 0; i + 1 < b.rows.size(); ++i) {
      if (!verified[i]) {
        const double mid =
            grid_x(0.5 * (grid_v(b.rows[i].x, w) + grid_v(b.rows[i + 1].x, w)), w, b.rows[i].x, b.rows[i + 1].x);
        const KerrTableRow direct = kerr_row(hole, mode, clear_of_threshold(hole, mode, mid), o);
        ++b.solves;
        const double deviation = std::abs(single.transmission(0, mode, direct.x).value - direct.transmission) /
                                 std::abs(direct.transmission);
        if (deviation > o.refine_relative && pass < o.refine_passes && direct.x > b.rows[i].x &&
            direct.x < b.rows[i + 1].x) {
          rows.push_back(direct);
          next.push_back(false);
          next.push_back(false);
          rows.push_back(b.rows[i + 1]);
          continue;
        }
        b.worst_midpoint = std::max(b.worst_midpoint, deviation);
      }
      next.push_back(true);
      rows.push_back(b.rows[i + 1]);
    }
    const bool refined = rows.size() > b.rows.size();
    b.rows = std::move(rows);
    verified = std::move(next);
    if (!refined) break;
  }
  const KerrTable single(KerrTableHeader{o.x_min, o.points_per_mode, 0.0, o.solver.ode_relative}, b.rows);
  const KerrGamma gamma = [&](const KerrMode& m, double x) { return single.transmission(0, m, x); };
  b.power = kerr_emission_per_dof(hole, {mode}, gamma).power.value;
  return b;
}

// Rounded up to two digits, so the table in memory states what the file states.
double kerr_stated(double worst_midpoint) {
  const double v = std::max(2.0 * worst_midpoint, 1e-9);
  const double scale = std::pow(10.0, std::floor(std::log10(v)) - 1);
  return std::ceil(v / scale) * scale;
}

}  // namespace

std::vector<double> kerr_mode_grid(const KerrHole& hole, const KerrMode& mode, double x_min, int points) {
  const double top = kerr_mode_top(hole, mode), w = grid_width(hole);
  const double v_lo = grid_v(x_min, w), v_hi = grid_v(top, w);
  std::vector<double> x;
  for (int i = 0; i < points; ++i) {
    const double v = v_lo + (v_hi - v_lo) * i / (points - 1);
    const double xi = i == 0 ? x_min : i == points - 1 ? top : grid_x(v, w, x_min, top);
    x.push_back(clear_of_threshold(hole, mode, xi));
  }
  return x;
}

KerrTable build_kerr_table(const KerrBuildOptions& o, KerrBuildSummary* summary) {
  o.validate();
  const auto start = std::chrono::steady_clock::now();
  KerrBuildSummary s;
  std::vector<KerrTableRow> rows;
  std::string per_node;
  Progress progress("Kerr greybody table", static_cast<double>(o.hole_spins.size() * o.twice_spins.size()), o.quiet);
  int done = 0;
  for (const double a : o.hole_spins) {
    const KerrHole hole = make_kerr_hole(a);
    std::string reach;
    for (const int ts : o.twice_spins) {
      double total = 0;
      for (int tl = ts;; tl += 2) {
        std::vector<KerrMode> modes;
        for (int tm = -tl; tm <= tl; tm += 2) modes.push_back(KerrMode{ts, tl, tm});
        std::vector<KerrModeBuild> built(modes.size());
        parallel_for(modes.size(), o.threads, [&](std::size_t i) { built[i] = build_kerr_mode(hole, modes[i], o); });
        double power = 0;
        for (const auto& b : built) {
          rows.insert(rows.end(), b.rows.begin(), b.rows.end());
          s.solves += b.solves;
          s.max_midpoint_error = std::max(s.max_midpoint_error, b.worst_midpoint);
          power += b.power;
          ++s.modes;
        }
        total += power;
        if (power < o.power_fraction_cut * total) {
          reach += fmt::format("{}{}", reach.empty() ? "" : "/", 0.5 * tl);
          break;
        }
      }
      progress.advance(++done, fmt::format("a* = {}", a));
    }
    per_node += fmt::format("{}a* = {}: l to {}", per_node.empty() ? "" : "; ", a, reach);
  }
  progress.finish();
  s.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  const KerrTableHeader header{o.x_min, o.points_per_mode, kerr_stated(s.max_midpoint_error), o.solver.ode_relative};
  s.message = fmt::format("{} modes, {} solves, {:.1f} s; largest midpoint deviation {:.2e} ({})", s.modes, s.solves,
                          s.seconds, s.max_midpoint_error, per_node);
  if (summary) *summary = s;
  return KerrTable(header, std::move(rows));
}

}  // namespace ember::greybody
