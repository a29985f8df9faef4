#include "ember/population/hole_spin.hpp"

#include <fmt/format.h>
#include <gsl/gsl_integration.h>

#include <cmath>
#include <memory>
#include <sstream>

#include "ember/core/errors.hpp"
#include "ember/core/text.hpp"

namespace ember::population {

bool SpinDistribution::spinning() const {
  for (const auto& n : nodes)
    if (n.spin > 0 && n.weight > 0) return true;
  return false;
}

std::size_t SpinDistribution::median_node() const {
  double cumulative = 0;
  for (std::size_t i = 0; i < nodes.size(); ++i) {
    cumulative += nodes[i].weight;
    if (cumulative >= 0.5) return i;
  }
  return nodes.size() - 1;
}

double SpinDistribution::median() const {
  return nodes[median_node()].spin;
}

double SpinDistribution::mean() const {
  double m = 0;
  for (const auto& n : nodes) m += n.weight * n.spin;
  return m;
}

namespace {

void normalise(SpinDistribution& d, const std::string& what) {
  double total = 0;
  for (const auto& n : d.nodes) total += n.weight;
  if (!(total > 0)) throw InputError(fmt::format("{}: the weights sum to {}; expected a positive total", what, total));
  for (auto& n : d.nodes) n.weight /= total;
}

// Gauss-Legendre nodes over [low, high], weighted by density(a).
template <class F>
SpinDistribution quadrature(double low, double high, F density, std::string description) {
  SpinDistribution d;
  d.nodes.clear();
  d.description = std::move(description);
  const std::unique_ptr<gsl_integration_glfixed_table, decltype(&gsl_integration_glfixed_table_free)> t(
      gsl_integration_glfixed_table_alloc(quadrature_nodes), gsl_integration_glfixed_table_free);
  for (int i = 0; i < quadrature_nodes; ++i) {
    double x = 0, w = 0;
    gsl_integration_glfixed_point(low, high, i, &x, &w, t.get());
    d.nodes.push_back({x, w * density(x)});
  }
  normalise(d, d.description);
  return d;
}

}  // namespace

SpinDistribution fixed_spin(double spin) {
  SpinDistribution d;
  d.nodes = {{spin, 1.0}};
  d.description = spin > 0 ? fmt::format("a* = {} for every hole", format_real(spin)) : "a* = 0 (non-rotating)";
  return d;
}

SpinDistribution uniform_spin(double low, double high) {
  if (!(high > low)) return fixed_spin(low);
  return quadrature(
      low, high, [](double) { return 1.0; },
      fmt::format("a* uniform on [{}, {}] ({} Gauss-Legendre nodes)", format_real(low), format_real(high),
                  quadrature_nodes));
}

SpinDistribution gaussian_spin(double mean, double width, double max_spin) {
  const double low = std::max(0.0, mean - gaussian_reach * width),
               high = std::min(max_spin, mean + gaussian_reach * width);
  if (!(high > low))
    throw InputError(fmt::format("hole_spin: a Gaussian of mean {} and width {} has no support in [0, {}]",
                                 format_real(mean), format_real(width), format_real(max_spin)));
  return quadrature(
      low, high, [&](double a) { return std::exp(-0.5 * std::pow((a - mean) / width, 2)); },
      fmt::format("a* Gaussian, mean {} and width {}, truncated to [0, {}] ({} Gauss-Legendre nodes)",
                  format_real(mean), format_real(width), format_real(max_spin), quadrature_nodes));
}

SpinDistribution tabulated_spin(std::string_view text, const std::string& label, double max_spin) {
  std::istringstream in{std::string(text)};
  std::vector<double> a, p;
  std::string line;
  for (int n = 1; std::getline(in, line); ++n) {
    const std::string t = trim(line);
    if (t.empty() || t[0] == '#') continue;
    std::istringstream f(t);
    std::string x, y, extra;
    f >> x >> y;
    const auto s = parse_real(x), d = parse_real(y);
    if (!s || !d || (f >> extra) || !(*s >= 0 && *s <= max_spin) || !(*d >= 0) || !std::isfinite(*d))
      throw InputError(fmt::format("{}:{}: \"{}\"; expected a* in [0, {}] and a density >= 0", label, n, printable(t),
                                   format_real(max_spin)));
    if (!a.empty() && !(*s > a.back()))
      throw InputError(
          fmt::format("{}:{}: a* = {} not above the previous row; expected increasing a*", label, n, printable(x)));
    a.push_back(*s);
    p.push_back(*d);
  }
  if (a.size() < 2) throw InputError(fmt::format("{}: {} rows; expected at least 2", label, a.size()));
  SpinDistribution d;
  d.nodes.clear();
  d.description = fmt::format("a* from {} ({} rows, trapezoidal)", label, a.size());
  for (std::size_t i = 0; i < a.size(); ++i) {
    const double left = i > 0 ? a[i] - a[i - 1] : 0.0, right = i + 1 < a.size() ? a[i + 1] - a[i] : 0.0;
    d.nodes.push_back({a[i], 0.5 * (left + right) * p[i]});
  }
  normalise(d, label);
  return d;
}

}  // namespace ember::population
