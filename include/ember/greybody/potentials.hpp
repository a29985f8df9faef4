// The radial potentials V(r) of d^2 psi/dr*^2 + (omega^2 - V) psi = 0 (G = c = hbar = M = 1).
//
//   Regge-Wheeler (s = 0, 1, axial 2): V = f [l(l+1)/r^2 + (1 - s^2) 2/r^3]
//     (Regge & Wheeler, Phys. Rev. 108 (1957) 1063, for s = 2; the general-spin form from memory)
//   Zerilli (polar s = 2): V = f [2 L^2 (L+1) r^3 + 6 L^2 r^2 + 18 L r + 18] / [r^3 (L r + 3)^2],
//     L = (l - 1)(l + 2)/2 (Zerilli, PRL 24 (1970) 737; transcribed from memory, and validated by
//     the test that its transmission equals the axial one)
//   Dirac (s = 1/2): V = W^2 +- dW/dr*, W = (j + 1/2) sqrt(f)/r, the pair of superpartner
//     potentials of the massless Dirac field (from memory; validated by the test that
//     both signs transmit alike)
// with f = 1 - 2/r and r* = r + 2 ln(r/2 - 1).
//
// Everything is evaluated from y = ln(r/2 - 1), so the horizon (y -> -infinity) keeps full
// precision: r = 2 (1 + e^y), f = e^y / (1 + e^y), dr*/dy = r.
#pragma once

#include <vector>

#include "ember/greybody/mode.hpp"

namespace ember::greybody {

struct Geometry {
  double r, f, sqrt_f, tortoise;
};
Geometry geometry_at(double y);

// V at a point whose geometry is already known (the ODE's inner loop), and at y.
double potential_at(const Mode& mode, const Geometry& g);
// V at y, and its split into pieces that fall off near the horizon as exp(kappa r*).
double potential_at(const Mode& mode, double y);

struct HorizonTerm {
  double value;  // this piece of V at the given y
  double kappa;  // its near-horizon fall-off rate in r*
};
std::vector<HorizonTerm> horizon_terms(const Mode& mode, double y);

// Coefficients u_m of U(r) = V/f = sum_{m>=2} u_m r^-m, for m = 0 .. count-1 (u_0 = u_1 = 0).
std::vector<double> inverse_power_coefficients(const Mode& mode, int count);

}  // namespace ember::greybody
