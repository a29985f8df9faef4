// The tunnelling-rate prescriptions Ember compares side by side, each with its assumptions.
//
// Units: internal natural units (GeV); actions dimensionless.
//
//   entropy_drop  static Euclidean bubble around the hole with gravitational back-reaction;
//                 B = (A_+ - A_-)/(4G), the drop in horizon entropy (Burda, Gregory & Moss 2015).
//                 Assumes the hole in thermal equilibrium with its radiation (Hartle-Hawking
//                 state) and a static (tau-independent) instanton with a remnant hole.
//   probe_field   the same field on a fixed Schwarzschild background: B = E / T_H, a Boltzmann
//                 factor for the static bubble's energy at the Hawking temperature.
//   hot_bubble    a flat-space O(3) thermal bubble at T = T_H with the Standard Model thermal
//                 mass: the enhancement is only thermal; rate T^4 (S3/2 pi T)^{3/2} e^{-S3/T}
//                 times a near-horizon volume.
//   no_seed       the homogeneous flat-space O(4) decay (no black hole), the baseline: for the
//                 Standard Model the unseeded estimate of unseeded.hpp (the Fubini family, the
//                 Planck-suppressed operators on the bounce), a numerical O(4) bounce otherwise;
//                 rate per volume times the horizon volume, for comparison only.
//   thin_wall     a thin wall of tension sigma and vacuum-energy gap epsilon: the static wall
//                 around the hole from the Israel junction conditions; without one, the
//                 Coleman-De Luccia no-seed action.
// Where a static instanton does not exist the stated fallback is B = 4 pi G M_+^2 (the whole
// seed entropy: a remnant-free decay, whose Euclidean-time-dependent instantons are outside
// this version), flagged.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "ember/core/estimate.hpp"
#include "ember/higgs/potential.hpp"
#include "ember/tunnelling/static_instanton.hpp"
#include "ember/tunnelling/thin_wall.hpp"

namespace ember::tunnelling {

enum class Prescription { entropy_drop, probe_field, hot_bubble, no_seed, thin_wall };
inline constexpr Prescription all_prescriptions[] = {Prescription::entropy_drop, Prescription::probe_field,
                                                     Prescription::hot_bubble, Prescription::no_seed,
                                                     Prescription::thin_wall};
std::string name_of(Prescription p);
std::optional<Prescription> prescription_named(const std::string& name);
std::string assumptions(Prescription p);  // one paragraph
// What a prescription takes from the setup (TunnellingSetup), so callers need not know names.
struct PrescriptionNeeds {
  bool potential = true;        // reads the potential (thin_wall reads only its wall)
  bool standard_model = false;  // the Standard Model potential itself (hot_bubble: its thermal mass)
  bool wall = false;            // a thin wall's tension and energy gap (TunnellingSetup::thin_wall)
};
PrescriptionNeeds needs(Prescription p);
// The cost of one B(M) node under this prescription relative to one probe_field node (a static
// bubble solve), for progress estimates only. Measured on 30-node Standard Model tables
// (docs/benchmarks.md): entropy_drop and hot_bubble cost about as much as probe_field, no_seed
// and thin_wall (closed forms and a scan) about a fifteenth.
double relative_node_cost(Prescription p);

struct Flags {
  bool below_floor = false;        // seed below the semiclassical floor
  bool fallback = false;           // no static solution: the stated fallback is used
  bool resolution_limit = false;   // the bubble is thinner than the solver resolves
  bool several_branches = false;   // more than one static solution; the lowest B is used
  bool near_branch_point = false;  // dM_+/dM_- near zero: two branches about to merge
  bool outside_running = false;    // a scale beyond the range the couplings were run over
  bool no_decay = false;           // no bubble at all (B is infinite; rate zero)
  bool beyond_table = false;       // above the tabulated range: B extrapolated, the rate negligible
  bool unconverged = false;        // the solver's error on B exceeds 1e-4 of B (see the note)
  // Below the critical seed mass: no static solution here, but one at a heavier seed. The
  // remnant-free, Euclidean-time-dependent instantons that take over are not computed;
  // the fallback B = 4 pi G M^2 stands in for them.
  bool remnant_free_regime = false;
  // B below the setup's minimum_action: e^{-B} is then no suppression at all, and the
  // semiclassical expansion that gives the rate has no meaning there.
  bool below_minimum_action = false;
  std::vector<std::string> list() const;
  Flags& operator|=(const Flags& o);
};

struct ActionPoint {
  double seed_mass = 0;                 // GeV
  Estimate action;                      // B (when no_decay: value is +inf and never written out)
  double remnant_mass = 0;              // GeV (the seed itself where there is no remnant)
  double phi_horizon = 0;               // GeV, 0 when not applicable
  std::optional<double> own_prefactor;  // GeV: for prescriptions that fix their own rate prefactor
  Flags flags;
  std::string note;
};

struct TunnellingSetup {
  const higgs::Potential* potential = nullptr;                    // the potential (false vacuum at 0)
  const higgs::StandardModelPotential* standard_model = nullptr;  // set when it is the SM one
  std::optional<ThinWall> thin_wall;                              // for thin_wall
  double newton_G = units::newton_G;
  double semiclassical_floor = 1e3 * units::planck_mass;
  // The smallest B whose e^{-B} is read as a semiclassical rate; below it points are flagged
  // (common practice: of order 1 to a few).
  double minimum_action = 1;
  double hot_bubble_volume = 1;  // in units of 4 pi r_h^3 / 3
};

// How much work a caller wants put into B; none of it moves B beyond its stated error.
struct ActionEffort {
  // Measure the static solutions' field-equation residual (StaticOptions::residual_check),
  // reported in the note. B(M) tables skip it: their accuracy is measured against direct solves
  // at interval midpoints instead.
  bool residual_check = true;
  // A quick estimate: the static solver's step and shooting tolerances loosened to
  // rough_tolerance, enough to tell whether B passes a threshold (B(M) tables find their top
  // this way). B's stated error follows.
  bool rough = false;
};
inline constexpr double rough_tolerance = 1e-7;

// The static solver's options for a setup and an effort (back-reacted or in the probe limit).
StaticOptions static_options(const TunnellingSetup& setup, const ActionEffort& effort, bool back_reaction);

// B and friends for one prescription at one seed mass (GeV). Throws InputError when the
// prescription cannot apply (thin_wall without a wall), NumericalError when a solver fails.
ActionPoint action_at(Prescription p, const TunnellingSetup& setup, double seed_mass, const ActionEffort& effort = {});

}  // namespace ember::tunnelling
