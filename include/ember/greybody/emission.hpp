// Emission of a massless species by a Schwarzschild hole, per degree of freedom (one helicity).
//
//   d^2N/(dt dw) = (1/2pi) sum_l (2l+1) Gamma_{s,l}(w) / (e^{w/T} -+ 1),  T = 1/(8 pi M)
// (Page, PRD 13 (1976) 198, in our notation); minus for bosons, plus for fermions.
// With G = c = hbar = M = 1 (x = M w):
//   power  P = (1/2pi) int dx x S(x)/(e^{8 pi x} -+ 1)  in units of hbar c^6 / (G^2 M^2)
//   number N = (1/2pi) int dx   S(x)/(e^{8 pi x} -+ 1)  in units of c^3 / (G M)
// where S(x) = sum_l (2l+1) Gamma_l(x) from the table.
#pragma once

#include <functional>

#include "ember/core/estimate.hpp"
#include "ember/greybody/table.hpp"

namespace ember::greybody {

struct Emission {
  Estimate power;   // hbar c^6 / (G^2 M^2)
  Estimate number;  // c^3 / (G M)
};

Emission emission_per_dof(const Table& table, int twice_spin);

// (1/2pi) int_0^inf dx x^moment S(x) / (e^{8 pi x} -+ 1), by GSL adaptive quadrature (QAGS).
// The error adds the quadrature's estimate to the integral of S's own error.
Estimate thermal_moment(const std::function<Estimate(double)>& weighted_sum, bool fermion, int moment);

}  // namespace ember::greybody
