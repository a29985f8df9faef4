// Seeded vacuum decay along one hole's mass-loss history, and the expected number of decays.
//
// Units: internal natural units (GeV, GeV^-1).
//
// The hazard accumulated from formation to the end (today, or the semiclassical floor for a hole
// that evaporates) is
//   H = int Gamma_D dt = int Gamma_D(M) M^3/alpha(M) d ln M = int (Gamma_D/Gamma_H) d ln M,
// integrated adaptively in ln M (GSL QAG), and P_decay = 1 - e^{-H}. As a cross-check the same
// hazard is integrated in time along the trajectory, in ln(time left). The decay time is the
// probability-weighted mean time of decay, int t dP / P. The expected decays in our past light
// cone from holes of this mass are n a^3 P (4 pi/3) chi(t_decay)^3, and per Hubble
// volume at the decay n(t_decay) P (4 pi/3) H(t_decay)^-3.
//
// Two restrictions of the hazard are kept beside it. The hot era (plasma.hpp): under
// HotEra::postpone, the default, Gamma_D counts only where the plasma is cold enough for a
// cold-exterior rate; under HotEra::count it counts everywhere and the share from the hot era is
// reported. And the points with B below the setup's minimum_action (ActionPoint flag
// below_minimum_action): their share of P_decay is reported, since e^{-B} means nothing there.
// Restricted hazards are the same ln M integral over the pieces where the restriction holds,
// found on the decay grid and refined by bisection, then integrated piece by piece.
#pragma once

#include <cmath>
#include <optional>

#include "ember/cosmology/background.hpp"
#include "ember/evaporation/kerr_mass_loss.hpp"
#include "ember/evaporation/trajectory.hpp"
#include "ember/population/formation.hpp"
#include "ember/population/hole_spin.hpp"
#include "ember/population/plasma.hpp"
#include "ember/tunnelling/action_table.hpp"
#include "ember/tunnelling/rate.hpp"

namespace ember::population {

struct DecayOptions {
  tunnelling::Prefactor prefactor = tunnelling::Prefactor::root_action;
  // Quadrature: QAG to this relative accuracy.
  double relative_tolerance = 1e-8;
  // Grid in ln M for the decay time, the crossover search and the pieces of restricted hazards.
  int grid_points = 2000;
  HotEra hot_era = HotEra::postpone;
};

// P_decay and its mean time of decay under one treatment of the hot era.
struct Treatment {
  double hazard = 0, probability = 0;
  double decay_time = 0;        // probability-weighted mean time of decay (GeV^-1); 0 if P = 0
  double lightcone_radius = 0;  // chi(decay_time)
};

struct Decay {
  double hazard = 0;                     // H, from the ln M integral
  double hazard_in_time = 0;             // H, from the time integral (cross-check)
  double probability = 0;                // P_decay
  bool evaporated = false;               // the hole is gone by today
  double lifetime = 0;                   // GeV^-1, from formation
  double end_mass = 0;                   // where the integration stopped (GeV)
  std::optional<double> crossover_mass;  // first (largest) mass with Gamma_D >= Gamma_H
  double branching_at_crossover = 0;
  double decay_time = 0;            // probability-weighted mean time of decay (GeV^-1); 0 if P = 0
  double lightcone_radius = 0;      // chi(decay_time)
  bool decays_below_floor = false;  // the hazard would be large only below the floor
  bool formed_below_floor = false;  // formed below the semiclassical floor: nothing counted
  // hazard, probability, decay_time and lightcone_radius above are those of the chosen treatment
  // (DecayOptions::hot_era); both treatments in full:
  Treatment counted, postponed;
  double probability_semiclassical = 0;  // P_decay (chosen treatment) from points with B >= minimum_action
  double plasma_at_decay = 0;            // T_p at decay_time, GeV; 0 if P = 0
  double plasma_at_crossover = 0;        // T_p when Gamma_D first reaches Gamma_H, GeV; 0 if none
  std::optional<double> cooled_time;     // first time the plasma is cold enough (GeV^-1); none: never
  // A hole born spinning (decay_along_spinning): the seeded rate counts only below gate_mass,
  // where a* has fallen to the spin limit; the spin at the crossover, and whether it was still
  // above the limit there (no prescription in Ember treats such a seed). Non-rotating: infinite,
  // none, false.
  double gate_mass = HUGE_VAL;
  std::optional<double> spin_at_crossover;
  bool spinning_crossover = false;
};

Decay decay_along(const Formation& formation, const evaporation::MassLoss& mass_loss,
                  const evaporation::TrajectoryOptions& trajectory, const tunnelling::ActionTable& table,
                  const cosmology::Background& background, const DecayOptions& options = {},
                  const higgs::StandardModelPotential* standard_model = nullptr);

// What a spinning hole's decay needs besides the table: the Kerr rates for the clock, the
// Schwarzschild ones for the handover (evaporation/spinning_clock.hpp), and the spin limit.
struct SpinningRates {
  const evaporation::KerrMassLoss* kerr = nullptr;
  const evaporation::MassLoss* schwarzschild = nullptr;
  evaporation::TrajectoryOptions trajectory;
  double spin_limit = population::spin_limit;
};

// A hole born with a* = hole_spin > 0: the clock and Gamma_H from the Kerr rates, Gamma_D from
// the (non-rotating) table, counted only where a* <= spin_limit. The restricted hazards, the
// decay time and the time-integral cross-check are all taken over those masses; the crossover
// (the first mass with Gamma_D >= Gamma_H) over the whole history, as a flag.
Decay decay_along_spinning(const Formation& formation, double hole_spin, const SpinningRates& rates,
                           const tunnelling::ActionTable& table, const cosmology::Background& background,
                           const DecayOptions& options = {},
                           const higgs::StandardModelPotential* standard_model = nullptr);

// Expected decays per unit beta: in our past light cone, and per Hubble volume at the decay.
double lightcone_decays_per_beta(const Formation& f, const Decay& d);
// The same for a probability and light-cone radius of one's own (a treatment, or a share).
double lightcone_decays_per_beta(const Formation& f, double probability, double lightcone_radius);
double hubble_decays_per_beta(const Formation& f, const Decay& d, const cosmology::Background& b);

}  // namespace ember::population
