// The whole job of `ember run`: from a typed Scenario to decay counts, constraint curves and the
// Higgs-input band, through every stage in data-flow order (cosmology, evaporation, higgs,
// tunnelling, population). The results are plain data for the report module to write.
//
// Units: internal natural units throughout (GeV, GeV^-1); the report converts.
#pragma once

#include <filesystem>
#include <functional>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "ember/higgs/stability.hpp"
#include "ember/pipeline/checkpoint.hpp"
#include "ember/pipeline/executor.hpp"
#include "ember/population/counts.hpp"
#include "ember/population/thermal_baseline.hpp"
#include "ember/scenario/scenario.hpp"

namespace ember::pipeline {

// Numerical choices of the job, with their rule; not scenario keys.
struct JobOptions {
  int table_points = 30;          // B(M) nodes per prescription and Higgs point (ActionTableOptions)
  int table_check_stride = 6;     // check every this many B(M) interval midpoints
  int responses_per_decade = 10;  // formation masses per decade for extended spectra
  int decay_grid_points = 500;    // ln M grid for decay times and crossovers (DecayOptions)
  int plot_points = 120;          // seed masses for the Gamma_D/Gamma_H plot data
  // Work is shared out per B(M) table, then in chunks of this many scan rows (monochromatic) or
  // response-grid masses (extended spectra); the results do not depend on either.
  int rows_per_chunk = 8;
  int grid_per_chunk = 12;
  // ... but chunks grow so that all tables together have at most this many (at least one per
  // table): each chunk is a checkpoint file, written and fsync'd, so a 1e5-row grid makes
  // hundreds of files rather than 12,500.
  int max_chunks = 256;
  int threads = 1;    // worker threads; the results do not depend on it
  bool quiet = true;  // no progress bar on stderr
  // Tables are kept here between runs (greybody/table_cache.hpp, evaporation/mass_loss_cache.hpp,
  // tunnelling/action_cache.hpp); none: always rebuilt.
  std::optional<std::filesystem::path> cache_directory;
  // Finished units are checkpointed here, and a rerun of the same job resumes from them.
  std::optional<CheckpointOptions> checkpoint;
  // Who computes the units; none: `threads` threads on this machine. Not owned.
  const Executor* executor = nullptr;
  // For tests: called before each scan row of each unit with (Higgs point, prescription, row), and
  // with row = the number of rows before the central point's own counts; a NumericalError thrown
  // there is recorded like a solver failure at that row (or, for the counts, of the whole unit).
  std::function<void(std::size_t, std::size_t, std::size_t)> before_row;
};

// What a checkpoint of this job must match besides the scenario: every option that changes a
// number (not the thread count, the cache or the executor), and the numerics fingerprint.
std::string job_identity(const JobOptions& options);

struct HiggsPoint {
  higgs::Inputs inputs;
  double lambda6 = 0, lambda8 = 0;
  bool central = false;
  std::string label;
  double sigmas = 0;       // the largest |offset| / sigma over M_t, M_h and alpha_s
  bool operators = false;  // lambda6 or lambda8 differ from the central point's
};

struct CurveRow {
  double mass = 0;                            // formation mass (monochromatic) or characteristic mass (GeV)
  double width = 0;                           // lognormal width, 0 when not scanned
  std::optional<double> beta_max, f_max;      // none: no constraint (no decays, or a bound >= 1)
  std::optional<double> band_low, band_high;  // beta_max envelope over the band points with a constraint
  // The same over the points within 1 sigma and within 2 sigma of the central inputs (the
  // central operators only): the measured uncertainty of M_t, M_h and alpha_s.
  std::optional<double> band1_low, band1_high, band2_low, band2_high;
  int band_without = 0;  // band points where there is no constraint here
  bool failed = false;   // a solver failed here (JobResults::failures says why)
};

struct PrescriptionOutcome {
  tunnelling::Prescription prescription;
  population::Counts counts;  // the scenario's own abundance, central inputs
  double survival = 1;        // e^{-N}
  bool excluded = false;
  std::vector<CurveRow> curve;
  std::vector<population::Response> scan;  // monochromatic responses at the scan masses (decay.csv)
  std::vector<double> dn_dlnm;             // extended spectra: dN/d ln M at each scan response (decay.csv)
  std::optional<population::ContributionRange> range90;  // the masses holding the central 90% of N
  std::string table_summary;
  std::vector<double> plot_ratio;     // Gamma_D / Gamma_H at JobResults::plot_masses
  std::vector<bool> plot_low_action;  // B below tunnelling.minimum_action there
  std::string failure;                // a solver failed for the central point: why (counts and verdict then void)
};

struct BandPoint {
  HiggsPoint point;
  higgs::Verdict verdict = higgs::Verdict::stable;
  bool constraint = false;
  std::optional<double> log10_unseeded;
  bool failed = false;  // some unit of this point failed (JobResults::failures says why)
  // Per prescription: the scenario's own N at this point (none where its unit failed), and
  // beta_max / f_max per scan row (band.csv).
  std::vector<std::optional<double>> lightcone;
  std::vector<std::vector<std::optional<double>>> beta_max, f_max;
};

// A point of the scan where a solver failed; the rest of the scan went on without it.
struct FailedPoint {
  std::size_t point = 0;              // index into JobResults::band
  std::string prescription;           // empty: the point's potential itself failed
  std::optional<double> mass, width;  // the scan row (GeV); none: the whole unit
  std::string reason;                 // the solver's message, with its numbers
};

// One evaluation of the scenario's own N at another value of one Standard Model input (the
// others at the scenario's values), under one prescription.
struct SensitivitySample {
  double value = 0;                 // the input's value (GeV for the masses)
  std::size_t prescription = 0;     // index into JobResults::outcomes
  std::optional<double> lightcone;  // N in our past light cone; none where a solver failed
  std::optional<double> max_ratio;  // the largest Gamma_D / Gamma_H over the seed masses
  bool grid = true;                 // a window evaluation (false: one of a root's refinements)
  std::string failure;              // the solver's message where one failed
};

// Where a quantity crosses its limit as the input moves.
struct Threshold {
  std::optional<double> value;  // none: no crossing in the window (note says which side holds)
  std::string note;             // which side is excluded (or outruns), or why there is none
  int crossings = 0;            // sign changes across the window's grid (the nearest one is refined)
};

struct PrescriptionThresholds {
  Threshold exclusion;  // where N = max_decays
  Threshold outruns;    // where the largest Gamma_D / Gamma_H over seed masses is 1
};

struct InputThresholds {
  scenario::ThresholdInput input = scenario::ThresholdInput::top_mass;
  double central = 0, sigma = 0;  // the scenario's value and the band's sigma (GeV for the masses)
  double from = 0, to = 0;        // the window searched
  double tolerance = 0;           // on each root (GeV for the masses)
  // Top mass only: the absolute-stability critical top mass at the scenario's M_h and alpha_s
  // (effective-potential criterion, the scenario's potential options); none where it failed.
  std::optional<double> critical_top_mass;
  std::string critical_note;                          // why it is missing
  std::vector<PrescriptionThresholds> prescriptions;  // as JobResults::outcomes
  std::vector<SensitivitySample> samples;             // by prescription, then by value
};

struct JobResults {
  std::string potential;                                        // description
  std::optional<higgs::StabilityReport> stability;              // Standard Model potentials
  std::optional<population::ThermalBaseline> thermal_baseline;  // the hot universe's own decay (SM potentials)
  std::string spectrum;                                         // description
  double spectrum_mass = 0;                 // its formation (monochromatic) or characteristic mass, GeV
  std::string greybody;                     // which greybody table, and its stated error
  std::string hole_spin;                    // the spins the holes are born with (description)
  bool spinning = false;                    // some holes are born with a* > 0: Kerr clock, spin gate
  double spin_limit = 0;                    // the seeded rate counts once a* has fallen to this
  std::string kerr;                         // spinning: which Kerr table, and the rates' stated error
  std::optional<bool> greybody_from_cache;  // a computed table: read from the cache or built
  bool no_constraint = false;               // stable potential or no bubble: no seeded decay at all
  std::string no_constraint_reason;
  std::vector<PrescriptionOutcome> outcomes;
  std::vector<BandPoint> band;                                   // every Higgs point, central first
  std::vector<double> plot_masses;                               // GeV
  std::vector<double> plot_field, plot_lambda, plot_lambda_eff;  // the potential, for plots
  double survivors_mass = 0;                                     // holes above this mass survive today (GeV)
  double seconds = 0;
  int tables_built = 0, tables_from_cache = 0;    // B(M) tables, per (Higgs point, prescription)
  int items_resumed = 0;                          // units read back from a checkpoint
  std::optional<std::string> cache_warning;       // the cache could not keep a table built here: why (the first)
  std::optional<std::string> checkpoint_warning;  // checkpointing stopped during the run: why
  std::vector<FailedPoint> failures;              // in scan order; empty when every point succeeded
  std::vector<std::string> warnings;              // the scan's range against the scenario (stderr, summary.json)
  std::vector<InputThresholds> thresholds;        // scan.thresholds (Standard Model potentials only)
  bool assembled = true;                          // false on MPI ranks that only computed
};

// Throws InputError for a prescription the potential cannot take (hot_bubble needs the Standard
// Model; thin_wall needs a wall), NumericalError when a solver fails.
JobResults run_job(const scenario::Scenario& scenario, const JobOptions& options = {});

}  // namespace ember::pipeline
