// The mass-loss rate of a Schwarzschild hole over a particle set (Page 1976; MacGibbon &
// Webber, PRD 41 (1990) 3052; MacGibbon, PRD 44 (1991) 376).
//
// Units: internal natural units (GeV; see units/constants.hpp). alpha = -M^2 dM/dt in GeV^4;
// f = alpha / (5.34e25 g^3 s^-1), MacGibbon's normalisation (f = 1 for photons, three neutrino
// flavours and gravitons at M >> 1e17 g).
//
// Primary emission of each species s (dof g, spin s, mass m):
//   d^2N/(dt dE) = g/(2pi) sum_l (2l+1) Gamma_{s,l}(E M/M_Pl^2) / (e^{E/T} -+ 1),  E in its window,
// with massless greybody factors evaluated at the energy E (MacGibbon-Webber approximation), or
// at the momentum p = sqrt(E^2 - m^2) as a sensitivity check. Windows (data/particles.yaml):
// E >= m for most species; quarks and gluons only for E >= max(m, Lambda_QCD), as free partons;
// pions only for m <= E < Lambda_QCD. The split is in energy, so alpha(M) stays smooth across
// the confinement scale. With x = E M / M_Pl^2 the power is
//   P = (M_Pl^4 / M^2) sum_s g_s W_s,  W_s = (1/2pi) int_window dx x S_s(x)/(e^{8 pi x} -+ 1),
// so alpha = M_Pl^4 sum_s g_s W_s(M m_s / M_Pl^2, ...).
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
  // Confinement scale (GeV): free quarks and gluons above it in energy, pions below. 0.3 GeV:
  // MacGibbon & Webber, PRD 41 (1990) 3052, take Lambda_QCD ~ 250-300 MeV for the onset of quark
  // and gluon emission (from memory); the range is the plausible span of that onset.
  static constexpr double qcd_scale_min = 0.1, qcd_scale_max = 1.0;
  double qcd_scale = 0.3;
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

}  // namespace ember::evaporation
