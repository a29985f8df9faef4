// Internal units and constants against CODATA 2018 (E. Tiesinga et al., Rev. Mod. Phys. 93 (2021)
// 025010, "CODATA recommended values of the fundamental physical constants: 2018") and the IAU.
#include <doctest/doctest.h>

#include "ember/units/constants.hpp"
#include "support.hpp"

using namespace ember::units;
using ember::testing::close;

TEST_CASE("Planck units match CODATA 2018") {
  // CODATA 2018: Planck mass 2.176434(24)e-8 kg; energy equivalent 1.220890(14)e19 GeV;
  // Planck length 1.616255(18)e-35 m; Planck time 5.391247(60)e-44 s.
  CHECK(close(si::planck_mass, 2.176434e-8, 1e-6));
  CHECK(close(planck_mass, 1.220890e19, 1e-6));
  CHECK(close(si::planck_length, 1.616255e-35, 1e-6));
  CHECK(close(si::planck_time, 5.391247e-44, 1e-6));
  // Reduced Planck mass M_Pl / sqrt(8 pi) = 2.435323e18 GeV (derived from the CODATA value above).
  CHECK(close(reduced_planck_mass, 2.435323e18, 1e-6));
  CHECK(close(newton_G * planck_mass * planck_mass, 1.0, 1e-15));
}

TEST_CASE("energy-mass-time-length-temperature relations match CODATA 2018") {
  // CODATA 2018: electron volt-kilogram relationship 1.782661921e-36 kg (exact).
  CHECK(close(1.0 / kilogram, 1.782661921e-27, 1e-9));
  // CODATA 2018: reduced Planck constant 6.582119569e-16 eV s (exact).
  CHECK(close(1.0 / second, 6.582119569e-25, 1e-9));
  // CODATA 2018: reduced Planck constant times c, 197.3269804 MeV fm (exact).
  CHECK(close(1.0 / meter, 197.3269804e-3 * 1e-15, 1e-9));
  // CODATA 2018: electron volt-kelvin relationship 1.160451812e4 K (exact).
  CHECK(close(1.0 / kelvin, 1.160451812e13, 1e-9));
  // CODATA 2018: exact SI definitions.
  CHECK(si::c == 299792458.0);
  CHECK(si::e == 1.602176634e-19);
  CHECK(si::k_B == 1.380649e-23);
}

TEST_CASE("astronomical units follow the IAU definitions") {
  // Julian year: 365.25 d of 86400 s = 31557600 s (IAU).
  CHECK(si::julian_year == 31557600.0);
  // IAU 2015 Resolution B2: 1 pc = 648000/pi au = 3.0856775814913673e16 m.
  CHECK(close(si::parsec, 3.0856775814913673e16, 1e-15));
  // IAU 2015 Resolution B3: nominal (G M_sun) = 1.3271244e20 m^3 s^-2; with CODATA 2018 G the mass
  // is 1.98841e30 kg (derived; the resolution quotes 1.9885e30 kg from CODATA 2014 G, from memory).
  CHECK(close(si::solar_mass * si::newton_G, 1.3271244e20, 1e-15));
  CHECK(close(si::solar_mass, 1.98841e30, 1e-5));
}
