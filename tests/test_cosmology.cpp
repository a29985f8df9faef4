// The cosmological background: age, particle horizon, horizon mass, and the radiation era.
#include <doctest/doctest.h>

#include <cmath>

#include "ember/cosmology/background.hpp"
#include "ember/population/plasma.hpp"
#include "ember/units/constants.hpp"
#include "support.hpp"

using namespace ember;
namespace u = ember::units;
using ember::testing::close;
using ember::testing::source_dir;

namespace {
const cosmology::Background& background() {
  return ember::testing::planck_background();
}
double gram(double g) {
  return g * u::gram;
}
}  // namespace

TEST_CASE("the Planck 2018 background") {
  const auto& b = background();
  // Age 13.79 Gyr (Planck 2018 VI, A&A 641 (2020) A6, Table 2: 13.787 +- 0.020 Gyr); we leave out
  // the neutrino masses Planck include, so 0.03 Gyr.
  CHECK(std::abs(b.age() / (1e9 * u::year) - 13.79) < 0.03);
  // Comoving particle horizon today about 14.2 Gpc, 46 billion light years (common practice).
  CHECK(std::abs(b.particle_horizon() / (1e9 * u::parsec) - 14.2) < 0.1);
  CHECK(std::abs(b.particle_horizon() / (1e9 * u::year) - 46.0) < 0.5);
  // Radiation era: M_H = c^3 t / G (derived from H = 1/(2t)) and M = gamma M_H ~ 1e15 g (t / 1e-23 s)
  // (Carr 1975; Green, arXiv:1403.1198, eq. 1; a one-figure estimate, so 25%).
  const double t = 1e-23 * u::second;
  CHECK(close(b.horizon_mass(t), t / u::newton_G, 1e-3));
  CHECK(close(0.2 * b.horizon_mass(t), gram(1e15), 0.25));
}

TEST_CASE("the plasma temperature follows the radiation era's T(t)") {
  // Radiation era, Friedmann: t = (45 / (16 pi^3 g))^(1/2) M_Pl / T^2 = 0.301 g^(-1/2) M_Pl / T^2
  // (Kolb & Turner, The Early Universe, 1990, eq. 3.29, from memory; derived here from
  // rho = 3 / (32 pi G t^2) and rho = (pi^2/30) g T^4), with g the plasma's own g_rho(T): about
  // 104.4 above the electroweak scale in the shipped table (Saikawa & Shirai, JCAP 05 (2018)
  // 035), not the ideal gas's 106.75. Matter and Lambda are negligible here.
  for (const double temperature : {1e5, 1e9, 1e13}) {
    CAPTURE(temperature);
    const double g = 30 * background().radiation_density(temperature) / (u::pi * u::pi * std::pow(temperature, 4));
    CHECK(g > 104);
    CHECK(g < 105);
    const double t = std::sqrt(45 / (16 * std::pow(u::pi, 3) * g)) * u::planck_mass / (temperature * temperature);
    CHECK(close(population::plasma_temperature(background(), t), temperature, 1e-3));
  }
}
