// Physical constants and the internal unit system.
//
// Internal units: natural units with hbar = c = k_B = 1 and energies in GeV.
//   mass, energy, temperature : GeV
//   time, length              : GeV^-1
//   Newton's constant G       : GeV^-2  (G = 1 / M_Pl^2)
// Every module keeps to this system; conversions happen only at input and output.
//
// Sources:
//   CODATA 2018: E. Tiesinga et al., Rev. Mod. Phys. 93 (2021) 025010 (G, hbar, c, k_B, e).
//   IAU 2015 Resolution B3: nominal solar mass parameter (G M_sun)^N = 1.3271244e20 m^3 s^-2.
//   IAU 2012 Resolution B2: astronomical unit = 149597870700 m; IAU 2015 Resolution B2: parsec = (648000/pi) au.
//   Julian year: 365.25 days of 86400 s (IAU).
#pragma once

namespace ember::units {

namespace detail {
// constexpr square root by Newton iteration; std::sqrt is not constexpr in standard C++20.
constexpr double sqrt_newton(double x, double guess, int iterations) {
  return iterations == 0 ? guess : sqrt_newton(x, 0.5 * (guess + x / guess), iterations - 1);
}
constexpr double csqrt(double x) {
  // Start from a power-of-two estimate so 60 iterations reach full precision for any x > 0.
  double g = 1.0;
  while (g * g < x) g *= 2.0;
  while (g * g > 4.0 * x) g *= 0.5;
  return sqrt_newton(x, g, 60);
}
}  // namespace detail

inline constexpr double pi = 3.141592653589793238462643383279502884;

// SI values, exact or CODATA 2018 recommended.
namespace si {
inline constexpr double newton_G = 6.67430e-11;                        // m^3 kg^-1 s^-2 (CODATA 2018, rel. unc. 2.2e-5)
inline constexpr double hbar = 1.054571817e-34;                        // J s (exact, from h)
inline constexpr double c = 299792458.0;                               // m s^-1 (exact)
inline constexpr double k_B = 1.380649e-23;                            // J K^-1 (exact)
inline constexpr double e = 1.602176634e-19;                           // C (exact)
inline constexpr double solar_mass_parameter = 1.3271244e20;           // m^3 s^-2 (IAU 2015 B3, nominal)
inline constexpr double astronomical_unit = 149597870700.0;            // m (IAU 2012 B2, exact)
inline constexpr double parsec = astronomical_unit * 648000.0 / pi;    // m (IAU 2015 B2)
inline constexpr double julian_year = 365.25 * 86400.0;                // s
inline constexpr double solar_mass = solar_mass_parameter / newton_G;  // kg, nominal / CODATA G
inline constexpr double planck_mass = detail::csqrt(hbar * c / newton_G);              // kg
inline constexpr double planck_length = detail::csqrt(hbar * newton_G / (c * c * c));  // m
inline constexpr double planck_time = planck_length / c;                               // s
}  // namespace si

// One SI unit expressed in internal units.
inline constexpr double GeV_in_joule = 1e9 * si::e;
inline constexpr double GeV = 1.0;
inline constexpr double kilogram = si::c * si::c / GeV_in_joule;    // GeV
inline constexpr double gram = 1e-3 * kilogram;                     // GeV
inline constexpr double second = GeV_in_joule / si::hbar;           // GeV^-1
inline constexpr double meter = GeV_in_joule / (si::hbar * si::c);  // GeV^-1
inline constexpr double kelvin = si::k_B / GeV_in_joule;            // GeV
inline constexpr double joule = 1.0 / GeV_in_joule;                 // GeV
inline constexpr double year = si::julian_year * second;            // GeV^-1
inline constexpr double parsec = si::parsec * meter;                // GeV^-1
inline constexpr double solar_mass = si::solar_mass * kilogram;     // GeV

// Planck units in internal units.
inline constexpr double planck_mass = si::planck_mass * kilogram;                     // GeV, 1.220890e19
inline constexpr double reduced_planck_mass = planck_mass / detail::csqrt(8.0 * pi);  // GeV, 2.435e18
inline constexpr double newton_G = 1.0 / (planck_mass * planck_mass);                 // GeV^-2
inline constexpr double planck_length = 1.0 / planck_mass;                            // GeV^-1
inline constexpr double planck_time = 1.0 / planck_mass;                              // GeV^-1

}  // namespace ember::units
