#include "ember/population/plasma.hpp"

#include <cmath>

#include "ember/tunnelling/thermal_potential.hpp"
#include "ember/units/constants.hpp"

namespace ember::population {

std::string name_of(HotEra e) {
  return e == HotEra::postpone ? "postpone" : "count";
}

double plasma_temperature(const cosmology::Background& b, double time) {
  return b.temperature(b.scale_factor(time));
}

PlasmaCheck check_plasma(const cosmology::Background& b, const higgs::StandardModelPotential* sm, double time,
                         double hole, const tunnelling::ActionPoint& bubble, double newton_G) {
  PlasmaCheck c;
  c.plasma_temperature = plasma_temperature(b, time);
  c.hawking_temperature = 1 / (8 * units::pi * newton_G * hole);
  c.colder_than_hole = c.plasma_temperature < c.hawking_temperature;
  const double phi = bubble.phi_horizon;
  if (sm && phi > 0 && sm->value(phi) < 0) {
    const double m2 = tunnelling::thermal_mass_squared(*sm, c.plasma_temperature);
    c.field_kept = sm->value(phi) + 0.5 * m2 * phi * phi < 0;
  }
  return c;
}

}  // namespace ember::population
