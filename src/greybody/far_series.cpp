#include "far_series.hpp"

#include <cmath>

namespace ember::greybody {

FarSolution ingoing_far_solution(const std::vector<double>& u, double omega, double r) {
  using cd = std::complex<double>;
  const int max_terms = static_cast<int>(u.size()) - 2;
  const cd two_i_sigma_omega(0.0, -2.0 * omega);               // sigma = -1
  std::vector<cd> d(static_cast<std::size_t>(max_terms + 1));  // d_n = c_n r^-n
  std::vector<double> r_power(u.size());                       // r^(1-m) for the u_m sum
  for (std::size_t m = 0; m < u.size(); ++m) r_power[m] = std::pow(r, 1.0 - static_cast<double>(m));

  // A single coefficient can vanish (for s = 1, l = 1, c_2 = 0 up to rounding); a term far below
  // its predecessor is such a cancellation, and neither ends the sum nor counts as the smallest.
  d[0] = 1.0;
  FarSolution out{d[0], 0.0, 1.0};
  double smallest = 1.0;
  for (int k = 0; k < max_terms; ++k) {
    const auto K = static_cast<std::size_t>(k);
    cd numerator = static_cast<double>(k * (k + 1)) * d[K] / r;
    if (k >= 1) numerator -= 2.0 * static_cast<double>(k * k - 1) * d[K - 1] / (r * r);
    for (int m = 2; m <= k + 2; ++m)
      numerator -= u[static_cast<std::size_t>(m)] * r_power[static_cast<std::size_t>(m)] *
                   d[static_cast<std::size_t>(k + 2 - m)];
    d[K + 1] = numerator / (two_i_sigma_omega * static_cast<double>(k + 1));

    const double term = std::abs(d[K + 1]);
    const bool cancelled = term < 1e-10 * std::abs(d[K]);
    if (!cancelled && term > smallest) break;  // past the smallest term: the series diverges from here
    out.g += d[K + 1];
    out.dg_dr -= static_cast<double>(k + 1) * d[K + 1] / r;
    if (cancelled) continue;
    smallest = term;
    if (term < 1e-17 && std::abs(d[K]) < 1e-17) break;  // converged to round-off
  }
  out.smallest_term = smallest;
  return out;
}

}  // namespace ember::greybody
