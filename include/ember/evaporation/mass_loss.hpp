// The mass-loss rate of a Schwarzschild hole over a particle set (Page 1976; MacGibbon &
// Webber, PRD 41 (1990) 3052; MacGibbon, PRD 44 (1991) 376).
//
// Units: internal natural units (GeV; see units/constants.hpp). alpha = -M^2 dM/dt in GeV^4;
// f = alpha / (5.34e25 g^3 s^-1), MacGibbon's normalisation (f = 1 for photons, three neutrino
// flavours and gravitons at M >> 1e17 g).
//
// Primary emission of each species s (dof g, spin s, mass m):
//   d^2N/(dt dE) = w_s(T) g/(2pi) sum_l (2l+1) Gamma_{s,l}(E M/M_Pl^2) / (e^{E/T} -+ 1),  E >= m,
// with massless greybody factors evaluated at the energy E (MacGibbon-Webber approximation), or
// at the momentum p = sqrt(E^2 - m^2) as a sensitivity check. The weight w_s follows the Hawking
// temperature T, not the energy: a hole emits what is elementary on the scale of its own
// emission (MacGibbon & Webber, PRD 41 (1990) 3052), so quarks and gluons only once T is above
// the QCD scale, and below it the light hadrons (data/particles.yaml, `window`):
//   w = 1 (window all),  w = P(T) (partons),  w = 1 - P(T) (hadrons),
//   P(T) = (1/2) erfc(-ln(T/qcd_scale) / (sqrt(2) qcd_width)),
// a normal distribution function in ln T (parton_weight below). With x = E M / M_Pl^2 the power is
//   P = (M_Pl^4 / M^2) sum_s g_s w_s W_s,  W_s = (1/2pi) int_{x >= x_m} dx x S_s(x)/(e^{8 pi x} -+ 1),
// so alpha = M_Pl^4 sum_s g_s w_s(T) W_s(M m_s / M_Pl^2).
#pragma once

#include <memory>
#include <string>
#include <vector>

#include "ember/core/estimate.hpp"
#include "ember/evaporation/particles.hpp"
#include "ember/evaporation/tolerances.hpp"
#include "ember/greybody/table.hpp"

namespace ember::evaporation {

enum class GreybodyArgument { energy, momentum };

struct MassLossOptions {
  // The Hawking temperature at which quarks and gluons take over from hadrons (GeV): half the
  // QCD-coloured emission is partons there. 0.3 GeV: MacGibbon & Webber, PRD 41 (1990) 3052,
  // emit quarks and gluons once T_H exceeds Lambda_QCD ~ 250-300 MeV (from memory); the range is
  // the plausible span of that onset.
  static constexpr double qcd_scale_min = 0.1, qcd_scale_max = 1.0;
  double qcd_scale = 0.3;
  // Width of the switch from hadrons to partons, as a standard deviation in ln T_H. Why a width:
  // at a given T_H the emitted power spreads over energies, and the quanta near T_H ~ Lambda_QCD
  // are partly above and partly below the confinement scale, so the change of description cannot
  // be sharper than that spread. 0.5 is the spread of ln E in the Hawking power spectrum: for
  // dE/dt ~ E^3 e^{-E/T} (the geometric-optics limit), Var(ln E) = psi'(4) = pi^2/6 - 49/36 =
  // 0.284, a standard deviation of 0.53 (derived; greybody factors, which cut the low energies,
  // narrow it a little). The weight then runs from 16% to 84% between Lambda/1.65 and 1.65 Lambda.
  // Range: at 0.1 the switch spans under two alpha(M) nodes (one every 0.058 in ln M) and the
  // spline's measured error is already 6e-4 (5e-6 at 0.5), growing fast below; above 2 it spreads
  // over a factor e^4 ~ 50 in T_H each way, from below the pion mass to beyond the charm, and no
  // longer marks a transition.
  static constexpr double qcd_width_min = 0.1, qcd_width_max = 2.0;
  double qcd_width = 0.5;
  GreybodyArgument argument = GreybodyArgument::energy;
  // alpha is tabulated at this many nodes per decade of mass.
  int nodes_per_decade = tolerance::mass_nodes_per_decade;
  // No progress bar while the nodes are computed (core/progress.hpp). Not part of the result.
  bool quiet = true;

  void validate() const;  // throws InputError naming the field and the rule
};

// MacGibbon's normalisation of f: 5.34e25 g^3 s^-1 (MacGibbon, PRD 44 (1991) 376), in GeV^4.
double macgibbon_alpha_unit();

struct MassLossSummary {
  int nodes = 0;
  double max_midpoint_error = 0;  // largest relative deviation of the alpha spline from a direct sum
  double seconds = 0;
  std::string message;
};

class MassLoss {
 public:
  MassLoss(const greybody::Table& greybody, ParticleSet particles, const MassLossOptions& options = {});

  // The alpha(M) nodes and the spline's measured error, exactly (hex floats): what the disk
  // cache keeps (mass_loss_cache.hpp).
  std::string nodes_text() const;
  // A MassLoss from nodes_text() of one built with the same inputs: the kernels are rebuilt, the
  // direct sums are not. Throws InputError when the text is malformed or has another node count.
  static MassLoss from_nodes(const greybody::Table& greybody, ParticleSet particles, const MassLossOptions& options,
                             const std::string& text);

  double alpha(double mass) const;  // GeV^4, from the table
  double f(double mass) const { return alpha(mass) / macgibbon_alpha_unit(); }
  // alpha summed directly over species (no interpolation), and each species' share of it.
  double alpha_direct(double mass) const;
  std::vector<double> species_alpha(double mass) const;  // GeV^4, in particles().species order

  // Relative error of alpha: greybody interpolation, kernel quadrature and the alpha spline.
  double relative_error() const { return relative_error_; }
  const ParticleSet& particles() const { return particles_; }
  const MassLossOptions& options() const { return options_; }
  const MassLossSummary& summary() const { return summary_; }

  struct Kernel;
  struct Tabulated;

 private:
  MassLoss(const greybody::Table& greybody, ParticleSet particles, const MassLossOptions& options,
           const std::string* nodes);
  ParticleSet particles_;
  MassLossOptions options_;
  std::shared_ptr<const std::vector<Kernel>> kernels_;  // by spin: 0, 1/2, 1, 2
  std::shared_ptr<const Tabulated> table_;
  MassLossSummary summary_;
  double relative_error_ = 0;
  double window(const Species& s, double mass) const;
};

// Hawking temperature T = M_Pl^2 / (8 pi M) (GeV, for M in GeV).
double hawking_temperature(double mass);

// The share of QCD-coloured emission carried by free quarks and gluons at Hawking temperature
// `temperature` (GeV): P(T) in the formula above. Hadrons carry hadron_weight = 1 - P, computed
// directly so that neither loses digits in its tail.
double parton_weight(double temperature, const MassLossOptions& options);
double hadron_weight(double temperature, const MassLossOptions& options);

}  // namespace ember::evaporation
