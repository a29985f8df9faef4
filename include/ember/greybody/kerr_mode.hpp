// A partial wave of a massless field on a rotating (Kerr) hole, and the hole's geometry.
//
// Units of the greybody module: G = c = hbar = 1 and the hole's mass M = 1 (see mode.hpp), so the
// hole's spin a* = a / M = J / M^2 is the specific angular momentum a, and x = G M omega / c^3 = omega.
// Spins, l and m are stored doubled, so that spin 1/2 (j and m half-whole) is exact.
//
// Labels: for spin 1/2, l is the total angular momentum j (as in mode.hpp); the azimuthal number m
// runs over -l .. l in whole steps, so it is whole for bosons and half-whole for spin 1/2. With
// time dependence e^{-i omega t + i m phi}, m > 0 co-rotates with the hole.
#pragma once

#include <string>

namespace ember::greybody {

struct KerrMode {
  int twice_spin;  // 0, 1, 2, 4
  int twice_l;     // 2l (2j for spin 1/2), at least twice_spin
  int twice_m;     // 2m, |m| <= l, m - l whole

  double spin() const { return 0.5 * twice_spin; }
  double l() const { return 0.5 * twice_l; }
  double m() const { return 0.5 * twice_m; }
};

// Throws InputError naming the argument when the spin is not 0, 1/2, 1, 2, l is below the spin or
// not in whole steps from it, or m is not one of -l, -l+1, .., l.
KerrMode make_kerr_mode(double spin, double l, double m);
std::string describe(const KerrMode& mode);  // "spin 1, l = 2, m = -1"

// The horizons and their rates for M = 1 (Kerr 1963; Bardeen, Press & Teukolsky, ApJ 178 (1972)
// 347, common practice):
//   r_+- = 1 +- sqrt(1 - a^2),  Omega_H = a / (r_+^2 + a^2) = a / (2 r_+),
//   kappa = (r_+ - r_-) / (2 (r_+^2 + a^2)),  T_H = kappa / (2 pi),
// and the horizon area 4 pi (r_+^2 + a^2) = 8 pi r_+.
struct KerrHole {
  double a = 0;
  double r_plus = 2, r_minus = 0;
  double angular_velocity = 0;  // Omega_H
  double surface_gravity = 0.25;
  double temperature() const;
  double area() const;
};

// Throws InputError unless 0 <= a < 1 (a = 1, the extremal hole, has no Hawking temperature).
KerrHole make_kerr_hole(double a);

}  // namespace ember::greybody
