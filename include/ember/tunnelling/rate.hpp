// Decay rate against evaporation rate for a seed hole.
//
// Units: rates in GeV (internal); the command line converts to s^-1.
//
//   Gamma_D = A e^{-B}; prefactor models: root_action A = (B/2pi)^{1/2} / (G M_+) (the default),
//   light_crossing A = 1 / (G M_+); hot_bubble and no_seed use their own (prescription.hpp).
//   Gamma_H = |dM/dt| / M = alpha(M) / M^3, from the evaporation module (all species).
//   branching ratio = Gamma_D / (Gamma_D + Gamma_H).
#pragma once

#include "ember/evaporation/mass_loss.hpp"
#include "ember/tunnelling/prescription.hpp"

namespace ember::tunnelling {

enum class Prefactor { root_action, light_crossing };
std::string name_of(Prefactor p);

struct Rates {
  double prefactor = 0;         // A (GeV)
  double decay_rate = 0;        // Gamma_D (GeV); 0 when no decay
  double evaporation_rate = 0;  // Gamma_H (GeV)
  double branching_ratio = 0;
};

Rates rates_at(const ActionPoint& point, const evaporation::MassLoss& mass_loss, Prefactor prefactor,
               double newton_G = units::newton_G);

}  // namespace ember::tunnelling
