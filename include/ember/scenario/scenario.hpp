// The typed scenario: what a user asked for, in internal units (GeV^n; see units/constants.hpp).
// Built from a resolved document (resolve.hpp), so every field is present and valid.
#pragma once

#include <yaml-cpp/yaml.h>

#include <filesystem>
#include <optional>
#include <string>
#include <variant>
#include <vector>

#include "ember/cosmology/background.hpp"
#include "ember/evaporation/trajectory.hpp"
#include "ember/greybody/table.hpp"
#include "ember/higgs/potential.hpp"
#include "ember/population/counts.hpp"
#include "ember/tunnelling/rate.hpp"

namespace ember::scenario {

// --- population -------------------------------------------------------------------------------
struct Monochromatic {
  double mass;  // GeV
};
struct Lognormal {
  double peak_mass;  // GeV
  double width;      // sigma in ln M
};
struct PowerLaw {
  double min_mass, max_mass;  // GeV
  double exponent;
};
struct CriticalCollapse {
  double cutoff_mass;  // GeV
  double exponent;
};
struct TabulatedSpectrum {
  std::filesystem::path file;
  std::string mass_unit;
};
using Spectrum = std::variant<Monochromatic, Lognormal, PowerLaw, CriticalCollapse, TabulatedSpectrum>;

// The spins the holes are born with (population/hole_spin.hpp builds the nodes).
struct FixedSpin {
  double value;
};
struct UniformSpin {
  double low, high;
};
struct GaussianSpin {
  double mean, width;
};
struct TabulatedSpin {
  std::filesystem::path file;
};
using HoleSpin = std::variant<FixedSpin, UniformSpin, GaussianSpin, TabulatedSpin>;

using population::AbundanceMeasure;  // beta, f_pbh or lightcone_count
struct Abundance {
  AbundanceMeasure measure;
  double value;
};

struct Population {
  Spectrum spectrum;
  Abundance abundance;
  double collapse_fraction;
  std::optional<double> cut_below;  // GeV: no holes below this mass (extended spectra)
  HoleSpin hole_spin;
};

// --- Standard Model inputs and the potential ---------------------------------------------------
struct StandardModelForm {
  higgs::StandardModelOptions options;  // Coleman-Weinberg terms, lambda6, lambda8
};
struct PolynomialForm {
  double scale;                      // GeV
  std::vector<double> coefficients;  // dimensionless, lowest power first
};
struct TabulatedForm {
  std::filesystem::path file;
};
using PotentialForm = std::variant<StandardModelForm, PolynomialForm, TabulatedForm>;  // the higgs module builds each

// The Standard Model inputs a scenario accepts (GeV for the masses); the threshold windows stay
// within them too (pipeline/thresholds.hpp).
struct InputRange {
  double low, high;
};
inline constexpr InputRange top_mass_accepted{150, 200}, higgs_mass_accepted{100, 150}, alpha_s_accepted{0.1, 0.14};
struct StandardModelInputs {
  higgs::Inputs inputs;  // M_t, M_h, M_W (GeV), alpha_s(M_Z), loop order
  PotentialForm potential;
};

// --- evaporation, tunnelling --------------------------------------------------------------------
struct EvaporationChoices {
  evaporation::MassLossOptions mass_loss;     // qcd_scale, greybody argument
  evaporation::TrajectoryOptions trajectory;  // cutoff_mass
  // The greybody table: the shipped file, or (when set) computed with these options and cached.
  std::optional<greybody::BuildOptions> computed_greybody;
  std::optional<std::filesystem::path> kerr_table;  // spinning holes; none: the shipped table
};

using tunnelling::Prefactor;
using tunnelling::Prescription;
struct TunnellingChoices {
  std::vector<Prescription> prescriptions;
  Prefactor prefactor;
  double semiclassical_floor;          // GeV
  double hot_bubble_volume;            // in units of 4 pi r_h^3 / 3
  double minimum_action;               // B below this is flagged (tunnelling::TunnellingSetup)
  population::HotEra hot_era;          // decays while the plasma is too hot: postponed or counted
  double spin_limit;                   // spinning holes: the seeded rate counts below this a*
  std::optional<double> wall_tension;  // GeV^3
  std::optional<double> energy_gap;    // GeV^4
};

// --- cosmology, scan, exclusion, output --------------------------------------------------------
using CosmologyInputs = cosmology::Parameters;  // h, Omega_b h^2, Omega_c h^2, T_CMB (GeV), N_eff

// The scan's mass range. Either end left out follows the spectrum: an extended spectrum's own
// range (MassFunction::low, high: all but a stated tiny share of its abundance), or for a
// monochromatic spectrum the range below, where holes evaporate by today (common practice).
inline constexpr double monochromatic_scan_from_g = 1, monochromatic_scan_to_g = 1e15;
// An explicit range that leaves out more than this share of the scenario's abundance is warned of.
inline constexpr double scan_abundance_cut = 1e-6;
struct MassGrid {
  std::optional<double> from, to;  // GeV; none: follow the spectrum
  int points;
};
struct BandAxis {
  double sigma;  // GeV for masses, dimensionless for alpha_s
  double span;   // in units of sigma
  int points;
};
struct Band {
  BandAxis top_mass, higgs_mass, alpha_s;
  std::vector<double> lambda6, lambda8;
};
// Where the scenario's verdict flips as one Standard Model input moves, the others held at the
// scenario's values (pipeline/thresholds.hpp).
enum class ThresholdInput { top_mass, higgs_mass, alpha_s };
std::string name_of(ThresholdInput input);
struct Thresholds {
  std::vector<ThresholdInput> inputs;  // searched, in this order; empty: none
  double span;                         // half-width of the search window, in sigma of the input (the band's)
  int points;                          // evaluations across the window, before the roots are refined
  double tolerance;                    // on each root, in sigma of the input
};
struct ScanChoices {
  MassGrid masses;
  std::vector<double> widths;
  Band band;
  Thresholds thresholds;
};

struct ExclusionRule {
  double max_decays;
};

struct OutputChoices {
  std::filesystem::path directory;
  std::vector<std::string> files;
  std::vector<std::string> plot_formats;
};

struct Scenario {
  std::string title;
  Population population;
  StandardModelInputs standard_model;
  EvaporationChoices evaporation;
  TunnellingChoices tunnelling;
  CosmologyInputs cosmology;
  ScanChoices scan;
  ExclusionRule exclusion;
  OutputChoices output;
  std::optional<std::filesystem::path> dof_table;  // cosmology.dof_table; none: the shipped table
};

// Reads a resolved document (every key present and valid).
Scenario read_scenario(const YAML::Node& resolved);

}  // namespace ember::scenario
