// Series solutions of the Teukolsky radial equation (Teukolsky, ApJ 185 (1973) 635, eq. 4.9; from
// memory) on a Kerr hole with M = 1:
//
//   Delta^{-s} (Delta^{s+1} R')' + [ (K^2 - 2 i s (r - 1) K) / Delta + 4 i s omega r - lambda ] R = 0,
//   Delta = r^2 - 2 r + a^2,  K = (r^2 + a^2) omega - a m,
//
// with lambda the separation constant of spheroidal.hpp. Multiplied by Delta it has polynomial
// coefficients, Delta^2 R'' + (s + 1) Delta Delta' R' + P R = 0 with
// P = K^2 - i s Delta' K + Delta (4 i s omega r - lambda), which is what both series below expand.
//
//  * Near the horizon, in z = r - r_+ (d = r_+ - r_-): R = z^nu sum_n a_n z^n, a_0 = 1, with the
//    ingoing exponent nu = -s - i K_H / d, K_H = K(r_+) (the indicial equation
//    d^2 (nu^2 + s nu) + K_H^2 - i s d K_H = 0, derived). The series converges for |z| < d, the
//    distance to the inner horizon. This solution is B_t Delta^{-s} e^{-i k r*} with |B_t| = d^s.
//  * Far out, R = e^{i sigma omega r*} g(r) with g = r^rho sum_n c_n r^-n: rho = -1 for the ingoing
//    wave (sigma = -1) and rho = -1 - 2 s for the outgoing one (sigma = +1) (derived by
//    substitution). The series is asymptotic, summed to its smallest term.
#pragma once

#include <complex>

#include "ember/greybody/kerr_mode.hpp"

namespace ember::greybody {

struct TeukolskyRadial {
  KerrHole hole;
  double s;  // spin weight, signed
  double omega, m, lambda;
};

// r* = r + (2 r_+ / d) ln((r - r_+)/2) - (2 r_- / d) ln((r - r_-)/2), dr*/dr = (r^2 + a^2)/Delta
// (reduces to r + 2 ln(r/2 - 1) at a = 0, the Schwarzschild module's convention).
double kerr_tortoise(const KerrHole& hole, double r);

struct HorizonSeries {
  std::complex<double> sum;      // sum_n a_n z^n (R / z^nu)
  std::complex<double> log_sum;  // sum_n (nu + n) a_n z^n (z dR/dz / z^nu)
  std::complex<double> nu;       // the exponent
  double last_term = 0;          // |a_n z^n| where the sum stopped, relative to |sum|
  int terms = 0;
};

// The ingoing horizon solution at z; `converged` false when `max_terms` were not enough to bring
// the terms below `relative`.
HorizonSeries horizon_series(const TeukolskyRadial& eq, double z, double relative, int max_terms, bool* converged);

struct FarWave {
  std::complex<double> value;       // R = e^{i sigma omega r*} g
  std::complex<double> derivative;  // dR/dr
  double smallest_term = 0;         // relative size of the last term kept
};

// The ingoing (sigma = -1) or outgoing (sigma = +1) far solution at r.
FarWave far_wave(const TeukolskyRadial& eq, int sigma, double r, int max_terms);

}  // namespace ember::greybody
