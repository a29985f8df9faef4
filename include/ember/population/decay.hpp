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
#pragma once

#include <optional>

#include "ember/cosmology/background.hpp"
#include "ember/evaporation/trajectory.hpp"
#include "ember/population/formation.hpp"
#include "ember/tunnelling/action_table.hpp"
#include "ember/tunnelling/rate.hpp"

namespace ember::population {

struct DecayOptions {
  tunnelling::Prefactor prefactor = tunnelling::Prefactor::root_action;
  // Quadrature: QAG to this relative accuracy.
  double relative_tolerance = 1e-8;
  // Grid in ln M for the decay time and the crossover search.
  int grid_points = 2000;
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
};

Decay decay_along(const Formation& formation, const evaporation::MassLoss& mass_loss,
                  const evaporation::TrajectoryOptions& trajectory, const tunnelling::ActionTable& table,
                  const cosmology::Background& background, const DecayOptions& options = {});

// Expected decays per unit beta: in our past light cone, and per Hubble volume at the decay.
double lightcone_decays_per_beta(const Formation& f, const Decay& d);
double hubble_decays_per_beta(const Formation& f, const Decay& d, const cosmology::Background& b);

}  // namespace ember::population
