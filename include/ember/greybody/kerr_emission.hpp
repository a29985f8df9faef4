// Emission of a massless species by a Kerr hole, per degree of freedom (one helicity), from the
// Kerr greybody factors of each (l, m) mode:
//
//   d^2N/(dt dw) = (1/2pi) sum_{l,m} Gamma_{s,l,m}(w) / (e^{(w - m Omega_H)/T_H} -+ 1)
//
// (Page, PRD 14 (1976) 3260, in our notation; minus for bosons, plus for fermions). In
// superradiant boson modes Gamma < 0 and the thermal factor is negative too, so each mode adds a
// positive rate. With M = 1 (units of kerr_mode.hpp), above a lower cut x_cut (a rest mass, in
// x = G M E / c^3):
//   power  P = (1/2pi) sum int dx x Gamma th   (hbar c^6 / (G^2 M^2)),
//   torque Z = (1/2pi) sum int dx m Gamma th   (hbar c^3 / (G M): angular momentum per time),
//   number N = (1/2pi) sum int dx   Gamma th   (c^3 / (G M)).
// Page's f and g follow as f = -M^2 dM/dt = sum g_s P_s and g = -(M / a*) dJ/dt = sum g_s Z_s / a*.
#pragma once

#include <functional>
#include <vector>

#include "ember/core/estimate.hpp"
#include "ember/greybody/kerr_mode.hpp"

namespace ember::greybody {

struct KerrEmission {
  Estimate power, torque, number;
};

// Gamma of one mode at x on the hole in question (a table node, or direct solves).
using KerrGamma = std::function<Estimate(const KerrMode&, double)>;

// The thermal factor 1/(e^{(x - m Omega_H)/T} -+ 1), written with expm1 so that small arguments
// keep their digits.
double kerr_thermal_factor(const KerrHole& hole, const KerrMode& mode, double x);

// Sums `modes` (all of one spin), each integrated by GSL adaptive quadrature (QAGS) on either
// side of its superradiant threshold, from x_cut to where the thermal factor is below 1e-31. The
// error adds the quadrature's estimates to the integral of each Gamma's own error. Throws
// NumericalError ("Kerr emission quadrature") when GSL fails.
KerrEmission kerr_emission_per_dof(const KerrHole& hole, const std::vector<KerrMode>& modes, const KerrGamma& gamma,
                                   double x_cut = 0.0);

}  // namespace ember::greybody
