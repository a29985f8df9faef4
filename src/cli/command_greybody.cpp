// `ember greybody`: greybody factors from the table or a direct solve, the emission
// coefficients per degree of freedom, and rebuilding the table.
#include <fmt/format.h>

#include <iostream>

#include "command.hpp"
#include "ember/core/atomic_file.hpp"
#include "ember/core/cache.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/text.hpp"
#include "ember/greybody/emission.hpp"
#include "ember/greybody/table.hpp"

namespace ember::cli {

namespace {

using namespace ember::greybody;

struct GreybodyOptions {
  std::optional<double> spin, l, x;
  bool solve = false, power = false, rebuild = false, json = false, quiet = false;
  std::string table, output;
};

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
std::filesystem::path rebuilt_table_path(const GreybodyOptions& o) {
  if (!o.output.empty()) return o.output;
  const auto cache = default_cache_directory();
  if (!cache)
    throw InputError(
        "greybody --rebuild: no --output, and no cache folder (EMBER_CACHE_DIR, XDG_CACHE_HOME and HOME are all "
        "unset); expected --output FILE");
  std::error_code ec;
  std::filesystem::create_directories(*cache, ec);  // a failure shows in check_writable_file, named
  return *cache / "greybody.tsv";
}

int rebuild(const GreybodyOptions& o) {
  BuildOptions options;
  options.quiet = o.quiet;
  const std::filesystem::path out = rebuilt_table_path(o);
  check_writable_file(out);  // before a second of solving, not after
  BuildSummary summary;
  const Table table = build_table(options, &summary);
  write_file_atomically(out, format_table(table, {}));
  if (o.json) {
    print_json({{"file", out.string()},
                {"modes", summary.modes},
                {"solves", summary.solves},
                {"rhs_evaluations", summary.rhs_evaluations},
                {"seconds", summary.seconds},
                {"max_midpoint_error", summary.max_midpoint_error},
                {"interpolation_error", table.header().interpolation_error}});
  } else {
    std::cout << fmt::format("wrote {}: {}; stated interpolation error {:.1e}\n", out.string(), summary.message,
                             table.header().interpolation_error);
  }
  return exit_ok;
}

}  // namespace

Command add_greybody(CLI::App& parent) {
  auto o = std::make_shared<GreybodyOptions>();
  CLI::App* app = parent.add_subcommand(
      "greybody",
      "Greybody factors of a Schwarzschild hole: look one up (--spin --l --x), print emission coefficients "
      "(--power), or rebuild the table (--rebuild).");
  app->add_option("--spin", o->spin, "spin: 0, 0.5, 1 or 2");
  app->add_option("--l", o->l, "orbital l (spins 0, 1, 2) or total j (spin 0.5)");
  app->add_option("--x", o->x, "x = G M omega / c^3");
  app->add_flag("--solve", o->solve, "also solve the wave equation directly and show the difference");
  auto* power_flag = app->add_flag("--power", o->power, "power and number emitted per degree of freedom, per spin");
  auto* rebuild_flag = app->add_flag("--rebuild", o->rebuild, "solve every row again and rewrite the table");
  app->add_option("--table", o->table, "read this table instead of data/greybody.tsv");
  app->add_option("--output", o->output,
                  "--rebuild: write the table here (default: greybody.tsv in the cache folder, $EMBER_CACHE_DIR, else "
                  "$XDG_CACHE_HOME/ember, else ~/.cache/ember; the shipped table is never rewritten)");
  app->add_flag("--quiet", o->quiet, "no progress bar");
  app->add_flag("--json", o->json, "print one JSON object on stdout");
  power_flag->excludes(rebuild_flag);
  return {app, [o] {
            if (o->rebuild) return rebuild(*o);
            if (o->power) return power(*o);
            return lookup(*o);
          }};
}

}  // namespace ember::cli
