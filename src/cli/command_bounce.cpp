// `ember bounce`: the seeded bounce action and decay rate for one seed mass, for each
// prescription side by side; or a scan of B(M) and the branching ratio over seed masses.
#include <fmt/format.h>

#include <iostream>
#include <sstream>

#include "command.hpp"
#include "ember/core/atomic_file.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/finite.hpp"
#include "ember/core/progress.hpp"
#include "ember/core/text.hpp"
#include "ember/tunnelling/action_table.hpp"
#include "ember/tunnelling/rate.hpp"

namespace ember::cli {

namespace {

using namespace ember::tunnelling;
namespace u = ember::units;

struct BounceOptions {
  std::string seed_mass;
  std::vector<std::string> scan;  // FROM TO N
  std::string model = "standard_model", output;
  higgs::Inputs inputs = higgs::default_inputs();
  double lambda6 = 0, lambda8 = 0;
  bool coleman_weinberg = false, json = false, quiet = false;
  std::string scale, coefficients, potential_table, tension, energy_gap;
  std::string prescriptions,
      prefactor = "root_action",
      floor = fmt::format("{} Mpl", format_real(TunnellingSetup{}.semiclassical_floor / u::planck_mass));
  double hot_bubble_volume = 1;
  double minimum_action = TunnellingSetup{}.minimum_action;
};

std::vector<std::string> split_list(const std::string& text) {
  std::vector<std::string> out;
  std::string item;
  for (std::istringstream in(text); std::getline(in, item, ',');)
    if (!trim(item).empty()) out.push_back(trim(item));
  return out;
}

struct Context {
  std::shared_ptr<const higgs::Running> running;
  std::unique_ptr<higgs::Potential> potential;
  const higgs::StandardModelPotential* sm = nullptr;
  TunnellingSetup setup;
  std::vector<Prescription> prescriptions;
  Prefactor prefactor = Prefactor::root_action;
  std::unique_ptr<evaporation::MassLoss> mass_loss;
};

std::vector<Prescription> chosen(const BounceOptions& o, const std::vector<Prescription>& defaults) {
  if (o.prescriptions.empty()) return defaults;
  std::vector<Prescription> out;
  for (const auto& name : split_list(o.prescriptions)) {
    const auto p = prescription_named(name);
    if (!p) {
      std::vector<std::string> names;
      for (const auto q : all_prescriptions) names.push_back(name_of(q));
      throw InputError(fmt::format("--prescriptions: unknown \"{}\"; expected names out of {}", name,
                                   join_alternatives(names, "and")));
    }
    out.push_back(*p);
  }
  return out;
}

Context build(const BounceOptions& o) {
  Context c;
  c.setup.semiclassical_floor = quantity_option("--floor", o.floor, u::mass);
  c.setup.hot_bubble_volume = o.hot_bubble_volume;
  if (!(o.hot_bubble_volume > 0)) throw InputError("--hot-bubble-volume: expected a number > 0");
  if (!(o.minimum_action > 0)) throw InputError("--minimum-action: expected a number > 0");
  c.setup.minimum_action = o.minimum_action;
  if (o.prefactor != "root_action" && o.prefactor != "light_crossing")
    throw InputError(fmt::format("--prefactor {}: unknown; expected root_action or light_crossing", o.prefactor));
  c.prefactor = o.prefactor == "root_action" ? Prefactor::root_action : Prefactor::light_crossing;
  if (!o.tension.empty() || !o.energy_gap.empty()) {
    if (o.tension.empty() || o.energy_gap.empty()) throw InputError("--tension and --energy-gap: expected both");
    c.setup.thin_wall = ThinWall{quantity_option("--tension", o.tension, {u::Dimension::energy, 3}),
                                 quantity_option("--energy-gap", o.energy_gap, {u::Dimension::energy, 4})};
  }
  if (o.model == "standard_model") {
    c.running = std::make_shared<const higgs::Running>(o.inputs);
    auto sm = std::make_unique<higgs::StandardModelPotential>(
        c.running, higgs::StandardModelOptions{o.coleman_weinberg, o.lambda6, o.lambda8});
    c.sm = sm.get();
    c.potential = std::move(sm);
    c.prescriptions = chosen(
        o, {Prescription::entropy_drop, Prescription::probe_field, Prescription::hot_bubble, Prescription::no_seed});
  } else if (o.model == "polynomial") {
    std::vector<double> a;
    for (const auto& t : split_list(o.coefficients)) {
      const auto x = parse_real(t);
      if (!x)
        throw InputError(fmt::format("--coefficients: \"{}\" is not a number; expected e.g. \"0,0,0.5,0,-0.01\"", t));
      a.push_back(*x);
    }
    c.potential = std::make_unique<higgs::PolynomialPotential>(quantity_option("--scale", o.scale, u::energy), a);
    c.prescriptions = chosen(o, {Prescription::entropy_drop, Prescription::probe_field, Prescription::no_seed});
  } else if (o.model == "table") {
    if (o.potential_table.empty()) throw InputError("--model table: expected --potential-table FILE");
    c.potential = std::make_unique<higgs::TabulatedPotential>(o.potential_table);
    c.prescriptions = chosen(o, {Prescription::entropy_drop, Prescription::probe_field, Prescription::no_seed});
  } else if (o.model == "thin_wall") {
    if (!c.setup.thin_wall) throw InputError("--model thin_wall: expected --tension and --energy-gap");
    c.potential = std::make_unique<higgs::PolynomialPotential>(1.0, std::vector<double>{0.0});  // unused
    c.prescriptions = chosen(o, {Prescription::thin_wall});
  } else {
    throw InputError(
        fmt::format("--model {}: unknown; expected standard_model, polynomial, table or thin_wall", o.model));
  }
  c.setup.potential = c.potential.get();
  c.setup.standard_model = c.sm;
  c.mass_loss =
      std::make_unique<evaporation::MassLoss>(greybody::load_default_table(), evaporation::load_default_particles());
  return c;
}

std::string describe_model(const BounceOptions& o, const Context& c) {
  if (o.model != "thin_wall") return c.potential->description();
  return fmt::format("thin wall, sigma = {}, epsilon = {}", o.tension, o.energy_gap);
}

// Gamma_D / Gamma_H: the ratio "decay outruns evaporation" refers to (the branching ratio is
// Gamma_D / (Gamma_D + Gamma_H)).
double ratio_of(const Rates& r) {
  return r.evaporation_rate > 0 ? r.decay_rate / r.evaporation_rate : 0.0;
}

nlohmann::ordered_json finite_or_null(double x) {
  return std::isfinite(x) ? nlohmann::ordered_json(x) : nullptr;
}

int single(const BounceOptions& o) {
  const double seed = quantity_option("--seed-mass", o.seed_mass, u::mass);
  const Context c = build(o);
  nlohmann::ordered_json j = nlohmann::ordered_json::object();
  std::string text = fmt::format("seed mass {:.6g} M_Pl ({:.4g} g); potential: {}\n", seed / u::planck_mass,
                                 seed / u::gram, describe_model(o, c));
  for (const Prescription p : c.prescriptions) {
    const ActionPoint a = action_at(p, c.setup, seed);
    const Rates r = rates_at(a, *c.mass_loss, c.prefactor, c.setup.newton_G);
    // The prefactor's effect: the rate under the other model too (same B).
    const Prefactor other = c.prefactor == Prefactor::root_action ? Prefactor::light_crossing : Prefactor::root_action;
    const Rates r_other = rates_at(a, *c.mass_loss, other, c.setup.newton_G);
    const auto flags = a.flags.list();
    j[name_of(p)] = {{"B", finite_or_null(a.action.value)},
                     {"B_error", finite_or_null(a.action.error)},
                     {"remnant_mass_Mpl", a.remnant_mass / u::planck_mass},
                     {"phi_horizon_GeV", a.phi_horizon},
                     {"decay_rate_per_s", r.decay_rate * u::second},
                     {"evaporation_rate_per_s", r.evaporation_rate * u::second},
                     {"branching_ratio", r.branching_ratio},
                     {"decay_to_evaporation", ratio_of(r)},
                     {"prefactor", a.own_prefactor ? "own (see assumptions)" : name_of(c.prefactor)},
                     {fmt::format("decay_rate_{}_per_s", name_of(other)), r_other.decay_rate * u::second},
                     {"flags", flags},
                     {"seed_mass_Mpl", seed / u::planck_mass},
                     {"assumptions", assumptions(p)},
                     {"note", a.note}};
    text += fmt::format(
        "{:<13} B = {:<12} remnant {:.6g} M_Pl  phi_h {} GeV\n"
        "              Gamma_D = {:.4e} /s ({:.4e} /s with {})  Gamma_H = {:.4e} /s  Gamma_D/Gamma_H {:.6g}  "
        "branching ratio Gamma_D/(Gamma_D+Gamma_H) {:.6g}{}\n",
        name_of(p), a.flags.no_decay ? std::string("none") : fmt::format("{:.6g}", a.action.value),
        a.remnant_mass / u::planck_mass, a.phi_horizon > 0 ? fmt::format("{:.4g}", a.phi_horizon) : std::string("n/a"),
        r.decay_rate * u::second, r_other.decay_rate * u::second,
        a.own_prefactor ? std::string("its own prefactor") : name_of(other), r.evaporation_rate * u::second,
        ratio_of(r), r.branching_ratio,
        flags.empty() ? "" : fmt::format("\n              flags: {}", fmt::join(flags, ", ")));
  }
  text += fmt::format(
      "prefactor: {} (A = (B/2pi)^(1/2)/(G M) for root_action, 1/(G M) for light_crossing; hot_bubble and no_seed use "
      "their own)\nvalidity: semiclassical only for seeds above {:.3g} M_Pl and for B above {} (flag "
      "below_minimum_action); the constraint disappears if new physics stabilises the potential\n",
      name_of(c.prefactor), c.setup.semiclassical_floor / u::planck_mass, format_real(c.setup.minimum_action));
  if (o.json)
    print_json(j);
  else
    std::cout << text;
  return exit_ok;
}

int scan(const BounceOptions& o) {
  if (o.scan.size() != 3) throw InputError("--scan: expected FROM TO N, e.g. --scan \"1e3 Mpl\" \"1e9 Mpl\" 60");
  const double from = quantity_option("--scan FROM", o.scan[0], u::mass),
               to = quantity_option("--scan TO", o.scan[1], u::mass);
  const auto n = parse_whole(o.scan[2]);
  if (!n || *n < 2 || *n > 100000)
    throw InputError(fmt::format("--scan N \"{}\": expected a whole number from 2 to 100000", o.scan[2]));
  if (!(to > from)) throw InputError("--scan: expected TO above FROM");
  const Context c = build(o);
  std::string csv = fmt::format(
      "# Ember seeded bounce scan; potential: {}\n# columns: seed_mass_Mpl, seed_mass_g, then per "
      "prescription B (dimensionless; empty when no bubble forms), branching ratio "
      "Gamma_D/(Gamma_D+Gamma_H), ratio Gamma_D/Gamma_H, flags\n# prefactor {}; semiclassical floor {:.3g} M_Pl; "
      "B below {} flagged below_minimum_action\n"
      "seed_mass_Mpl,seed_mass_g",
      describe_model(o, c), name_of(c.prefactor), c.setup.semiclassical_floor / u::planck_mass,
      format_real(c.setup.minimum_action));
  for (const Prescription p : c.prescriptions)
    csv += fmt::format(",B_{0},branching_{0},ratio_{0},flags_{0}", name_of(p));
  csv += "\n";
  // --json: the same rows as one object; B is null where no bubble forms.
  nlohmann::ordered_json rows = nlohmann::ordered_json::array();
  if (!o.output.empty()) check_writable_file(o.output);  // before the scan, not after
  Progress progress("ember bounce --scan", *n, o.quiet);
  for (long i = 0; i < *n; ++i) {
    const double m = from * std::pow(to / from, static_cast<double>(i) / static_cast<double>(*n - 1));
    csv += fmt::format("{:.8e},{:.8e}", m / u::planck_mass, m / u::gram);
    nlohmann::ordered_json row{{"seed_mass_Mpl", m / u::planck_mass}, {"seed_mass_g", m / u::gram}};
    for (const Prescription p : c.prescriptions) {
      const ActionPoint a = action_at(p, c.setup, m);
      const Rates r = rates_at(a, *c.mass_loss, c.prefactor, c.setup.newton_G);
      csv +=
          fmt::format(",{},{:.8e},{:.8e},{}", a.flags.no_decay ? std::string() : fmt::format("{:.10e}", a.action.value),
                      r.branching_ratio, ratio_of(r), fmt::join(a.flags.list(), ";"));
      row[name_of(p)] = {{"B", a.flags.no_decay ? nlohmann::ordered_json() : nlohmann::ordered_json(a.action.value)},
                         {"branching_ratio", r.branching_ratio},
                         {"decay_to_evaporation", ratio_of(r)},
                         {"flags", a.flags.list()}};
    }
    rows.push_back(std::move(row));
    csv += "\n";
    progress.advance(i + 1, fmt::format("{} of {}: {:.3g} M_Pl", i + 1, *n, m / u::planck_mass));
  }
  progress.finish();
  require_finite_text(csv, o.output.empty() ? "the bounce scan" : o.output);
  if (!o.output.empty()) {
    write_file_atomically(o.output, csv);
    fmt::print(stderr, "wrote {} ({} seed masses)\n", o.output, *n);
  }
  if (o.json)
    print_json({{"potential", describe_model(o, c)},
                {"prefactor", name_of(c.prefactor)},
                {"semiclassical_floor_Mpl", c.setup.semiclassical_floor / u::planck_mass},
                {"validity", fmt::format("semiclassical only for seeds above {:.3g} M_Pl; the constraint disappears "
                                         "if new physics stabilises the potential",
                                         c.setup.semiclassical_floor / u::planck_mass)},
                {"output", o.output.empty() ? nlohmann::ordered_json() : nlohmann::ordered_json(o.output)},
                {"rows", rows}});
  else if (o.output.empty())
    std::cout << csv;
  return exit_ok;
}

}  // namespace

Command add_bounce(CLI::App& parent) {
  auto o = std::make_shared<BounceOptions>();
  CLI::App* app = parent.add_subcommand(
      "bounce",
      "Seeded vacuum decay: the bounce action B, decay and evaporation rates and the branching ratio for a "
      "seed hole, for each prescription side by side (--seed-mass), or over a range (--scan).");
  auto* seed = app->add_option("--seed-mass", o->seed_mass, "seed hole mass, e.g. \"1e5 Mpl\"");
  auto* scan_opt = app->add_option("--scan", o->scan, "FROM TO N: log-spaced seed masses, written as CSV")->expected(3);
  seed->excludes(scan_opt);
  app->add_option("--output", o->output, "--scan: write the CSV here instead of stdout");
  app->add_option("--model", o->model, "potential: standard_model (default), polynomial, table or thin_wall");
  app->add_option("--mt", o->inputs.top_mass, "top-quark pole mass in GeV");
  app->add_option("--mh", o->inputs.higgs_mass, "Higgs-boson pole mass in GeV");
  app->add_option("--alphas", o->inputs.alpha_s, "alpha_s(M_Z)");
  app->add_option("--loops", o->inputs.loops, "renormalisation-group running: " + higgs::loop_order_choices());
  app->add_option("--lambda6", o->lambda6, "coefficient of h^6/(6 Mbar^2), Mbar the reduced Planck mass");
  app->add_option("--lambda8", o->lambda8, "coefficient of h^8/(8 Mbar^4), Mbar the reduced Planck mass");
  app->add_flag("--coleman-weinberg", o->coleman_weinberg, "add the one-loop top, W and Z terms");
  app->add_option("--scale", o->scale, "--model polynomial: the field scale, e.g. \"1e10 GeV\"");
  app->add_option("--coefficients", o->coefficients,
                  "--model polynomial: a0,a1,... of V = scale^4 sum a_n (phi/scale)^n");
  app->add_option("--potential-table", o->potential_table, "--model table: file of phi [GeV] and V [GeV^4]");
  app->add_option("--tension", o->tension, "thin wall: sigma, e.g. \"1e33 GeV^3\"");
  app->add_option("--energy-gap", o->energy_gap, "thin wall: epsilon, e.g. \"2e45 GeV^4\"");
  app->add_option("--prescriptions", o->prescriptions,
                  "comma-separated: entropy_drop, probe_field, hot_bubble, no_seed, thin_wall");
  app->add_option("--prefactor", o->prefactor, "root_action (default) or light_crossing");
  app->add_option("--floor", o->floor, fmt::format("semiclassical floor on the seed mass (default {})", o->floor));
  app->add_option("--hot-bubble-volume", o->hot_bubble_volume,
                  "hot_bubble: nucleation volume in units of 4 pi r_h^3/3");
  app->add_option(
      "--minimum-action", o->minimum_action,
      fmt::format("flag B below this (default {}: common practice, of order 1)", format_real(o->minimum_action)));
  app->add_flag("--json", o->json, "print one JSON object on stdout");
  app->add_flag("--quiet", o->quiet, "--scan: no progress bar");
  return {app, [o] {
            if (!o->scan.empty()) return scan(*o);
            if (o->seed_mass.empty()) throw InputError("bounce: expected --seed-mass or --scan");
            return single(*o);
          }};
}

}  // namespace ember::cli
