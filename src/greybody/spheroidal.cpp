#include "ember/greybody/spheroidal.hpp"

#include <fmt/format.h>
#include <gsl/gsl_eigen.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_matrix.h>
#include <gsl/gsl_vector.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <memory>
#include <vector>

#include "ember/core/errors.hpp"
#include "ember/core/gsl_status.hpp"

namespace ember::greybody {

void SpheroidalOptions::validate() const {
  const auto require = [](bool ok, const char* field, const char* rule, double value) {
    if (!ok) throw InputError(fmt::format("spheroidal eigenvalue options: {} = {}: {}", field, value, rule));
  };
  require(std::isfinite(change) && change > 1e-15 && change < 1e-3, "change", "must lie in (1e-15, 1e-3)", change);
  require(initial_terms >= 1, "initial_terms", "must be at least 1", initial_terms);
  // For s = 0 (or c = 0) the matrix splits into even and odd l - l_lowest, which do not couple: a
  // step of one term would grow only one of the two and could leave the eigenvalue unchanged.
  require(step_terms >= 2 && step_terms % 2 == 0, "step_terms", "must be even and at least 2", step_terms);
  require(max_terms >= initial_terms + step_terms, "max_terms", "must be at least initial_terms + step_terms",
          max_terms);
}

Estimate radial_separation_constant(const Estimate& separation, double m, double c) {
  // Teukolsky, ApJ 185 (1973) 635, eq. 4.9 (from memory): lambda = A + a^2 omega^2 - 2 a m omega.
  return {separation.value + c * c - 2.0 * m * c, separation.error};
}

namespace {

// The mode's quantum numbers, checked, with l's lowest value.
struct SpheroidalLabels {
  double s, l, m, c;
  double l_lowest;  // max(|s|, |m|), the first basis function
  int index;        // l - l_lowest: which eigenvalue, counted from the smallest
};

// 2 v as an exact integer, or InputError naming the argument.
int spheroidal_twice(double v, const char* name) {
  const double t = 2.0 * v;
  if (!std::isfinite(v) || std::abs(v) > 1e6 || t != std::round(t))
    throw InputError(fmt::format("spheroidal eigenvalue: {} = {}: must be a whole or half-whole number", name, v));
  return static_cast<int>(std::lround(t));
}

SpheroidalLabels spheroidal_labels(double s, double l, double m, double c) {
  const int ts = spheroidal_twice(s, "s"), tl = spheroidal_twice(l, "l"), tm = spheroidal_twice(m, "m");
  const auto fail = [](const char* name, double v, const std::string& rule) {
    throw InputError(fmt::format("spheroidal eigenvalue: {} = {}: {}", name, v, rule));
  };
  if (std::abs(ts) > 4) fail("s", s, "spin weight must be one of 0, +-1/2, +-1, +-3/2, +-2");
  if ((tm - ts) % 2 != 0) fail("m", m, fmt::format("m - s must be a whole number (s = {})", s));
  if ((tl - ts) % 2 != 0) fail("l", l, fmt::format("l - s must be a whole number (s = {})", s));
  if (std::abs(ts) > tl) fail("l", l, fmt::format("must be at least |s| = {}", std::abs(s)));
  if (std::abs(tm) > tl) fail("m", m, fmt::format("|m| must not exceed l = {}", l));
  if (!std::isfinite(c)) fail("c", c, "must be finite");
  const int t_lowest = std::max(std::abs(ts), std::abs(tm));
  return {s, l, m, c, 0.5 * t_lowest, (tl - t_lowest) / 2};
}

// Matrix elements of cos(theta) between spin-weighted spherical harmonics of the same s and m,
// <s l' m| cos |s l m>, from the Clebsch-Gordan coupling of l with 1 (Hughes, PRD 61 (2000)
// 084004, appendix A; from memory, rederived):
//   diagonal      <l|cos|l>   = -m s / (l (l+1))
//   off-diagonal  <l+1|cos|l> = sqrt(((l+1)^2 - m^2) ((l+1)^2 - s^2)) / ((l+1) sqrt((2l+1)(2l+3)))
// The off-diagonal phase is a basis convention: every closed product of couplings is a square, so
// the eigenvalues do not depend on it.
double cos_diagonal(double s, double m, double l) {
  return (m == 0 || s == 0) ? 0.0 : -m * s / (l * (l + 1));
}

double cos_raising(double s, double m, double l) {
  const double k = l + 1;
  return std::sqrt((k * k - m * m) * (k * k - s * s)) / (k * std::sqrt((2 * l + 1) * (2 * l + 3)));
}

// The truncated operator, row-major n x n, on the basis l_lowest, l_lowest + 1, ...:
//   -[(1/sin)(sin S')' - (m + s cos)^2/sin^2] - c^2 cos^2 + 2 c s cos,
// whose eigenvalues are E = A + s (rearranging Teukolsky's eq. 4.10). The first term is diagonal,
// l(l+1) - s^2. cos^2 is the square of the tridiagonal cos matrix taken over n + 1 terms, so that
// its n x n block is exact and the truncation only drops couplings beyond the basis.
std::vector<double> spheroidal_matrix(const SpheroidalLabels& q, int n) {
  std::vector<double> d(n + 1), e(n + 1);  // cos: diagonal d_i, coupling e_i between i and i + 1
  for (int i = 0; i <= n; ++i) {
    const double l = q.l_lowest + i;
    d[i] = cos_diagonal(q.s, q.m, l);
    e[i] = cos_raising(q.s, q.m, l);
  }
  std::vector<double> a(static_cast<std::size_t>(n) * n, 0.0);
  const auto at = [&](int i, int j) -> double& { return a[static_cast<std::size_t>(i) * n + j]; };
  const double c = q.c, c2 = c * c, two_cs = 2 * c * q.s;
  for (int i = 0; i < n; ++i) {
    const double l = q.l_lowest + i;
    const double below = i > 0 ? e[i - 1] : 0.0;
    at(i, i) = l * (l + 1) - q.s * q.s + two_cs * d[i] - c2 * (d[i] * d[i] + e[i] * e[i] + below * below);
    if (i + 1 < n) at(i, i + 1) = at(i + 1, i) = two_cs * e[i] - c2 * e[i] * (d[i] + d[i + 1]);
    if (i + 2 < n) at(i, i + 2) = at(i + 2, i) = -c2 * e[i] * e[i + 1];
  }
  return a;
}

double spheroidal_norm(const std::vector<double>& a, int n) {
  double norm = 0;
  for (int i = 0; i < n; ++i) {
    double row = 0;
    for (int j = 0; j < n; ++j) row += std::abs(a[static_cast<std::size_t>(i) * n + j]);
    norm = std::max(norm, row);
  }
  return norm;
}

struct SpheroidalSolve {
  double value;     // E = A + s, the index-th smallest eigenvalue
  double rounding;  // its rounding floor
};

// Diagonalises the n-term truncation with gsl_eigen_symm (eigenvalues only; QR on the
// tridiagonal reduction) and picks the mode's eigenvalue by its rank.
SpheroidalSolve spheroidal_diagonalise(const SpheroidalLabels& q, int n) {
  std::vector<double> a = spheroidal_matrix(q, n);
  const double rounding =
      tolerance::spheroidal_rounding_epsilons * std::numeric_limits<double>::epsilon() * spheroidal_norm(a, n);
  gsl_matrix_view view = gsl_matrix_view_array(a.data(), n, n);
  std::unique_ptr<gsl_vector, decltype(&gsl_vector_free)> values(gsl_vector_alloc(n), &gsl_vector_free);
  std::unique_ptr<gsl_eigen_symm_workspace, decltype(&gsl_eigen_symm_free)> work(gsl_eigen_symm_alloc(n),
                                                                                 &gsl_eigen_symm_free);
  const int status = gsl_eigen_symm(&view.matrix, values.get(), work.get());
  if (status != GSL_SUCCESS)
    throw NumericalError("spheroidal eigenvalue", fmt::format("gsl_eigen_symm failed ({}) on {} terms at s = {}, "
                                                              "l = {}, m = {}, c = {}",
                                                              gsl_strerror(status), n, q.s, q.l, q.m, q.c));
  std::vector<double> sorted(values->data, values->data + n);
  std::nth_element(sorted.begin(), sorted.begin() + q.index, sorted.end());
  return {sorted[q.index], rounding};
}

}  // namespace

SpheroidalEigenvalue spheroidal_eigenvalue(double s, double l, double m, double c, const SpheroidalOptions& options) {
  options.validate();
  use_gsl_status_codes();
  const SpheroidalLabels q = spheroidal_labels(s, l, m, c);
  // The expansion coefficients fall off once l' - l passes about |c| (common practice), so the
  // first basis reaches past both the mode and |c|.
  const double first = q.index + 1 + std::ceil(std::abs(c)) + options.initial_terms;
  if (first > options.max_terms)
    throw NumericalError("spheroidal eigenvalue",
                         fmt::format("c = {} needs a basis of more than max_terms = {} terms (s = {}, l = {}, m = {})",
                                     c, options.max_terms, s, l, m));
  int n = static_cast<int>(first);
  SpheroidalSolve previous = spheroidal_diagonalise(q, n);
  SpheroidalEigenvalue out;
  out.summary.truncations = 1;
  for (;;) {
    const int next = n + options.step_terms;
    if (next > options.max_terms)
      throw NumericalError(
          "spheroidal eigenvalue",
          fmt::format("no convergence to {:.1e} by max_terms = {} terms: last change {:.3e} at s = {}, "
                      "l = {}, m = {}, c = {}",
                      options.change, options.max_terms, out.summary.last_change, s, l, m, c));
    const SpheroidalSolve current = spheroidal_diagonalise(q, next);
    ++out.summary.truncations;
    n = next;
    const double change = std::abs(current.value - previous.value);
    out.summary.last_change = change;
    const double a = current.value - s;  // A = E - s
    if (change <= options.change * std::max(1.0, std::abs(a)) || change <= current.rounding) {
      out.separation = {a, change + current.rounding};
      out.summary.terms = n;
      out.summary.rounding = current.rounding;
      out.summary.message = fmt::format(
          "spheroidal eigenvalue s = {}, l = {}, m = {}, c = {}: A = {:.15g} +- {:.2e} with {} terms "
          "({} truncations, last change {:.2e})",
          s, l, m, c, a, out.separation.error, n, out.summary.truncations, change);
      return out;
    }
    previous = current;
  }
}

}  // namespace ember::greybody
