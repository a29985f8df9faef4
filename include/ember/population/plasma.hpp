// The hot universe around a hole, and when a cold-exterior seeded rate may be used in it.
//
// Units: internal natural units (GeV, GeV^-1).
//
// Every prescription in tunnelling/ puts the hole in an otherwise empty, cold universe. A hole
// forms in a plasma far hotter than itself (T_f ~ 1e15 GeV against T_H ~ 1e13 GeV at 1 g), so
// along each trajectory Ember asks two things of the plasma at temperature T_p (the photon
// temperature of cosmology::Background at that time):
//   (a) the plasma is colder than the hole, T_p < T_H. In a hotter bath the hole absorbs more
//       than it emits (its net flux reverses; Hawking, CMP 43 (1975) 199 for the thermal
//       emission; the accretion regime is Carr & Hawking, MNRAS 168 (1974) 399, from memory), so
//       neither the Hartle-Hawking state of entropy_drop nor the bare Hawking bath of probe_field
//       and hot_bubble describes the exterior;
//   (b) the plasma's thermal mass does not lift the bubble's own field above the false vacuum:
//       V(phi_b) + m_T^2(T_p) phi_b^2 / 2 < 0, with the Standard Model thermal mass of
//       tunnelling/thermal_potential.hpp and phi_b the static bubble's field at the horizon.
//       Where it fails the plasma holds the field in the false vacuum at phi_b (symmetry is
//       restored there; Espinosa, Giudice & Riotto, JCAP 05 (2008) 002, sec. 4, from memory).
//       The leading high-T mass overstates the lift where the field-dependent masses exceed T_p
//       (their contribution is then Boltzmann suppressed), so (b) errs on the side of waiting.
//       (b) applies where both are known: the Standard Model potential and a prescription with a
//       static bubble (entropy_drop, probe_field); elsewhere only (a) is checked.
// The rule holds when (a) and (b) both hold. Since T_p falls and T_H rises along every history,
// it is found on the decay grid and refined where it changes, not assumed to switch only once.
#pragma once

#include "ember/cosmology/background.hpp"
#include "ember/higgs/potential.hpp"
#include "ember/tunnelling/prescription.hpp"

namespace ember::population {

// How decays while the rule fails are treated (scenario key tunnelling.hot_era).
enum class HotEra {
  postpone,  // not counted: the hazard starts once the plasma has cooled (the default)
  count,     // counted as if the exterior were cold, and flagged
};
std::string name_of(HotEra e);

struct PlasmaCheck {
  double plasma_temperature = 0;   // T_p, GeV
  double hawking_temperature = 0;  // T_H, GeV
  bool colder_than_hole = false;   // (a)
  bool field_kept = true;          // (b); true where it does not apply, or where (a) already fails
  bool cold_enough() const { return colder_than_hole && field_kept; }
};

// The plasma at cosmic time `time` (GeV^-1) around a hole of mass `hole` (GeV) whose bubble
// point is `bubble`. `standard_model` may be null (then only (a)).
PlasmaCheck check_plasma(const cosmology::Background& background, const higgs::StandardModelPotential* standard_model,
                         double time, double hole, const tunnelling::ActionPoint& bubble, double newton_G);

// T_p at cosmic time `time` (GeV^-1): the photon temperature, GeV.
double plasma_temperature(const cosmology::Background& background, double time);

}  // namespace ember::population
