// Every scenario key, in the order a reader meets them. configs/reference.yaml is generated from
// this table (`ember schema`), and a test keeps the shipped copy identical.
//
// Default values and their sources:
//   Standard Model inputs and their band sigmas: data/standard_model.yaml (PDG 2024), compiled in.
//   Cosmology: data/cosmology.yaml (Planck 2018 VI, Fixsen 2009), compiled in.
//   Collapse fraction gamma = 0.2: Carr, ApJ 201 (1975) 1 (population/counts.hpp holds it).
//   Critical-collapse exponent 2.85 in psi ~ M^2.85 exp(-(M/Mf)^2.85): the form used by Carr,
//     Kuhnel & Sandstad, PRD 94 (2016) 063530, after Niemeyer & Jedamzik, PRL 80 (1998) 5481
//     (from memory).
//   Semiclassical floor, QCD scale, trajectory cutoff, greybody grid: the physics modules' options
//     hold them with their sources (TunnellingSetup, MassLossOptions, TrajectoryOptions,
//     greybody::BuildOptions); the schema reads them from there.
#include <fmt/format.h>

#include <cmath>
#include <utility>

#include "ember/core/text.hpp"
#include "ember/cosmology/background.hpp"
#include "ember/evaporation/mass_loss.hpp"
#include "ember/evaporation/trajectory.hpp"
#include "ember/greybody/kerr_table.hpp"
#include "ember/greybody/table.hpp"
#include "ember/higgs/inputs.hpp"
#include "ember/population/counts.hpp"
#include "ember/scenario/scenario.hpp"
#include "ember/scenario/schema.hpp"
#include "ember/tunnelling/prescription.hpp"
#include "ember/units/constants.hpp"

