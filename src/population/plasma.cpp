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
  // (b) matters only where (a) holds: cold_enough needs both.
  const double phi = bubble.phi_horizon;
  if (!c.colder_than_hole || !sm || !(phi > 0)) return c;
  if (const double v = sm->value(phi); v < 0)
    c.field_kept = v + 0.5 * tunnelling::thermal_mass_squared(*sm, c.plasma_temperature) * phi * phi < 0;
  return c;
}

}  // namespace ember::population
