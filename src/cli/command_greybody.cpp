// `ember greybody`: greybody factors from the table or a direct solve, the emission
// coefficients per degree of freedom, and rebuilding the table.
#include <fmt/format.h>

#include <algorithm>
#include <iostream>

#include "command.hpp"
#include "ember/core/atomic_file.hpp"
#include "ember/core/cache.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/parallel.hpp"
#include "ember/core/text.hpp"
#include "ember/greybody/emission.hpp"
#include "ember/greybody/kerr_solver.hpp"
#include "ember/greybody/kerr_table.hpp"
#include "ember/greybody/table.hpp"

namespace ember::cli {

namespace {

using namespace ember::greybody;

struct GreybodyOptions {
  std::optional<double> spin, l, x, m, hole_spin;
  bool solve = false, power = false, rebuild = false, rebuild_kerr = false, json = false, quiet = false;
  int threads = 0;
  std::string table, output;
};

// A rotating hole is asked for by --hole-spin above 0, or by --m (one Kerr mode, also at a* = 0);
// `--hole-spin 0` alone is the Schwarzschild lookup, unchanged.
bool wants_kerr(const GreybodyOptions& o) {
  return o.m.has_value() || (o.hole_spin && *o.hole_spin != 0.0);
}

Table open_table(const GreybodyOptions& o) {
  return o.table.empty() ? load_default_table() : load_table(o.table);
}

int lookup(const GreybodyOptions& o) {
  if (!o.spin || !o.l || !o.x)
    throw InputError("greybody: a lookup needs --spin, --l and --x; expected e.g. --spin 0.5 --l 0.5 --x 0.1");
  const Mode mode = make_mode(*o.spin, *o.l);
  if (!(*o.x > 0) || !std::isfinite(*o.x))
    throw InputError(fmt::format("greybody: --x {}: expected a finite x = G M omega / c^3 > 0", *o.x));
  const Table table = open_table(o);
  const Estimate g = table.transmission(mode.twice_spin, mode.twice_l, *o.x);
  nlohmann::ordered_json j{
      {"spin", mode.spin()}, {"l", mode.l()}, {"x", *o.x}, {"transmission", g.value}, {"error", g.error}};
  std::string text = fmt::format("{}, x = {}\n  transmission (table)   {:.10e} +- {:.1e}\n", describe(mode),
                                 format_real(*o.x), g.value, g.error);
  if (o.solve) {
    const Transmission t = solve_transmission(mode, *o.x);
    if (t.summary.status != SolveStatus::converged) throw NumericalError("greybody solver", t.summary.message);
    j["solved"] = t.gamma.value;
    j["solved_error"] = t.gamma.error;
    j["difference"] = g.value - t.gamma.value;
    j["relative_difference"] = (g.value - t.gamma.value) / t.gamma.value;
    text +=
        fmt::format("  transmission (solved)  {:.10e} +- {:.1e}\n  difference             {:.2e} (relative {:.2e})\n",
                    t.gamma.value, t.gamma.error, g.value - t.gamma.value, (g.value - t.gamma.value) / t.gamma.value);
    fmt::print(stderr, "{}\n", t.summary.message);
  }
  if (o.json)
    print_json(j);
  else
    std::cout << text;
  return exit_ok;
}

// One Kerr mode, solved directly (about a millisecond); where the hole spin is one of the Kerr
// table's nodes and x is in its range, the table's value and the difference are shown too.
int kerr_lookup(const GreybodyOptions& o) {
  if (!o.spin || !o.l || !o.x || !o.m)
    throw InputError(
        "greybody: a Kerr lookup needs --spin, --l, --m, --x and --hole-spin; expected e.g. --spin 1 --l 1 --m 1 "
        "--x 0.3 --hole-spin 0.9");
  const double a = o.hole_spin.value_or(0.0);
  if (!(a >= 0 && a < 1))
    throw InputError(fmt::format("greybody: --hole-spin {}: expected a* = J c / (G M^2) in [0, 1)", a));
  const KerrMode mode = make_kerr_mode(*o.spin, *o.l, *o.m);
  const KerrTransmission t = solve_kerr_transmission(mode, *o.x, a);
  if (t.summary.status != SolveStatus::converged) throw NumericalError("Kerr greybody solver", t.summary.message);
  const KerrHole hole = make_kerr_hole(a);
  nlohmann::ordered_json j{{"spin", mode.spin()},
                           {"l", mode.l()},
                           {"m", mode.m()},
                           {"x", *o.x},
                           {"hole_spin", a},
                           {"transmission", t.gamma.value},
                           {"error", t.gamma.error},
                           {"superradiant", t.superradiant},
                           {"threshold_x", mode.m() * hole.angular_velocity},
                           {"method", "solved"}};
  std::string text = fmt::format(
      "{}, x = {}, a* = {}\n  transmission (solved)  {:.10e} +- {:.1e}{}\n  superradiant threshold x = m Omega_H = "
      "{:.6g}\n",
      describe(mode), format_real(*o.x), format_real(a), t.gamma.value, t.gamma.error,
      t.superradiant ? "  (superradiant: the wave is amplified)" : "", mode.m() * hole.angular_velocity);
  const KerrTable table = load_default_kerr_table();
  const auto& nodes = table.hole_spins();
  for (std::size_t n = 0; n < nodes.size(); ++n) {
    if (nodes[n] != a) continue;
    const auto modes = table.modes(n, mode.twice_spin);
    const bool tabulated = std::any_of(modes.begin(), modes.end(), [&](const KerrMode& k) {
      return k.twice_l == mode.twice_l && k.twice_m == mode.twice_m;
    });
    if (!tabulated || *o.x > table.top(n, mode)) break;
    const Estimate g = table.transmission(n, mode, *o.x);
    j["table"] = g.value;
    j["table_error"] = g.error;
    text += fmt::format("  transmission (table)   {:.10e} +- {:.1e}, difference {:.2e}\n", g.value, g.error,
                        g.value - t.gamma.value);
  }
  if (!o.json) fmt::print(stderr, "{}\n", t.summary.message);
  if (o.json)
    print_json(j);
  else
    std::cout << text;
  return exit_ok;
}

int power(const GreybodyOptions& o) {
  const Table table = open_table(o);
  nlohmann::ordered_json j = nlohmann::ordered_json::object();
  std::string text = fmt::format(
      "Emission per degree of freedom (one helicity) of a massless species, from {}\n"
      "  {:<5} {:>32} {:>28}\n",
      o.table.empty() ? default_table_path().string() : o.table, "spin", "power [hbar c^6 / (G^2 M^2)]",
      "number [c^3 / (G M)]");
  for (const int ts : {0, 1, 2, 4}) {
    const Emission e = emission_per_dof(table, ts);
    j[format_real(0.5 * ts)] = {{"power", e.power.value},
                                {"power_error", e.power.error},
                                {"number", e.number.value},
                                {"number_error", e.number.error}};
    text += fmt::format("  {:<5} {:>22.6e} +- {:.1e} {:>18.6e} +- {:.1e}\n", spin_text(ts), e.power.value,
                        e.power.error, e.number.value, e.number.error);
  }
  if (o.json)
    print_json(j);
  else
    std::cout << text;
  return exit_ok;
}

// Without --output a rebuilt table goes into the cache folder: never over the table that ships
// (an installed copy's data is not the user's to rewrite).
std::filesystem::path rebuilt_table_path(const GreybodyOptions& o, const char* flag, const char* name) {
  if (!o.output.empty()) return o.output;
  const auto cache = default_cache_directory();
  if (!cache)
    throw InputError(
        fmt::format("greybody {}: no --output, and no cache folder (EMBER_CACHE_DIR, XDG_CACHE_HOME and HOME are all "
                    "unset); expected --output FILE",
                    flag));
  std::error_code ec;
  std::filesystem::create_directories(*cache, ec);  // a failure shows in check_writable_file, named
  return *cache / name;
}

// What a rebuild prints: the file, the build's counts and the table's stated error.
int report_rebuilt(const GreybodyOptions& o, const std::filesystem::path& out, const std::string& message,
                   double interpolation_error, nlohmann::ordered_json counts) {
  if (o.json) {
    nlohmann::ordered_json j = {{"file", out.string()}};
    j.update(counts);
    j["interpolation_error"] = interpolation_error;
    print_json(j);
  } else {
    std::cout << fmt::format("wrote {}: {}; stated interpolation error {:.1e}\n", out.string(), message,
                             interpolation_error);
  }
  return exit_ok;
}

int rebuild(const GreybodyOptions& o) {
  BuildOptions options;
  options.quiet = o.quiet;
  const std::filesystem::path out = rebuilt_table_path(o, "--rebuild", "greybody.tsv");
  check_writable_file(out);  // before a second of solving, not after
  BuildSummary summary;
  const Table table = build_table(options, &summary);
  write_file_atomically(out, format_table(table, {}));
  return report_rebuilt(o, out, summary.message, table.header().interpolation_error,
                        {{"modes", summary.modes},
                         {"solves", summary.solves},
                         {"rhs_evaluations", summary.rhs_evaluations},
                         {"seconds", summary.seconds},
                         {"max_midpoint_error", summary.max_midpoint_error}});
}

int rebuild_kerr(const GreybodyOptions& o) {
  KerrBuildOptions options;
  options.quiet = o.quiet;
  options.threads = o.threads > 0 ? o.threads : default_threads();
  const std::filesystem::path out = rebuilt_table_path(o, "--rebuild-kerr", "kerr_greybody.tsv");
  check_writable_file(out);
  KerrBuildSummary summary;
  const KerrTable table = build_kerr_table(options, &summary);
  write_file_atomically(out, format_kerr_table(table, {}));
  return report_rebuilt(o, out, summary.message, table.header().interpolation_error,
                        {{"modes", summary.modes},
                         {"solves", summary.solves},
                         {"rows", table.rows().size()},
                         {"seconds", summary.seconds},
                         {"max_midpoint_error", summary.max_midpoint_error}});
}

}  // namespace

Command add_greybody(CLI::App& parent) {
  auto o = std::make_shared<GreybodyOptions>();
  CLI::App* app = parent.add_subcommand(
      "greybody",
      "Greybody factors of a Schwarzschild hole: look one up (--spin --l --x), print emission coefficients "
      "(--power), or rebuild the table (--rebuild); of a rotating hole: solve one mode (--spin --l --m --x "
      "--hole-spin), or rebuild the Kerr table (--rebuild-kerr).");
  app->add_option("--spin", o->spin, "spin: 0, 0.5, 1 or 2");
  app->add_option("--l", o->l, "orbital l (spins 0, 1, 2) or total j (spin 0.5)");
  app->add_option("--x", o->x, "x = G M omega / c^3");
  app->add_option("--m", o->m, "azimuthal number m of a Kerr mode, -l .. l (m > 0 co-rotates with the hole)");
  app->add_option("--hole-spin", o->hole_spin,
                  "the hole's spin a* = J c / (G M^2), in [0, 1): a Kerr mode, solved directly (0 without --m: "
                  "the Schwarzschild lookup)");
  app->add_flag("--solve", o->solve, "also solve the wave equation directly and show the difference");
  auto* power_flag = app->add_flag("--power", o->power, "power and number emitted per degree of freedom, per spin");
  auto* rebuild_flag = app->add_flag("--rebuild", o->rebuild, "solve every row again and rewrite the table");
  app->add_option("--table", o->table, "read this table instead of data/greybody.tsv");
  app->add_option("--output", o->output,
                  "--rebuild: write the table here (default: greybody.tsv in the cache folder, $EMBER_CACHE_DIR, else "
                  "$XDG_CACHE_HOME/ember, else ~/.cache/ember; the shipped table is never rewritten)");
  auto* kerr_flag = app->add_flag("--rebuild-kerr", o->rebuild_kerr,
                                  "solve the Kerr table again (data/kerr_greybody.tsv; minutes) and write it");
  app->add_option("--threads", o->threads, "--rebuild-kerr: threads (default: the cores available)")
      ->check(CLI::Range(1, 4096));
  app->add_flag("--quiet", o->quiet, "no progress bar");
  app->add_flag("--json", o->json, "print one JSON object on stdout");
  power_flag->excludes(rebuild_flag);
  kerr_flag->excludes(rebuild_flag);
  kerr_flag->excludes(power_flag);
  return {app, [o] {
            if (o->rebuild_kerr) return rebuild_kerr(*o);
            if (o->rebuild) return rebuild(*o);
            if (o->power) return power(*o);
            if (wants_kerr(*o)) return kerr_lookup(*o);
            return lookup(*o);
          }};
}

}  // namespace ember::cli
