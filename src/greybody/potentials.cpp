#include "ember/greybody/potentials.hpp"

#include <cmath>

namespace ember::greybody {

Geometry geometry_at(double y) {
  const double e = std::exp(y);
  const double r = 2.0 * (1.0 + e);
  const double f = e / (1.0 + e);
  return Geometry{r, f, std::sqrt(f), r + 2.0 * y};  // r* = r + 2 ln(r/2 - 1)
}

namespace {

double ell(const Mode& m) {
  return m.l();
}

// The Dirac superpotential's pieces: W^2 = k^2 f / r^2 and dW/dr* = k sqrt(f) (3/r - 1)/r^2.
struct DiracPieces {
  double w_squared, w_prime;
};
DiracPieces dirac_pieces(const Mode& m, const Geometry& g) {
  const double k = ell(m) + 0.5;
  return {k * k * g.f / (g.r * g.r), k * g.sqrt_f * (3.0 / g.r - 1.0) / (g.r * g.r)};
}

double zerilli_u(double lambda, double r) {
  const double num =
      2 * lambda * lambda * (lambda + 1) * r * r * r + 6 * lambda * lambda * r * r + 18 * lambda * r + 18;
  const double den = r * r * r * (lambda * r + 3) * (lambda * r + 3);
  return num / den;
}

}  // namespace

double potential_at(const Mode& m, double y) {
  return potential_at(m, geometry_at(y));
}

double potential_at(const Mode& m, const Geometry& g) {
  switch (m.potential) {
    case Potential::regge_wheeler: {
      const double l = ell(m), s = m.spin();
      return g.f * (l * (l + 1) / (g.r * g.r) + (1 - s * s) * 2.0 / (g.r * g.r * g.r));
    }
    case Potential::zerilli: {
      const double l = ell(m);
      return g.f * zerilli_u((l - 1) * (l + 2) / 2, g.r);
    }
    case Potential::dirac_plus: {
      const auto d = dirac_pieces(m, g);
      return d.w_squared + d.w_prime;
    }
    case Potential::dirac_minus: {
      const auto d = dirac_pieces(m, g);
      return d.w_squared - d.w_prime;
    }
  }
  return 0;
}

std::vector<HorizonTerm> horizon_terms(const Mode& m, double y) {
  // f ~ e^{r*/2} near the horizon (r* ~ 2 y), and sqrt(f) ~ e^{r*/4}.
  if (m.potential == Potential::dirac_plus || m.potential == Potential::dirac_minus) {
    const auto d = dirac_pieces(m, geometry_at(y));
    const double sign = m.potential == Potential::dirac_plus ? 1.0 : -1.0;
    return {{d.w_squared, 0.5}, {sign * d.w_prime, 0.25}};
  }
  return {{potential_at(m, y), 0.5}};
}

std::vector<double> inverse_power_coefficients(const Mode& m, int count) {
  std::vector<double> u(static_cast<std::size_t>(count), 0.0);
  const auto at = [&](int i) -> double& { return u[static_cast<std::size_t>(i)]; };
  switch (m.potential) {
    case Potential::regge_wheeler: {
      const double l = ell(m), s = m.spin();
      if (count > 2) at(2) = l * (l + 1);
      if (count > 3) at(3) = 2 * (1 - s * s);
      break;
    }
    case Potential::zerilli: {
      // U = r^-2 [2(L+1) + 6/r + 18/(L r^2) + 18/(L^2 r^3)] (1 + q/r)^-2 with q = 3/L.
      const double l = ell(m), lambda = (l - 1) * (l + 2) / 2, q = 3 / lambda;
      const double p[4] = {2 * (lambda + 1), 6, 18 / lambda, 18 / (lambda * lambda)};
      for (int mm = 2; mm < count; ++mm) {
        double sum = 0;
        for (int i = 0; i < 4 && i <= mm - 2; ++i) {
          const int n = mm - 2 - i;
          sum += p[i] * (n + 1) * std::pow(-q, n);
        }
        at(mm) = sum;
      }
      break;
    }
    case Potential::dirac_plus:
    case Potential::dirac_minus: {
      // U = k^2/r^2 +- k (3/r - 1) r^-2 (1 - 2/r)^-1/2, and (1 - z)^-1/2 = sum a_n z^n,
      // a_n = binom(2n, n) / 4^n.
      const double k = ell(m) + 0.5, sign = m.potential == Potential::dirac_plus ? 1.0 : -1.0;
      std::vector<double> a2n(static_cast<std::size_t>(count), 0.0);  // a_n 2^n
      double a = 1;
      for (int n = 0; n < count; ++n) {
        a2n[static_cast<std::size_t>(n)] = a * std::pow(2.0, n);
        a *= (2.0 * n + 1) / (2.0 * n + 2);
      }
      for (int mm = 2; mm < count; ++mm) {
        double v = -a2n[static_cast<std::size_t>(mm - 2)];
        if (mm >= 3) v += 3 * a2n[static_cast<std::size_t>(mm - 3)];
        at(mm) = sign * k * v;
      }
      if (count > 2) at(2) += k * k;
      break;
    }
  }
  return u;
}

}  // namespace ember::greybody
