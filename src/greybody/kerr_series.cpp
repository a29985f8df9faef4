#include "kerr_series.hpp"

#include <algorithm>
#include <cmath>
#include <vector>

namespace ember::greybody {

namespace {

using cd = std::complex<double>;
using Poly = std::vector<cd>;  // coefficients, lowest power first

Poly poly_mul(const Poly& p, const Poly& q) {
  Poly out(p.size() + q.size() - 1, 0.0);
  for (std::size_t i = 0; i < p.size(); ++i)
    for (std::size_t j = 0; j < q.size(); ++j) out[i + j] += p[i] * q[j];
  return out;
}

Poly poly_add(Poly p, const Poly& q, cd factor = 1.0) {
  if (q.size() > p.size()) p.resize(q.size(), 0.0);
  for (std::size_t i = 0; i < q.size(); ++i) p[i] += factor * q[i];
  return p;
}

cd coefficient(const Poly& p, int k) {
  return k >= 0 && static_cast<std::size_t>(k) < p.size() ? p[static_cast<std::size_t>(k)] : cd(0.0);
}

// The three coefficient polynomials of Delta^2 R'' + (s+1) Delta Delta' R' + P R = 0 in the
// variable v = r - shift (shift = r_+ for the horizon series, 0 for the far one).
struct Coefficients {
  Poly second, first, zeroth;
};

Coefficients teukolsky_polynomials(const TeukolskyRadial& eq, double shift) {
  const double a = eq.hole.a, w = eq.omega, s = eq.s;
  const cd is(0.0, s);
  // r = v + shift.
  const Poly r{shift, 1.0};
  const Poly q = poly_add(poly_mul(r, r), Poly{a * a});                         // r^2 + a^2
  const Poly delta = poly_add(poly_mul(r, r), poly_add(Poly{a * a}, r, -2.0));  // r^2 - 2 r + a^2
  const Poly delta_prime = poly_add(poly_add(r, r), Poly{-2.0});                // 2 r - 2
  Poly k = q;
  for (auto& c : k) c *= w;
  k[0] -= a * eq.m;
  Poly p = poly_mul(k, k);
  p = poly_add(p, poly_mul(delta_prime, k), -is);
  Poly inner = r;
  for (auto& c : inner) c *= 4.0 * is * w;
  inner[0] -= eq.lambda;
  p = poly_add(p, poly_mul(delta, inner));
  Poly first = poly_mul(delta, delta_prime);
  for (auto& c : first) c *= s + 1.0;
  return {poly_mul(delta, delta), first, p};
}

}  // namespace

double kerr_tortoise(const KerrHole& h, double r) {
  const double d = h.r_plus - h.r_minus;
  return r + (2.0 * h.r_plus / d) * std::log((r - h.r_plus) / 2.0) -
         (2.0 * h.r_minus / d) * std::log((r - h.r_minus) / 2.0);
}

HorizonSeries horizon_series(const TeukolskyRadial& eq, double z, double relative, int max_terms, bool* converged) {
  const Coefficients c = teukolsky_polynomials(eq, eq.hole.r_plus);
  const double d = eq.hole.r_plus - eq.hole.r_minus;
  const cd k_h = eq.omega * 2.0 * eq.hole.r_plus - eq.hole.a * eq.m;  // r_+^2 + a^2 = 2 r_+
  HorizonSeries out;
  out.nu = cd(-eq.s, 0.0) - cd(0.0, 1.0) * k_h / d;
  // The ODE maps z^mu to z^mu sum_j e_j(mu) z^j; e_0 vanishes at mu = nu (indicial equation), and
  // a_n e_0(nu + n) = -sum_{j >= 1} e_{j}(nu + n - j) a_{n - j}.
  const auto e = [&](int j, cd mu) {
    return coefficient(c.second, j + 2) * mu * (mu - 1.0) + coefficient(c.first, j + 1) * mu + coefficient(c.zeroth, j);
  };
  std::vector<cd> a{1.0};  // a_n z^n, built already multiplied by z^n
  out.sum = 1.0;
  out.log_sum = out.nu;
  double largest = 1.0;
  int small_run = 0;
  *converged = false;
  for (int n = 1; n < max_terms; ++n) {
    cd rhs = 0.0;
    for (int j = 1; j <= 4 && j <= n; ++j) {
      const cd mu = out.nu + static_cast<double>(n - j);
      rhs -= e(j, mu) * a[static_cast<std::size_t>(n - j)] * std::pow(z, j);
    }
    const cd term = rhs / e(0, out.nu + static_cast<double>(n));
    a.push_back(term);
    out.sum += term;
    out.log_sum += (out.nu + static_cast<double>(n)) * term;
    largest = std::max(largest, std::abs(out.sum));
    out.terms = n + 1;
    out.last_term = std::abs(term) / std::abs(out.sum);
    small_run = std::abs(term) < relative * largest ? small_run + 1 : 0;
    if (small_run >= 4) {  // four terms in a row below the target: the recurrence has order 4
      *converged = true;
      break;
    }
  }
  return out;
}

FarWave far_wave(const TeukolskyRadial& eq, int sigma, double r, int max_terms) {
  // Substituting R = e^{i sigma w r*} g, with F = dr*/dr = Q/Delta (Q = r^2 + a^2), into the
  // polynomial form gives (derived)
  //   Delta^2 g'' + Delta [2 i sigma w Q + (s+1) Delta'] g'
  //     + [i sigma w (2 r Delta - Q Delta') - w^2 Q^2 + i sigma w (s+1) Delta' Q + P] g = 0.
  const Coefficients base = teukolsky_polynomials(eq, 0.0);
  const double a = eq.hole.a, w = eq.omega, s = eq.s;
  const cd isw(0.0, sigma * w);
  const Poly rr{0.0, 1.0};
  const Poly q{a * a, 0.0, 1.0};
  const Poly delta{a * a, -2.0, 1.0};
  const Poly delta_prime{-2.0, 2.0};
  Poly first = q;
  for (auto& c : first) c *= 2.0 * isw;
  first = poly_mul(delta, poly_add(first, delta_prime, s + 1.0));
  Poly zeroth = poly_add(poly_mul(poly_mul(rr, delta), Poly{2.0}), poly_mul(q, delta_prime), -1.0);
  for (auto& c : zeroth) c *= isw;
  zeroth = poly_add(zeroth, poly_mul(q, q), -w * w);
  zeroth = poly_add(zeroth, poly_mul(delta_prime, q), isw * (s + 1.0));
  zeroth = poly_add(zeroth, base.zeroth);
  zeroth.resize(4);  // the r^4 terms cancel (K^2 - w^2 Q^2 has degree 2)
  const Poly& second = base.second;

  // g = sum_n d_n r^(rho - n); the power r^(rho + 3 - N) gives, since beta_4 (rho - N) + gamma_3
  // = -beta_4 N,  d_N beta_4 N = sum of the lower terms (alpha_k, beta_k, gamma_k the
  // coefficients of r^k in the three polynomials).
  const double rho = sigma < 0 ? -1.0 : -1.0 - 2.0 * s;
  const cd beta4 = coefficient(first, 4);
  std::vector<cd> dn{1.0};  // c_n r^-n
  std::vector<double> size{1.0};
  int rises = 0;
  for (int n_new = 1; n_new < max_terms; ++n_new) {
    cd sum = 0.0;
    for (int k = 0; k <= 4; ++k) {
      const int n = n_new + k - 5;  // alpha_k term
      if (n >= 0 && n < n_new)
        sum += coefficient(second, k) * (rho - n) * (rho - n - 1.0) * dn[static_cast<std::size_t>(n)] *
               std::pow(r, n - n_new);
      const int nb = n_new + k - 4;  // beta_k term
      if (nb >= 0 && nb < n_new)
        sum += coefficient(first, k) * (rho - nb) * dn[static_cast<std::size_t>(nb)] * std::pow(r, nb - n_new);
      const int ng = n_new + k - 3;  // gamma_k term
      if (ng >= 0 && ng < n_new)
        sum += coefficient(zeroth, k) * dn[static_cast<std::size_t>(ng)] * std::pow(r, ng - n_new);
    }
    dn.push_back(sum / (beta4 * static_cast<double>(n_new)));
    size.push_back(std::abs(dn.back()));
    const double before = size[size.size() - 2];
    if (size.back() < 1e-17 && before < 1e-17) break;  // converged to round-off
    // Two growths in a row: the series has begun to diverge. One growth is not enough: a single
    // coefficient can be accidentally small (c_1 of the s = 2 outgoing wave is ~ lambda, which
    // vanishes at a* = 0), and the terms after it are of normal size.
    rises = size.back() > before ? rises + 1 : 0;
    if (rises >= 2) break;
  }
  // Truncate after the term N that minimises the next two terms' size, which is the error kept
  // (the next two, not the next one, so that an accidentally small term does not pass for the end
  // of the series).
  std::size_t keep = dn.size() - 1;
  double smallest = size.back();
  if (!(size.back() < 1e-17))
    for (std::size_t n = 0; n + 2 < dn.size(); ++n) {
      const double e = std::max(size[n + 1], size[n + 2]);
      if (n == 0 || e < smallest) {
        smallest = e;
        keep = n;
      }
    }
  cd g = 0.0, dg = 0.0;  // sums of d_n and (rho - n) d_n
  for (std::size_t n = 0; n <= keep; ++n) {
    g += dn[n];
    dg += (rho - static_cast<double>(n)) * dn[n];
  }
  const cd phase = std::exp(cd(0.0, sigma * w * kerr_tortoise(eq.hole, r)));
  const double power = std::pow(r, rho);
  const cd gv = power * g, gd = power * dg / r;
  const double f = (r * r + a * a) / (r * r - 2.0 * r + a * a);
  return {phase * gv, phase * (gd + isw * f * gv), smallest};
}

}  // namespace ember::greybody
