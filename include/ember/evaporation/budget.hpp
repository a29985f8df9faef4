// Where a hole's energy goes, by species: now (shares of alpha at one mass) and over the rest of
// its life (shares of the mass-energy radiated from M down to nothing).
// Units: dimensionless fractions.
#pragma once

#include <vector>

#include "ember/evaporation/kerr_trajectory.hpp"
#include "ember/evaporation/mass_loss.hpp"

namespace ember::evaporation {

// alpha_s(M) / alpha(M), in the particle set's order.
std::vector<double> power_shares(const MassLoss& mass_loss, double mass);

// (1/M) int_0^M (alpha_s/alpha)(M') dM': Simpson's rule in ln M' at the mass-loss table's node
// density, down to `cutoff`; below it the shares are held at their cutoff values (the analytic
// tail).
std::vector<double> lifetime_shares(const MassLoss& mass_loss, double mass, double cutoff);

// A rotating hole: the shares of the mass-energy radiated along its trajectory, from its initial
// mass down to nothing, (1/M_0) int share_s(M, a*(M)) dM by the trapezoid rule on the
// trajectory's points (20 per e-fold of mass), with the shares held at their cutoff values below.
std::vector<double> kerr_lifetime_shares(const KerrMassLoss& mass_loss, const KerrTrajectory& trajectory);

}  // namespace ember::evaporation
