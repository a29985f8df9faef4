// The Higgs potential in a thermal bath at temperature T, at leading order in the high-T
// expansion: V_T(h) = m^2(T) h^2 / 2 + V(h), with the Standard Model thermal mass
//   m^2(T) = T^2 (3 g2^2/16 + gY^2/16 + yt^2/4 + lambda/2)
// (e.g. Arnold & Espinosa, PRD 47 (1993) 3546, from memory), couplings at mu = T.
// Units: GeV.
#pragma once

#include "ember/higgs/potential.hpp"

namespace ember::tunnelling {

double thermal_mass_squared(const higgs::StandardModelPotential& sm, double temperature);

class ThermalPotential final : public higgs::Potential {
 public:
  ThermalPotential(const higgs::Potential& base, double mass_squared) : base_(base), m2_(mass_squared) {}
  double value(double h) const override { return 0.5 * m2_ * h * h + base_.value(h); }
  double slope(double h) const override { return m2_ * h + base_.slope(h); }
  double curvature(double h) const override { return m2_ + base_.curvature(h); }
  double field_max() const override { return base_.field_max(); }
  std::string description() const override;
  std::string identity() const override;

 private:
  const higgs::Potential& base_;
  double m2_;
};

}  // namespace ember::tunnelling