namespace ember::scenario {

namespace {

// Formation masses, in g: a hole forms at gamma M_H, after T = 1e19 GeV (the top of the background
// table; gamma M_H < 1e-6 g there even for gamma = 1) and before today (gamma M_H ~ 1e55 g).
Range formable() {
  return between(1e-6, 1e50);
}

using units::Sign;

// The shipped Kerr table's top node: a* beyond it has no greybody factors.
double max_hole_spin() {
  return greybody::KerrBuildOptions{}.hole_spins.back();
}

// A default owned by a physics module's options, as the schema writes it: value and unit.
std::string in_planck_masses(double mass) {
  return format_real(mass / units::planck_mass) + " Mpl";
}

Key population() {
  Key spectrum = required(
      choice("spectrum", "the mass function of the holes at formation", "shape",
             {
                 {"monochromatic",
                  "every hole forms with one mass",
                  {required(quantity("mass", "formation mass", units::mass, "g", std::nullopt, formable()), "1e12 g")}},
                 {"lognormal",
                  "psi = f / (sqrt(2 pi) width M) exp(-ln^2(M/peak_mass) / (2 width^2))",
                  {required(quantity("peak_mass", "the mass M_c at the peak of M psi(M)", units::mass, "g",
                                     std::nullopt, formable()),
                            "1e20 g"),
                   required(number("width", "the width sigma in ln M", std::nullopt, between(0.01, 10)), "0.5")}},
                 {"power_law",
                  "psi ~ M^exponent between two cutoffs (scale-invariant radiation-era collapse)",
                  {required(quantity("min_mass", "lower cutoff", units::mass, "g", std::nullopt, formable()), "1e9 g"),
                   required(quantity("max_mass", "upper cutoff", units::mass, "g", std::nullopt, formable()), "1e15 g"),
                   number("exponent", "power of M in psi; -3/2 for a radiation era", "-1.5", between(-10, 10))}},
                 {"critical_collapse",
                  "psi ~ M^exponent exp(-(M/cutoff_mass)^exponent)",
                  {required(quantity("cutoff_mass", "the mass M_f where the exponential cut sets in", units::mass, "g",
                                     std::nullopt, formable()),
                            "1e12 g"),
                   number("exponent", "power of the rise and of the cut", "2.85", above_up_to(0, 20))}},
                 {"table",
                  "psi(M) read from a two-column text file (mass, psi)",
                  {required(input_file("file", "table of mass and psi; lines starting with # are comments"),
                            "spectrum.tsv"),
                   option("mass_unit", "unit of the file's mass column", {"g", "kg", "Msun", "Mpl", "GeV"}, "g")}},
             }),
      "");
  spectrum = ordered(std::move(spectrum), {{"min_mass", "max_mass", true}});  // power_law cutoffs

  Key abundance = required(choice("abundance", "how many holes form", "measure",
                                  {
                                      {"beta",
                                       "beta: the plain energy fraction in holes at formation, rho_PBH / rho_total "
                                       "(not a rescaled variant); for an extended spectrum quoted at its "
                                       "characteristic mass (lognormal: peak_mass; power_law: max_mass; "
                                       "critical_collapse: cutoff_mass; table: the geometric mean of its mass range)",
                                       {required(number("value", "beta", std::nullopt, between(0, 1)), "1e-20")}},
                                      {"f_pbh",
                                       "f_PBH: the fraction of the dark matter the holes would make today had none "
                                       "evaporated (for evaporated holes a bookkeeping measure of their number, not "
                                       "dark matter that exists)",
                                       {required(number("value", "f_PBH", std::nullopt, at_least(0)), "1e-3")}},
                                      {"lightcone_count",
                                       "number of holes formed inside our past light cone",
                                       {required(number("value", "the count", std::nullopt, at_least(0)), "1")}},
                                  }),
                           "");

  const std::string top = format_real(max_hole_spin());
  Key hole_spin = choice(
      "hole_spin",
      "the spin a* = J c / (G M^2) the holes are born with, the same at every formation mass (up to " + top +
          ", the Kerr greybody table's top node); spinning holes evaporate on the Kerr rates",
      "distribution",
      {
          {"fixed", "every hole forms with one a*", {number("value", "a*", "0", between(0, max_hole_spin()))}},
          {"uniform",
           "a* uniform between two values",
           {required(number("low", "lowest a*", std::nullopt, between(0, max_hole_spin())), "0.2"),
            required(number("high", "highest a*", std::nullopt, between(0, max_hole_spin())), "0.8")}},
          {"gaussian",
           "a* ~ exp(-(a* - mean)^2 / (2 width^2)), truncated to [0, " + top + "]",
           {required(number("mean", "the peak a*", std::nullopt, between(0, max_hole_spin())), "0.7"),
            required(number("width", "the width in a*", std::nullopt, above_up_to(0, 1)), "0.1")}},
          {"table",
           "a* and a density from a two-column text file (a* increasing, density >= 0; need not be normalised)",
           {required(input_file("file", "table of a* and density; lines starting with # are comments"), "spins.tsv")}},
      },
      "fixed");
  hole_spin = ordered(std::move(hole_spin), {{"low", "high", true}});

  return section("population", "the primordial black holes",
                 {spectrum, abundance, hole_spin,
                  number("collapse_fraction", "gamma: formation mass over the horizon mass",
                         format_real(population::ResponseContext{}.collapse_fraction), above_up_to(0, 1)),
                  with_example(quantity("cut_below",
                                        "extended spectra: no holes below this mass (not renormalised), to show how "
                                        "much of the verdict rests on the low tail; none by default",
                                        units::mass, "g", std::nullopt, above(0)),
                               "1e8 g")});
}

std::string gev(double value) {
  return format_real(value) + " GeV";
}

Key standard_model() {
  const higgs::MeasuredInputs& m = higgs::measured_inputs();
  Key potential = choice(
      "potential", "the potential the tunnelling codes use", "form",
      {
          {"standard_model",
           "the RG-improved Higgs potential from the inputs above",
           {flag("coleman_weinberg", "add the one-loop Coleman-Weinberg terms (top, W, Z; Landau gauge)", false),
            number("lambda6",
                   "coefficient of h^6 / (6 Mbar_Pl^2), Mbar_Pl the reduced Planck mass: a Planck-suppressed operator",
                   "0", any_value()),
            number("lambda8",
                   "coefficient of h^8 / (8 Mbar_Pl^4), Mbar_Pl the reduced Planck mass: a Planck-suppressed operator",
                   "0", any_value())}},
          {"polynomial",
           "V = scale^4 sum_n coefficients[n] (phi / scale)^n, n = 0, 1, 2, ...",
           {required(quantity("scale", "the field scale", units::energy, "GeV", std::nullopt, above(0)), "1e10 GeV"),
            [] {
              Key k = number_list("coefficients", "dimensionless coefficients, lowest power first", any_value(), 1);
              return required(k, "[0, 0, 0.5, 0, -0.01]");
            }()}},
          {"table",
           "V(phi) read from a two-column text file (phi in GeV, V in GeV^4)",
           {required(input_file("file", "table of phi and V; lines starting with # are comments"), "potential.tsv")}},
      },
      "standard_model");

  return section("standard_model", "the inputs that fix the Higgs potential",
                 {quantity("top_mass", "top-quark pole mass M_t", units::mass, "GeV", gev(m.top_mass.value),
                           between(top_mass_accepted.low, top_mass_accepted.high)),
                  quantity("higgs_mass", "Higgs-boson pole mass M_h", units::mass, "GeV", gev(m.higgs_mass.value),
                           between(higgs_mass_accepted.low, higgs_mass_accepted.high)),
                  number("alpha_s", "strong coupling alpha_s(M_Z), MS-bar, five flavours", format_real(m.alpha_s.value),
                         between(alpha_s_accepted.low, alpha_s_accepted.high)),
                  quantity("w_mass", "W-boson pole mass M_W", units::mass, "GeV", gev(m.w_mass.value), between(75, 85)),
                  integer("loops", "renormalisation-group running: " + higgs::loop_order_choices(),
                          std::to_string(higgs::Inputs{}.loops), between(1, 3)),
                  potential});
}

Key evaporation() {
  return section(
      "evaporation", "Hawking evaporation",
      {quantity("qcd_scale",
                "confinement scale: holes hotter than it emit quarks and gluons, cooler ones light hadrons (pions)",
                units::energy, "GeV", format_real(evaporation::MassLossOptions{}.qcd_scale) + " GeV",
                between(evaporation::MassLossOptions::qcd_scale_min, evaporation::MassLossOptions::qcd_scale_max)),
       number("qcd_width", "width of the switch from hadrons to partons, a standard deviation in ln T_H",
              format_real(evaporation::MassLossOptions{}.qcd_width),
              between(evaporation::MassLossOptions::qcd_width_min, evaporation::MassLossOptions::qcd_width_max)),
       option("greybody_argument", "massive species: evaluate greybody factors at the energy or the momentum",
              {"energy", "momentum"}, "energy"),
       option("greybody_table",
              "shipped = data/greybody.tsv; computed = solved by this binary from the wave equations (about a "
              "second at 161 points) and kept in the cache",
              {"shipped", "computed"}, "shipped"),
       integer("greybody_points",
               "computed: grid points per greybody mode, log-uniform in x = GM omega/c^3 over "
               "[1e-3, 5]",
               std::to_string(greybody::BuildOptions{}.points_per_mode), between(8, 10000)),
       with_example(input_file("kerr_table",
                               "spinning holes: the Kerr greybody table (written by ember greybody --rebuild-kerr); "
                               "absent: the shipped data/kerr_greybody.tsv"),
                    "my_kerr_greybody.tsv"),
       quantity("cutoff_mass", "mass where numerical integration stops and the analytic end takes over", units::mass,
                "Mpl", in_planck_masses(evaporation::TrajectoryOptions{}.cutoff_mass), at_least(1))});
}

// Every prescription the tunnelling module has, by its own names; by default those that need
// nothing beyond the potential (not a user's thin wall).
std::pair<std::vector<std::string>, std::vector<std::string>> prescription_names() {
  std::vector<std::string> all, standard;
  for (const auto p : tunnelling::all_prescriptions) {
    all.push_back(tunnelling::name_of(p));
    if (!tunnelling::needs(p).wall) standard.push_back(tunnelling::name_of(p));
  }
  return {all, standard};
}

Key tunnelling() {
  const auto [all, standard] = prescription_names();
  return section(
      "tunnelling", "seeded vacuum decay",
      {option_list("prescriptions", "the rate prescriptions to compare, side by side", all, standard),
       option("prefactor", "rate prefactor A in A exp(-B): root_action = (B/2pi)^(1/2)/(G M), light_crossing = 1/(G M)",
              {"root_action", "light_crossing"}, "root_action"),
       quantity("semiclassical_floor", "seeds below this mass are flagged as outside the semiclassical regime",
                units::mass, "Mpl", in_planck_masses(tunnelling::TunnellingSetup{}.semiclassical_floor), at_least(1)),
       number("hot_bubble_volume", "hot_bubble: nucleation volume in units of the horizon volume 4 pi r_h^3 / 3", "1",
              above(0)),
       number("minimum_action",
              "B below this is flagged: e^-B is then no suppression and the semiclassical rate has no meaning; the "
              "summary says how much of N rests on such points (common practice: of order 1 to a few)",
              format_real(tunnelling::TunnellingSetup{}.minimum_action), above(0)),
       option("hot_era",
              "decays while the plasma is hotter than the hole, or its thermal mass holds the bubble's field in the "
              "false vacuum: postpone = not counted until the plasma has cooled; count = counted as if the exterior "
              "were cold, and flagged (summary.json gives N both ways)",
              {"postpone", "count"}, population::name_of(population::DecayOptions{}.hot_era)),
       number("spin_limit",
              "spinning holes: the seeded rate (for non-rotating seeds) counts only once a* has fallen to this; "
              "where decay outruns evaporation at a higher a*, the point is flagged and its share of N reported",
              format_real(population::spin_limit), above_up_to(0, 0.5)),
       section("thin_wall", "thin_wall: the wall of a user's thin-wall potential",
               {with_example(quantity("tension", "wall tension sigma", {units::Dimension::energy, 3}, "GeV^3",
                                      std::nullopt, above(0)),
                             "1e30 GeV^3"),
                with_example(quantity("energy_gap", "false-vacuum minus true-vacuum energy density epsilon",
                                      {units::Dimension::energy, 4}, "GeV^4", std::nullopt, above(0)),
                             "1e38 GeV^4")})});
}

Key cosmology() {
  const cosmology::Parameters p = cosmology::planck2018();
  const std::string kelvin = format_real(std::round(p.cmb_temperature / units::kelvin * 1e6) / 1e6) + " K";
  return section(
      "cosmology", "flat Lambda-CDM with radiation",
      {number("hubble", "h = H0 / (100 km/s/Mpc)", format_real(p.hubble), between(0.3, 1.2)),
       number("omega_b_h2", "baryon density Omega_b h^2", format_real(p.omega_b_h2), between(0, 0.1)),
       number("omega_cdm_h2", "cold dark matter density Omega_c h^2", format_real(p.omega_cdm_h2), between(0.001, 0.5)),
       quantity("cmb_temperature", "CMB temperature today", units::temperature, "K", kelvin, between(1, 5)),
       number("n_eff", "effective number of neutrino species", format_real(p.n_eff), between(0, 10)),
       with_example(input_file("dof_table",
                               "g_rho(T) and g_s(T) table (T in GeV, g_rho, g_s); absent: the shipped "
                               "data/relativistic_dof.tsv (Saikawa & Shirai 2018)"),
                    "my_dof.tsv")});
}

Key band_axis(std::string name, std::string meaning, Key sigma) {
  return section(
      std::move(name), std::move(meaning),
      {std::move(sigma), number("span", "half-width of the band in units of sigma", "2", above(0)),
       integer("points", "grid points across the band; 1 means the central value only", "1", between(1, 1001))});
}

Key scan() {
  const higgs::MeasuredInputs& m = higgs::measured_inputs();
  Key masses = ordered(section("masses", "grid of formation (or characteristic) masses, logarithmic",
                               {with_example(quantity("from",
                                                      fmt::format("lowest mass; left out, the spectrum's own lowest "
                                                                  "mass (monochromatic: {} g)",
                                                                  format_real(monochromatic_scan_from_g)),
                                                      units::mass, "g", std::nullopt, formable()),
                                             "1 g"),
                                with_example(quantity("to",
                                                      fmt::format("highest mass; left out, the spectrum's own "
                                                                  "highest mass (monochromatic: {} g)",
                                                                  format_real(monochromatic_scan_to_g)),
                                                      units::mass, "g", std::nullopt, formable()),
                                             "1e15 g"),
                                integer("points", "number of masses", "61", between(1, 100000))}),
                       {{"from", "to", false}});
  Key band = section(
      "band", "Higgs-input sensitivity band; the axes combine as a grid",
      {band_axis("top_mass", "top-mass axis",
                 quantity("sigma", "one standard deviation", units::mass, "GeV", gev(m.top_mass.sigma), above(0))),
       band_axis("higgs_mass", "Higgs-mass axis",
                 quantity("sigma", "one standard deviation", units::mass, "GeV", gev(m.higgs_mass.sigma), above(0))),
       band_axis("alpha_s", "alpha_s axis",
                 number("sigma", "one standard deviation", format_real(m.alpha_s.sigma), above(0))),
       number_list("lambda6",
                   "extra values of lambda6 (of h^6 / (6 Mbar_Pl^2), Mbar_Pl the reduced Planck mass) to scan; empty "
                   "for none",
                   any_value()),
       number_list("lambda8",
                   "extra values of lambda8 (of h^8 / (8 Mbar_Pl^4), Mbar_Pl the reduced Planck mass) to scan; empty "
                   "for none",
                   any_value())});
  Key thresholds = section(
      "thresholds",
      "where the verdict flips as one Standard Model input moves (the others at the scenario's values), per "
      "prescription, found by root-finding; also where seeded decay stops outrunning evaporation at every seed mass",
      {option_list("inputs", "inputs to search; empty for none", {"top_mass", "higgs_mass", "alpha_s"}, {"top_mass"},
                   0),
       number("span",
              "half-width of the search window around the scenario's value, in units of the input's sigma "
              "(scan.band.<input>.sigma); the top-mass window also reaches down past the critical top mass",
              "8", between(0.5, 100)),
       integer("points", "evaluations across the window, which bracket the roots and draw the sensitivity figure", "9",
               between(3, 1001)),
       number("tolerance", "on each root, in units of the input's sigma", "0.02", between(1e-6, 1))});
  return section(
      "scan", "what to scan",
      {masses, number_list("widths", "lognormal widths to scan; empty for the spectrum's own", between(0.01, 10)), band,
       thresholds});
}

Key exclusion() {
  return section(
      "exclusion", "when a scenario counts as excluded",
      {number("max_decays",
              "excluded when N, the expected decays in our past light cone, exceeds this (N > max_decays)", "1",
              above(0)),
       with_example(number("confidence_level",
                           "instead of max_decays: excluded when the survival probability e^-N falls below 1 - CL, "
                           "i.e. N > -ln(1 - CL); none by default",
                           std::nullopt, between(0.01, 0.9999999)),
                    "0.95")});
}

Key output() {
  return section(
      "output", "what to write",
      {output_path("directory", "folder for results, relative to the current folder", "ember-out"),
       option_list("files",
                   "result files to write (band: band.csv, written when the band has more than "
                   "one point; sensitivity: sensitivity.csv, written when scan.thresholds searches an input)",
                   {"summary", "constraint", "decay", "band", "sensitivity", "resolved", "plots"},
                   {"summary", "constraint", "decay", "band", "sensitivity", "resolved", "plots"}),
       option_list("plot_formats", "image formats for plots", {"png", "pdf", "svg"}, {"png", "pdf"})});
}

}  // namespace

Key scenario_schema() {
  return section("", "an Ember scenario",
                 {text("title", "a one-line label for reports", ""), population(), standard_model(), evaporation(),
                  tunnelling(), cosmology(), scan(), exclusion(), output()});
}

}  // namespace ember::scenario
