#include "ember/tunnelling/thermal_potential.hpp"

#include <fmt/format.h>

#include <algorithm>

namespace ember::tunnelling {

double thermal_mass_squared(const higgs::StandardModelPotential& sm, double t) {
  const higgs::Running& run = sm.running();
  const higgs::Couplings c = run.couplings(std::clamp(t, run.mu_min(), run.mu_max()));
  return t * t * (3 * c.g2 * c.g2 / 16 + c.gY2() / 16 + c.yt * c.yt / 4 + c.lambda / 2);
}

std::string ThermalPotential::description() const {
  return fmt::format("{} + thermal mass m^2 = {:.4g} GeV^2", base_.description(), m2_);
}

std::string ThermalPotential::identity() const {
  return fmt::format("{} thermal {:a}", base_.identity(), m2_);
}

}  // namespace ember::tunnelling
