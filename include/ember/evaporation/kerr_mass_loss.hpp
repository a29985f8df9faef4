// Mass and angular-momentum loss of a rotating (Kerr) hole over a particle set (Page, PRD 14
// (1976) 3260, extended to the species of mass_loss.hpp as MacGibbon & Webber, PRD 41 (1990) 3052).
//
// Units: internal natural units (GeV). With a* = J c / (G M^2):
//   alpha(M, a*)  = -M^2 dM/dt = M_Pl^4 sum_s g_s w_s P_s  (GeV^4; f = alpha / macgibbon_alpha_unit()),
//   torque(M, a*) = M_Pl^4 sum_s g_s w_s Z_s,
// with P_s and Z_s the power and angular momentum emitted per dof (kerr_emission.hpp, M = 1).
// From J = a* G M^2 / c (derived):  d a* / d ln M = torque / alpha - 2 a* = a* (q - 2),
// q = torque / (a* alpha) = g / f in Page's notation; the spin falls while q > 2.
//
// Each species is emitted at E >= m with the massless Kerr greybody factors at the energy (the
// MacGibbon-Webber approximation of mass_loss.hpp), weighted by w_s at the hole's own temperature
// T_H = (kappa / 2 pi) M_Pl^2 / M (kerr_mode.hpp): the Schwarzschild module's species, thresholds
// and QCD weights, unchanged.
//
// Method. At each node a*_i of the Kerr table and for each spin, the kernels
//   J_i(x_c) = (1/2pi) sum_{l,m} int_{x_c} dx x Gamma th,   K_i(x_c) = (1/2pi) sum_{l,m} int_{x_c} dx m Gamma th
// are splines in x_c (21-point Gauss-Kronrod on pieces, summed from the top down, as the
// Schwarzschild kernels). alpha_i(M) and torque_i(M) are then direct sums over species. Between
// nodes, in b = sqrt(1 - a*^2): ln alpha and q = torque / (a* alpha) (Page's g/f, finite at a* = 0)
// by natural cubic splines; every Kerr quantity is analytic in b (r_+ = 1 + b), which a* is not
// near 1. q is not defined at the a* = 0 node (the torque vanishes there), so below the first
// spinning node it is continued linearly in b from the spline's end.
// The stated a*-interpolation error is measured by leaving each interior node out in turn.
#pragma once

#include <memory>
#include <string>
#include <vector>

#include "ember/evaporation/mass_loss.hpp"
#include "ember/evaporation/particles.hpp"
#include "ember/greybody/kerr_table.hpp"

namespace ember::evaporation {

struct KerrMassLossSummary {
  int nodes = 0;
  double interpolation_error = 0;  // leave-one-out bound on ln alpha and on q between nodes
  double seconds = 0;
  std::string message;
};

class KerrMassLoss {
 public:
  KerrMassLoss(const greybody::KerrTable& table, ParticleSet particles, const MassLossOptions& options = {});

  double alpha(double mass, double hole_spin) const;  // GeV^4
  double f(double mass, double hole_spin) const { return alpha(mass, hole_spin) / macgibbon_alpha_unit(); }
  // Page's ratio g / f = torque / (a* alpha); da*/d ln M = a* (q - 2).
  double spin_ratio(double mass, double hole_spin) const;
  double spin_slope(double mass, double hole_spin) const;  // d a* / d ln M

  // At one node, summed directly over species (no interpolation in a*).
  double node_alpha(std::size_t node, double mass) const;
  double node_torque(std::size_t node, double mass) const;
  // Per species at one node, in particles().species order (GeV^4).
  std::vector<double> node_species_alpha(std::size_t node, double mass) const;
  // Each species' share of alpha at (M, a*): the node shares by natural cubic splines in b,
  // renormalised to sum to 1.
  std::vector<double> power_shares(double mass, double hole_spin) const;

  const std::vector<double>& hole_spins() const { return spins_; }
  double max_hole_spin() const { return spins_.back(); }
  const ParticleSet& particles() const { return particles_; }
  const MassLossOptions& options() const { return options_; }
  const KerrMassLossSummary& summary() const { return summary_; }
  // Relative error of alpha and of q: the table's stated error plus the a*-interpolation bound.
  double relative_error() const { return relative_error_; }

  struct NodeKernels;

 private:
  ParticleSet particles_;
  MassLossOptions options_;
  std::vector<double> spins_;
  std::shared_ptr<const std::vector<NodeKernels>> nodes_;
  KerrMassLossSummary summary_;
  double relative_error_ = 0;
  double weight(const Species& s, double temperature) const;
  void check_spin(double hole_spin) const;
  double interpolation_check(double mass) const;
};

// The Hawking temperature of a Kerr hole, T = (kappa / 2 pi) M_Pl^2 / M (GeV, M in GeV).
double kerr_hawking_temperature(double mass, double hole_spin);

}  // namespace ember::evaporation
