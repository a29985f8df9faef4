// The far-field solutions psi_-+ = e^{-+i w r*} sum_n c_n r^-n of the radial equation
// (G = c = hbar = M = 1).
//
// Substituting psi = e^{i sigma w r*} g(r) into the radial equation gives
// (f g')' + 2 i sigma w g' - U g = 0 with U = V/f = sum_m u_m r^-m, and the coefficient of
// r^-(k+2) fixes (derived)
//   c_{k+1} = [k(k+1) c_k - 2(k^2 - 1) c_{k-1} - sum_{m=2}^{k+2} u_m c_{k+2-m}] / (2 i sigma w (k+1)).
// For the Regge-Wheeler potential this is the familiar
//   c_{k+1} = {[k(k+1) - l(l+1)] c_k - 2 (k^2 - s^2) c_{k-1}} / (2 i sigma w (k+1)).
// The series is asymptotic: it is summed up to its smallest term, whose size is the error.
// Terms are built already divided by r^n, so nothing overflows at small w.
#pragma once

#include <complex>
#include <vector>

namespace ember::greybody {

struct FarSolution {
  std::complex<double> g;      // sum c_n r^-n          (ingoing solution, sigma = -1)
  std::complex<double> dg_dr;  // its derivative in r
  double smallest_term = 0;    // |c_n r^-n| at the truncation point
};

// `u` holds u_0 .. u_{K+1}; at most u.size() - 2 terms are used.
FarSolution ingoing_far_solution(const std::vector<double>& u, double omega, double r);

}  // namespace ember::greybody
