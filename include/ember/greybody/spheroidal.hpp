// Separation constants of the spin-weighted spheroidal harmonics, the angular part of the
// Teukolsky equation on a rotating (Kerr) hole: the first piece of Kerr greybody factors.
//
// Convention. S(theta) = sS_lm(theta; c), with c = a omega (a the hole's specific angular
// momentum, omega the wave's frequency, G = c_light = 1), solves Teukolsky's angular equation
// (Teukolsky, ApJ 185 (1973) 635, eq. 4.10; from memory):
//
//   (1/sin) d/dtheta (sin dS/dtheta)
//     + (c^2 cos^2 - m^2/sin^2 - 2 c s cos - 2 m s cos/sin^2 - s^2 cot^2 + s + A) S = 0,
//
// regular at both poles. The separation constant returned is Teukolsky's A = sA_lm(c). At c = 0
// it is l(l+1) - s(s+1), the spin-weighted spherical harmonics' value. The radial equation
// (same paper, eq. 4.9) takes lambda = A + c^2 - 2 m c instead: radial_separation_constant().
//
// Labels: for fixed (s, m) the angular problem is a Sturm-Liouville problem with simple
// eigenvalues, so they never cross as c varies; l = max(|s|, |m|) + k is the (k+1)-th smallest.
//
// Symmetries of the equation (derived from it, see docs/methods.md): theta -> pi - theta gives
//   A(s, m, c) = A(s, -m, -c)   and   A(-s, m, c) = A(s, m, c) + 2 s.
//
// Method: the spectral expansion in spin-weighted spherical harmonics (Hughes, PRD 61 (2000)
// 084004, appendix A; Cook & Zalutskiy, PRD 90 (2014) 124021; both from memory): a symmetric
// pentadiagonal matrix, truncated and diagonalised with gsl_eigen_symm, the basis grown until the
// eigenvalue changes by less than the tolerance. That last change (plus a rounding floor) is the
// reported error; by Cauchy interlacing the truncated eigenvalue decreases towards the true one.
#pragma once

#include <string>

#include "ember/core/estimate.hpp"
#include "ember/core/solve_status.hpp"
#include "ember/greybody/tolerances.hpp"

namespace ember::greybody {

struct SpheroidalOptions {
  // Stop when the eigenvalue changes by less than this times max(1, |A|) as the basis grows.
  double change = tolerance::spheroidal_change;
  // First basis: the mode's own index, plus |c|, plus this many terms.
  int initial_terms = tolerance::spheroidal_initial_terms;
  // Terms added at each growth of the basis; even, so that both parity blocks of an s = 0 problem
  // grow.
  int step_terms = tolerance::spheroidal_step_terms;
  // Largest basis tried before giving up (NumericalError).
  int max_terms = tolerance::spheroidal_max_terms;

  // Throws InputError naming the field and the rule it broke.
  void validate() const;
};

struct SpheroidalSummary {
  SolveStatus status = SolveStatus::converged;
  std::string message;     // what was done, with the numbers
  int terms = 0;           // size of the final truncated basis
  int truncations = 0;     // diagonalisations done
  double last_change = 0;  // |A(terms) - A(terms - step)|
  double rounding = 0;     // the rounding floor added to the error
};

struct SpheroidalEigenvalue {
  Estimate separation;  // Teukolsky's A = sA_lm(c), with its truncation and rounding error
  SpheroidalSummary summary;
};

// The separation constant A for spin weight s (0, +-1/2, ..., +-2), l >= max(|s|, |m|), |m| <= l,
// with l - s and m - s whole numbers, and real c = a omega of either sign. Throws InputError
// naming the argument that is not allowed, NumericalError ("spheroidal eigenvalue") when the
// basis reaches max_terms without converging or GSL's eigensolver fails.
SpheroidalEigenvalue spheroidal_eigenvalue(double s, double l, double m, double c,
                                           const SpheroidalOptions& options = {});

// lambda = A + c^2 - 2 m c, the constant in the Teukolsky radial equation (Teukolsky 1973,
// eq. 4.9; from memory). m and c are exact, so the error is A's.
Estimate radial_separation_constant(const Estimate& separation, double m, double c);

}  // namespace ember::greybody
