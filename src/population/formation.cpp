#include "ember/population/formation.hpp"

#include <fmt/format.h>

#include <cmath>

#include "ember/core/errors.hpp"
#include "ember/units/constants.hpp"

namespace ember::population {

Formation formation_of(double mass, double gamma, const cosmology::Background& b) {
  if (!(mass > 0) || !(gamma > 0 && gamma <= 1))
    throw InputError(
        fmt::format("formation: mass {} GeV, collapse fraction {}; expected mass > 0, 0 < gamma <= 1", mass, gamma));
  const double target = mass / gamma;
  // M_H(t) grows with t: bisect in ln t between the first tabulated instant and today.
  double lo = std::log(b.time(b.scale_factor_at_temperature(1e19))), hi = std::log(b.age());
  if (b.horizon_mass(std::exp(lo)) > target)
    throw InputError(fmt::format("formation: a {:.4g} g hole would form before T = 1e19 GeV; expected a heavier hole",
                                 mass / units::gram));
  if (b.horizon_mass(std::exp(hi)) < target)
    throw InputError(fmt::format("formation: a {:.4g} g hole exceeds today's horizon mass", mass / units::gram));
  for (int i = 0; i < 200 && hi - lo > 1e-14 * std::abs(hi); ++i) {
    const double mid = 0.5 * (lo + hi);
    (b.horizon_mass(std::exp(mid)) < target ? lo : hi) = mid;
  }
  Formation f;
  f.mass = mass;
  f.time = std::exp(0.5 * (lo + hi));
  f.scale_factor = b.scale_factor(f.time);
  f.temperature = b.temperature(f.scale_factor);
  const double h = b.hubble_rate(f.scale_factor);
  f.total_density = 3 * h * h / (8 * units::pi * units::newton_G);
  return f;
}

MassRange formable_masses(double gamma, const cosmology::Background& b) {
  // Nudged inwards so the ends themselves pass formation_of's bisection bounds.
  return {gamma * b.horizon_mass(b.time(b.scale_factor_at_temperature(1e19))) * (1 + 1e-9),
          gamma * b.horizon_mass(b.age()) * (1 - 1e-9)};
}

double comoving_number_per_beta(const Formation& f) {
  return f.total_density * std::pow(f.scale_factor, 3) / f.mass;
}

double f_pbh_per_beta(const Formation& f, const cosmology::Background& b) {
  return comoving_number_per_beta(f) * f.mass / (b.omega_cdm() * b.critical_density());
}

double lightcone_count_per_beta(const Formation& f, const cosmology::Background& b) {
  return comoving_number_per_beta(f) * 4 * units::pi / 3 * std::pow(b.lightcone_radius(f.time), 3);
}

double per_horizon_per_beta(const Formation& f, const cosmology::Background& b) {
  const double h = b.hubble_rate(f.scale_factor);
  return comoving_number_per_beta(f) / std::pow(f.scale_factor, 3) * 4 * units::pi / 3 / (h * h * h);
}

}  // namespace ember::population
