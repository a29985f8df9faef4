// `ember evaporate`: temperature, f, alpha, lifetime, mass left and energy budget of one hole; or
// the initial mass with a given lifetime; optionally the trajectory M(t) as CSV.
#include <fmt/format.h>

#include <functional>
#include <iostream>
#include <optional>
#include <sstream>

#include "command.hpp"
#include "ember/core/atomic_file.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/finite.hpp"
#include "ember/core/gsl_tools.hpp"
#include "ember/core/text.hpp"
#include "ember/evaporation/budget.hpp"
#include "ember/evaporation/kerr_trajectory.hpp"
#include "ember/evaporation/trajectory.hpp"
#include "ember/greybody/kerr_table.hpp"
#include "ember/tunnelling/prescription.hpp"
#include "ember/units/constants.hpp"

namespace ember::cli {

namespace {

using namespace ember::evaporation;
namespace u = ember::units;

struct EvaporateOptions {
  std::string mass, lifetime, age, formed_at, today = "13.787 Gyr";
  std::string qcd_scale = fmt::format("{} GeV", format_real(MassLossOptions{}.qcd_scale)), argument = "energy",
              cutoff = fmt::format("{} Mpl", format_real(TrajectoryOptions{}.cutoff_mass / u::planck_mass));
  double qcd_width = MassLossOptions{}.qcd_width;
  std::optional<std::string> species;  // set (maybe empty) when --species is given
  std::string particles, table, trajectory, kerr_table;
  std::optional<double> hole_spin;
  bool json = false, quiet = false;
};

// --hole-spin 0 (or none) is the Schwarzschild path, unchanged; above 0 the Kerr rates.
bool spinning(const EvaporateOptions& o) {
  return o.hole_spin && *o.hole_spin != 0.0;
}

struct Setup {
  MassLoss mass_loss;
  TrajectoryOptions trajectory;
};

struct EvaporationInputs {
  MassLossOptions options;
  TrajectoryOptions trajectory;
  ParticleSet particles;
};

EvaporationInputs evaporation_inputs(const EvaporateOptions& o) {
  MassLossOptions options;
  options.qcd_scale = quantity_option("--qcd-scale", o.qcd_scale, u::energy);
  // The range MassLossOptions allows (also the scenario key's), named by the option.
  if (!(options.qcd_scale >= MassLossOptions::qcd_scale_min && options.qcd_scale <= MassLossOptions::qcd_scale_max))
    throw InputError(fmt::format("--qcd-scale {}: outside the allowed range; expected between {} GeV and {} GeV",
                                 o.qcd_scale, format_real(MassLossOptions::qcd_scale_min),
                                 format_real(MassLossOptions::qcd_scale_max)));
  options.qcd_width = o.qcd_width;
  if (!(options.qcd_width >= MassLossOptions::qcd_width_min && options.qcd_width <= MassLossOptions::qcd_width_max))
    throw InputError(fmt::format("--qcd-width {}: outside the allowed range; expected between {} and {} (in ln T_H)",
                                 format_real(o.qcd_width), format_real(MassLossOptions::qcd_width_min),
                                 format_real(MassLossOptions::qcd_width_max)));
  if (o.argument != "energy" && o.argument != "momentum")
    throw InputError(fmt::format("--greybody-argument {}: unknown; expected energy or momentum", o.argument));
  options.argument = o.argument == "momentum" ? GreybodyArgument::momentum : GreybodyArgument::energy;
  options.quiet = o.quiet;
  TrajectoryOptions t;
  t.cutoff_mass = quantity_option("--cutoff", o.cutoff, u::mass);
  t.validate();
  ParticleSet particles = o.particles.empty() ? load_default_particles() : load_particles(o.particles);
  if (o.species) {
    std::vector<std::string> names;
    std::string name;
    for (std::istringstream in(*o.species + ","); std::getline(in, name, ',');) {
      if (trim(name).empty())
        throw InputError(
            fmt::format("--species \"{}\": an empty name; expected names separated by commas", *o.species));
      names.push_back(trim(name));
    }
    particles = particles.only(names);
  }
  return {options, t, std::move(particles)};
}

Setup setup(const EvaporateOptions& o) {
  EvaporationInputs in = evaporation_inputs(o);
  const greybody::Table table = o.table.empty() ? greybody::load_default_table() : greybody::load_table(o.table);
  return {MassLoss(table, std::move(in.particles), in.options), in.trajectory};
}

std::string model_line(const MassLoss& ml) {
  return fmt::format(
      "primary emission; greybody factors at the {} (MacGibbon-Webber); partons above T_H = {} GeV, hadrons below "
      "(width {} in ln T_H); {} species from {}",
      ml.options().argument == GreybodyArgument::energy ? "energy" : "momentum", format_real(ml.options().qcd_scale),
      format_real(ml.options().qcd_width), ml.particles().species.size(), ml.particles().source);
}

std::string csv_trajectory(const Trajectory& tr, const EvaporateOptions& o) {
  std::string out = fmt::format(
      "# Ember evaporation trajectory of a {} g hole\n"
      "# columns: age_s (time since formation), time_left_s, mass_g, temperature_GeV\n"
      "# numerical integration down to {:.6g} g; below it the analytic tail M^3 = 3 alpha(M_cut) t_left "
      "(analytic_tail = true)\n"
      "# options: qcd_scale {}, qcd_width {}, greybody argument {}, cutoff {}\n"
      "age_s,time_left_s,mass_g,temperature_GeV\n",
      format_real(tr.initial_mass() / u::gram), tr.cutoff_mass() / u::gram, o.qcd_scale, format_real(o.qcd_width),
      o.argument, o.cutoff);
  const double top = std::log(tr.initial_mass()),
               bottom = std::log(std::min(tr.cutoff_mass(), tr.initial_mass()) * 1e-3);
  const int rows = 400;
  for (int i = 0; i <= rows; ++i) {
    const double m = std::exp(top + (bottom - top) * i / rows);
    out += fmt::format("{:.12e},{:.12e},{:.12e},{:.12e}\n", tr.age_at(m) / u::second, tr.time_left(m) / u::second,
                       m / u::gram, hawking_temperature(m));
  }
  return out;
}

nlohmann::ordered_json shares_json(const MassLoss& ml, const std::vector<double>& shares) {
  nlohmann::ordered_json j = nlohmann::ordered_json::object();
  for (std::size_t i = 0; i < shares.size(); ++i) j[ml.particles().species[i].name] = shares[i];
  return j;
}

// What `evaporate --mass` prints, built section by section: the JSON and the text together.
struct Printout {
  nlohmann::ordered_json j;
  std::string text;
};

// The hole's age from --age, or from --formed-at and --today; none when neither is given.
std::optional<double> age_of(const EvaporateOptions& o) {
  if (!o.age.empty() && !o.formed_at.empty())
    throw InputError("evaporate: --age and --formed-at exclude each other; expected one");
  if (!o.age.empty()) return quantity_option("--age", o.age, u::time);
  if (o.formed_at.empty()) return std::nullopt;
  const double today = quantity_option("--today", o.today, u::time),
               formed = quantity_option("--formed-at", o.formed_at, u::time);
  if (formed >= today)
    throw InputError(
        fmt::format("--formed-at {}: not before --today {}; expected an earlier cosmic time", o.formed_at, o.today));
  return today - formed;
}

// Writes the trajectory CSV when asked (checked finite first), then prints.
int finish(Printout& p, const EvaporateOptions& o, const std::function<std::string()>& csv_text) {
  if (!o.trajectory.empty()) {
    const std::string csv = csv_text();
    require_finite_text(csv, o.trajectory);
    write_file_atomically(o.trajectory, csv);
    p.j["trajectory_file"] = o.trajectory;
    p.text += fmt::format("  trajectory written to {}\n", o.trajectory);
  }
  if (o.json)
    print_json(p.j);
  else
    std::cout << p.text;
  return exit_ok;
}

Printout hole_facts(const MassLoss& ml, const Trajectory& tr, double mass) {
  const double alpha_cgs = ml.alpha(mass) / (u::gram * u::gram * u::gram) * u::second;
  Printout p;
  p.j = {{"mass_g", mass / u::gram},
         {"temperature_GeV", hawking_temperature(mass)},
         {"f", ml.f(mass)},
         {"alpha_g3_per_s", alpha_cgs},
         {"alpha_relative_error", ml.relative_error()},
         {"lifetime_s", tr.lifetime() / u::second}};
  p.text = fmt::format(
      "M = {} g ({:.4e} GeV, {:.4e} M_Pl)\n"
      "  Hawking temperature  {:.6g} GeV ({:.4e} K)\n"
      "  f(M)                 {:.6f}   (alpha / 5.34e25 g^3 s^-1, MacGibbon 1991)\n"
      "  alpha(M)             {:.6e} g^3/s (relative error {:.1e})\n"
      "  lifetime             {:.6e} s ({:.6g} Gyr)\n",
      format_real(mass / u::gram), mass, mass / u::planck_mass, hawking_temperature(mass),
      hawking_temperature(mass) / u::kelvin, ml.f(mass), alpha_cgs, ml.relative_error(), tr.lifetime() / u::second,
      tr.lifetime() / (1e9 * u::year));
  return p;
}

// Semiclassical evaporation needs a hole well above the Planck mass (common practice: 1e3 M_Pl,
// the default cutoff); below the cutoff the whole life is the analytic tail.
void add_warnings(Printout& p, double mass, double cutoff) {
  nlohmann::ordered_json warnings = nlohmann::ordered_json::array();
  if (mass < u::planck_mass)
    warnings.push_back("below the Planck mass: the semiclassical Hawking rate does not apply");
  else if (const double floor = tunnelling::TunnellingSetup{}.semiclassical_floor; mass < floor)
    warnings.push_back(fmt::format("below {} M_Pl: outside the semiclassical regime (common practice)",
                                   format_real(floor / u::planck_mass)));
  if (mass <= cutoff)
    warnings.push_back("at or below --cutoff: the whole life is the analytic tail with alpha at this mass");
  p.j["warnings"] = warnings;
  for (const auto& w : warnings) p.text += fmt::format("  warning: {}\n", w.get<std::string>());
}

void add_age(Printout& p, const Trajectory& tr, double age) {
  const double left = tr.mass_at_age(age);
  p.j["age_s"] = age / u::second;
  p.j["mass_today_g"] = left / u::gram;
  p.j["evaporated"] = left == 0;
  p.text += left > 0 ? fmt::format("  mass after {:.6g} Gyr {:.6e} g\n", age / (1e9 * u::year), left / u::gram)
                     : fmt::format("  after {:.6g} Gyr      evaporated (lifetime {:.6g} Gyr)\n", age / (1e9 * u::year),
                                   tr.lifetime() / (1e9 * u::year));
}

// Every decade in JSON; the text stops three decades below the start and sums the rest.
void add_decades(Printout& p, const Trajectory& tr) {
  nlohmann::ordered_json decades = nlohmann::ordered_json::array();
  p.text += "  time spent per decade of mass:\n";
  for (const auto& d : tr.decade_times()) {
    if (d.time <= 0) continue;
    decades.push_back(
        {{"from_g", d.mass_low / u::gram}, {"to_g", d.mass_high / u::gram}, {"time_s", d.time / u::second}});
    if (d.mass_high > 1e-3 * tr.initial_mass())
      p.text += fmt::format("    {:>9.3g} - {:<9.3g} g  {:.4e} s\n", d.mass_low / u::gram, d.mass_high / u::gram,
                            d.time / u::second);
  }
  p.text += fmt::format("    (and {:.4e} s below {:.3g} g)\n", tr.time_left(1e-3 * tr.initial_mass()) / u::second,
                        1e-3 * tr.initial_mass() / u::gram);
  p.j["decades"] = decades;
}

void add_budget(Printout& p, const MassLoss& ml, const Trajectory& tr, double mass) {
  const auto now = power_shares(ml, mass), life = lifetime_shares(ml, mass, tr.cutoff_mass());
  p.j["budget_now"] = shares_json(ml, now);
  p.j["budget_lifetime"] = shares_json(ml, life);
  p.text += "  energy budget by species        now   rest of life\n";
  for (std::size_t i = 0; i < now.size(); ++i)
    if (now[i] > 1e-4 || life[i] > 1e-4)
      p.text +=
          fmt::format("    {:<22} {:>8.3f}% {:>8.3f}%\n", ml.particles().species[i].name, 100 * now[i], 100 * life[i]);
}

void add_model(Printout& p, const MassLoss& ml, const Trajectory& tr) {
  p.j["cutoff_g"] = tr.cutoff_mass() / u::gram;
  p.j["analytic_tail"] = tr.analytic_tail();
  p.j["tail_s"] = tr.tail_duration() / u::second;
  p.j["model"] = model_line(ml);
  p.text += fmt::format("  integrated to {:.4g} g; analytic tail below ({:.3e} s)\n  model: {}\n",
                        tr.cutoff_mass() / u::gram, tr.tail_duration() / u::second, model_line(ml));
}

int by_mass(const EvaporateOptions& o) {
  const double mass = quantity_option("--mass", o.mass, u::mass);
  const Setup s = setup(o);
  const Trajectory tr(s.mass_loss, mass, s.trajectory);
  const std::optional<double> age = age_of(o);
  Printout p = hole_facts(s.mass_loss, tr, mass);
  add_warnings(p, mass, s.trajectory.cutoff_mass);
  if (age) add_age(p, tr, *age);
  add_decades(p, tr);
  add_budget(p, s.mass_loss, tr, mass);
  add_model(p, s.mass_loss, tr);
  return finish(p, o, [&] { return csv_trajectory(tr, o); });
}

int by_lifetime(const EvaporateOptions& o) {
  const double lifetime = quantity_option("--lifetime", o.lifetime, u::time);
  const Setup s = setup(o);
  const double mass = mass_with_lifetime(s.mass_loss, lifetime, s.trajectory);
  if (o.json)
    print_json({{"lifetime_s", lifetime / u::second},
                {"mass_g", mass / u::gram},
                {"f", s.mass_loss.f(mass)},
                {"model", model_line(s.mass_loss)}});
  else
    std::cout << fmt::format("a hole of {:.6e} g has a lifetime of {} ({:.6e} s)\n  model: {}\n", mass / u::gram,
                             o.lifetime, lifetime / u::second, model_line(s.mass_loss));
  return exit_ok;
}

// --- a rotating hole -------------------------------------------------------------------------------

struct KerrSetup {
  KerrMassLoss mass_loss;
  TrajectoryOptions trajectory;
  double hole_spin;
};

KerrSetup kerr_setup(const EvaporateOptions& o) {
  EvaporationInputs in = evaporation_inputs(o);
  const double a = *o.hole_spin;
  const greybody::KerrTable table =
      o.kerr_table.empty() ? greybody::load_default_kerr_table() : greybody::load_kerr_table(o.kerr_table);
  if (!(a > 0 && a <= table.hole_spins().back()))
    throw InputError(
        fmt::format("--hole-spin {}: expected a* = J c / (G M^2) in [0, {}] (the Kerr greybody table's "
                    "range)",
                    format_real(a), format_real(table.hole_spins().back())));
  if (in.options.argument != GreybodyArgument::energy)
    throw InputError(
        "--greybody-argument momentum: not with --hole-spin; expected energy (the Kerr rates take the "
        "greybody factors at the energy)");
  return {KerrMassLoss(table, std::move(in.particles), in.options), in.trajectory, a};
}

std::string kerr_model_line(const KerrMassLoss& ml) {
  return fmt::format(
      "primary emission from a Kerr hole; greybody factors at the energy (MacGibbon-Webber); partons above T_H = {} "
      "GeV, hadrons below (width {} in ln T_H); {} species from {}; rates interpolated between a* nodes {} to {} "
      "(a*-interpolation error at most {:.1e}, leave-one-out)",
      format_real(ml.options().qcd_scale), format_real(ml.options().qcd_width), ml.particles().species.size(),
      ml.particles().source, format_real(ml.hole_spins().front()), format_real(ml.hole_spins().back()),
      ml.summary().interpolation_error);
}

// a* against M: every tenth of the initial mass down to a tenth, then every decade until a* is
// below 1e-6 (the rest of the way it only falls, as a power of M), and the cutoff.
nlohmann::ordered_json kerr_spin_down(Printout& p, const KerrTrajectory& tr) {
  nlohmann::ordered_json rows = nlohmann::ordered_json::array();
  p.text += "  spin as the hole shrinks:\n      M / M_0        M [g]        a*     age [s]\n";
  std::vector<double> masses;
  for (int k = 10; k >= 1; --k) masses.push_back(0.1 * k * tr.initial_mass());
  for (double m = 1e-2 * tr.initial_mass(); m > tr.cutoff_mass() && tr.spin_at(10 * m) >= 1e-6; m *= 0.1)
    masses.push_back(m);
  masses.push_back(tr.cutoff_mass());
  for (const double m : masses) {
    const double a = tr.spin_at(m), age = tr.age_at(m);
    rows.push_back({{"mass_g", m / u::gram}, {"hole_spin", a}, {"age_s", age / u::second}});
    p.text += fmt::format("    {:>9.3g} {:>12.4e} {:>10.4g} {:>11.4e}\n", m / tr.initial_mass(), m / u::gram, a,
                          age / u::second);
  }
  return rows;
}

std::string kerr_csv(const KerrTrajectory& tr, const EvaporateOptions& o) {
  std::string out = fmt::format(
      "# Ember evaporation trajectory of a {} g hole born with a* = {}\n"
      "# columns: age_s (time since formation), time_left_s, mass_g, hole_spin (a*), temperature_GeV\n"
      "# numerical integration down to {:.6g} g; below it the analytic tail M^3 = 3 alpha(M_cut, a*_cut) t_left\n"
      "# options: qcd_scale {}, qcd_width {}, cutoff {}\n"
      "age_s,time_left_s,mass_g,hole_spin,temperature_GeV\n",
      format_real(tr.initial_mass() / u::gram), format_real(tr.initial_spin()), tr.cutoff_mass() / u::gram, o.qcd_scale,
      format_real(o.qcd_width), o.cutoff);
  for (const auto& pt : tr.points())
    out += fmt::format("{:.12e},{:.12e},{:.12e},{:.12e},{:.12e}\n", pt.age / u::second,
                       (tr.lifetime() - pt.age) / u::second, pt.mass / u::gram, pt.hole_spin,
                       kerr_hawking_temperature(pt.mass, pt.hole_spin));
  return out;
}

int kerr_by_mass(const EvaporateOptions& o) {
  const double mass = quantity_option("--mass", o.mass, u::mass);
  const KerrSetup s = kerr_setup(o);
  const KerrMassLoss& ml = s.mass_loss;
  const KerrTrajectory tr(ml, mass, s.hole_spin, s.trajectory);
  // The same hole without spin, on the same footing (the Kerr table's a* = 0 node).
  const double lifetime_still = [&] {
    const greybody::Table table = o.table.empty() ? greybody::load_default_table() : greybody::load_table(o.table);
    return Trajectory(MassLoss(table, ml.particles(), ml.options()), mass, s.trajectory).lifetime();
  }();
  const double alpha_cgs = ml.alpha(mass, s.hole_spin) / (u::gram * u::gram * u::gram) * u::second;
  const double t = kerr_hawking_temperature(mass, s.hole_spin);
  Printout p;
  p.j = {{"mass_g", mass / u::gram},
         {"hole_spin", s.hole_spin},
         {"temperature_GeV", t},
         {"f", ml.f(mass, s.hole_spin)},
         {"f_nonrotating", ml.f(mass, 0.0)},
         {"g_over_f", ml.spin_ratio(mass, s.hole_spin)},
         {"alpha_g3_per_s", alpha_cgs},
         {"alpha_relative_error", ml.relative_error()},
         {"lifetime_s", tr.lifetime() / u::second},
         {"lifetime_nonrotating_s", lifetime_still / u::second},
         {"spin_at_cutoff", tr.spin_at_cutoff()}};
  p.text = fmt::format(
      "M = {} g ({:.4e} GeV), a* = {}\n"
      "  Hawking temperature  {:.6g} GeV ({:.4e} K)\n"
      "  f(M, a*)             {:.6f}   (f(M, 0) = {:.6f}; alpha / 5.34e25 g^3 s^-1, MacGibbon 1991)\n"
      "  g/f                  {:.6f}   (d a*/d ln M = a* (g/f - 2): the spin falls while g/f > 2)\n"
      "  alpha(M, a*)         {:.6e} g^3/s (relative error {:.1e})\n"
      "  lifetime             {:.6e} s ({:.6g} Gyr); without spin {:.6e} s, {:.4f} times longer\n",
      format_real(mass / u::gram), mass, format_real(s.hole_spin), t, t / u::kelvin, ml.f(mass, s.hole_spin),
      ml.f(mass, 0.0), ml.spin_ratio(mass, s.hole_spin), alpha_cgs, ml.relative_error(), tr.lifetime() / u::second,
      tr.lifetime() / (1e9 * u::year), lifetime_still / u::second, lifetime_still / tr.lifetime());
  add_warnings(p, mass, s.trajectory.cutoff_mass);
  if (const std::optional<double> age = age_of(o)) {
    const double left = tr.mass_at_age(*age);
    p.j["age_s"] = *age / u::second;
    p.j["mass_today_g"] = left / u::gram;
    p.j["evaporated"] = left == 0;
    if (left > 0 && left >= tr.cutoff_mass()) p.j["spin_today"] = tr.spin_at(left);
    p.text += left > 0 ? fmt::format("  mass after {:.6g} Gyr {:.6e} g\n", *age / (1e9 * u::year), left / u::gram)
                       : fmt::format("  after {:.6g} Gyr      evaporated\n", *age / (1e9 * u::year));
  }
  p.j["spin_down"] = kerr_spin_down(p, tr);
  const double half = tr.mass_at_spin(0.5 * s.hole_spin);
  p.j["mass_at_half_spin_g"] = half / u::gram;
  p.text += fmt::format("  a* halves by M = {:.4e} g ({:.3f} M_0)\n", half / u::gram, half / mass);
  const auto now = ml.power_shares(mass, s.hole_spin), life = kerr_lifetime_shares(ml, tr);
  nlohmann::ordered_json jnow = nlohmann::ordered_json::object(), jlife = nlohmann::ordered_json::object();
  p.text += "  energy budget by species        now   rest of life\n";
  for (std::size_t i = 0; i < now.size(); ++i) {
    jnow[ml.particles().species[i].name] = now[i];
    jlife[ml.particles().species[i].name] = life[i];
    if (now[i] > 1e-4 || life[i] > 1e-4)
      p.text +=
          fmt::format("    {:<22} {:>8.3f}% {:>8.3f}%\n", ml.particles().species[i].name, 100 * now[i], 100 * life[i]);
  }
  p.j["budget_now"] = jnow;
  p.j["budget_lifetime"] = jlife;
  p.j["cutoff_g"] = tr.cutoff_mass() / u::gram;
  p.j["analytic_tail"] = true;
  p.j["tail_s"] = tr.tail_duration() / u::second;
  p.j["model"] = kerr_model_line(ml);
  p.text +=
      fmt::format("  integrated to {:.4g} g; analytic tail below ({:.3e} s, a* = {:.3g} there)\n  model: {}\n",
                  tr.cutoff_mass() / u::gram, tr.tail_duration() / u::second, tr.spin_at_cutoff(), kerr_model_line(ml));
  return finish(p, o, [&] { return kerr_csv(tr, o); });
}

int kerr_by_lifetime(const EvaporateOptions& o) {
  const double lifetime = quantity_option("--lifetime", o.lifetime, u::time);
  const KerrSetup s = kerr_setup(o);
  const double mass = mass_with_lifetime_of(
      [&](double m) { return KerrTrajectory(s.mass_loss, m, s.hole_spin, s.trajectory).lifetime(); }, lifetime,
      fmt::format(" at a* = {}", format_real(s.hole_spin)));
  if (o.json)
    print_json({{"lifetime_s", lifetime / u::second},
                {"hole_spin", s.hole_spin},
                {"mass_g", mass / u::gram},
                {"f", s.mass_loss.f(mass, s.hole_spin)},
                {"model", kerr_model_line(s.mass_loss)}});
  else
    std::cout << fmt::format("a hole of {:.6e} g born with a* = {} has a lifetime of {} ({:.6e} s)\n  model: {}\n",
                             mass / u::gram, format_real(s.hole_spin), o.lifetime, lifetime / u::second,
                             kerr_model_line(s.mass_loss));
  return exit_ok;
}

}  // namespace

Command add_evaporate(CLI::App& parent) {
  auto o = std::make_shared<EvaporateOptions>();
  CLI::App* app = parent.add_subcommand(
      "evaporate",
      "Hawking evaporation of one hole: temperature, f(M), lifetime, mass left, energy budget (--mass), "
      "or the mass with a given lifetime (--lifetime).");
  auto* mass = app->add_option("--mass", o->mass, "initial mass, e.g. \"1e15 g\"");
  auto* lifetime =
      app->add_option("--lifetime", o->lifetime, "find the initial mass with this lifetime, e.g. \"13.787 Gyr\"");
  mass->excludes(lifetime);
  app->add_option("--age", o->age, "--mass: time since formation, to give the mass left");
  app->add_option("--formed-at", o->formed_at, "--mass: cosmic time of formation (the age is --today minus this)");
  app->add_option("--today", o->today, "the age of the universe (default 13.787 Gyr, Planck 2018)");
  app->add_option(
      "--qcd-scale", o->qcd_scale,
      fmt::format("Hawking temperature above which quarks and gluons are emitted, hadrons below (default {})",
                  o->qcd_scale));
  app->add_option("--qcd-width", o->qcd_width,
                  fmt::format("width of that switch in ln T_H (default {})", format_real(o->qcd_width)));
  app->add_option("--greybody-argument", o->argument,
                  "massive species: greybody factors at the energy or the momentum");
  app->add_option("--cutoff", o->cutoff,
                  fmt::format("numerical integration stops here; analytic tail below (default {})", o->cutoff));
  app->add_option("--species", o->species, "only these species, comma-separated names from the particle table");
  app->add_option("--particles", o->particles, "particle table (default data/particles.yaml)");
  app->add_option("--table", o->table, "greybody table (default data/greybody.tsv)");
  app->add_option("--trajectory", o->trajectory, "--mass: write M(t) to this CSV file");
  app->add_option("--hole-spin", o->hole_spin,
                  "the hole's spin at formation, a* = J c / (G M^2): Kerr rates, a*(M) and the spin-down (0: the "
                  "non-rotating hole, unchanged)");
  app->add_option("--kerr-table", o->kerr_table, "Kerr greybody table (default data/kerr_greybody.tsv)");
  app->add_flag("--json", o->json, "print one JSON object on stdout");
  app->add_flag("--quiet", o->quiet, "no progress bar while the alpha(M) table is built");
  return {app, [o] {
            if (o->hole_spin && !(*o->hole_spin >= 0))
              throw InputError(fmt::format("--hole-spin {}: expected a* = J c / (G M^2) >= 0", *o->hole_spin));
            if (!o->lifetime.empty()) return spinning(*o) ? kerr_by_lifetime(*o) : by_lifetime(*o);
            if (o->mass.empty()) throw InputError("evaporate: expected --mass or --lifetime");
            return spinning(*o) ? kerr_by_mass(*o) : by_mass(*o);
          }};
}

}  // namespace ember::cli
