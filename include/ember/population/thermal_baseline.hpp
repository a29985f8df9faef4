// The unseeded thermal baseline: decay of the hot universe itself, with no black hole, by
// flat-space O(3) thermal bubbles, counted over our past light cone from the earliest formation
// time of the scenario to today.
//
// Units: internal natural units (GeV, GeV^-1).
//
// Rate per volume Gamma/V = T^4 (S3 / 2 pi T)^(3/2) e^(-S3/T) (Arnold & Vokos, PRD 44 (1991)
// 3620; Espinosa, Giudice & Riotto, JCAP 05 (2008) 002; both from memory), with S3 the O(3)
// bounce of the Standard Model potential plus the plasma's leading thermal mass
// (tunnelling/thermal_potential.hpp) at the plasma temperature T. The expected number of decays
// in our past light cone is
//   N = int dt (Gamma/V)(T(t)) (4 pi / 3) (a(t) chi(t))^3,
// chi(t) the comoving distance light travels from t to today (cosmology::Background), integrated
// by the trapezoidal rule in ln t on a grid log-spaced in T, in logarithms (the terms are far
// below the smallest double). Temperatures where the thermal mass lifts the potential
// everywhere (no bubble) contribute nothing, and the walk down in T stops once the integrand is
// 1e-100 of its largest value. The leading high-T mass is used throughout; where
// the bubble's field exceeds T it overstates the lift, and so understates N.
#pragma once

#include <optional>
#include <string>

#include "ember/cosmology/background.hpp"
#include "ember/higgs/potential.hpp"

namespace ember::population {

struct ThermalBaselineOptions {
  int points_per_decade = 8;        // grid in T
  double lowest_temperature = 1e3;  // GeV: below, the thermal mass is too small to matter here
  void validate() const;            // throws InputError naming the field and the rule
};

struct ThermalBaseline {
  std::optional<double> log10_expected_decays;  // none: no thermal bubble anywhere on the way
  double highest_temperature = 0;               // GeV, the plasma at the earliest formation time
  double lowest_temperature = 0;                // GeV, where the integration stopped
  double peak_temperature = 0;                  // GeV, where the integrand is largest
  int bubbles = 0;                              // grid temperatures with a thermal bubble
  std::string note;
};

// From cosmic time `earliest` (GeV^-1) to today.
ThermalBaseline thermal_baseline(const higgs::StandardModelPotential& standard_model,
                                 const cosmology::Background& background, double earliest,
                                 const ThermalBaselineOptions& options = {});

}  // namespace ember::population
