#include "ember/evaporation/budget.hpp"

#include <cmath>

namespace ember::evaporation {

std::vector<double> power_shares(const MassLoss& ml, double mass) {
  std::vector<double> shares = ml.species_alpha(mass);
  double total = 0;
  for (double a : shares) total += a;
  for (double& a : shares) a /= total;
  return shares;
}

std::vector<double> lifetime_shares(const MassLoss& ml, double mass, double cutoff) {
  const std::size_t n_species = ml.particles().species.size();
  std::vector<double> out(n_species, 0.0);
  const double lo = std::log(std::min(cutoff, mass)), hi = std::log(mass);
  // The tail: everything below min(cutoff, M) is radiated with the shares at that mass.
  const std::vector<double> tail = power_shares(ml, std::exp(lo));
  for (std::size_t s = 0; s < n_species; ++s) out[s] = tail[s] * std::exp(lo);
  if (hi > lo) {
    int n = static_cast<int>(std::ceil((hi - lo) / std::log(10.0) * ml.options().nodes_per_decade));
    n += n % 2;  // Simpson needs an even number of intervals
    const double h = (hi - lo) / n;
    for (int i = 0; i <= n; ++i) {
      const double u = lo + i * h, weight = (i == 0 || i == n) ? 1.0 : (i % 2 ? 4.0 : 2.0);
      const std::vector<double> shares = power_shares(ml, std::exp(u));
      for (std::size_t s = 0; s < n_species; ++s) out[s] += weight * h / 3 * shares[s] * std::exp(u);  // dM = M du
    }
  }
  for (double& v : out) v /= mass;
  return out;
}

}  // namespace ember::evaporation

namespace ember::evaporation {

std::vector<double> kerr_lifetime_shares(const KerrMassLoss& ml, const KerrTrajectory& tr) {
  const auto& points = tr.points();
  const std::size_t n_species = ml.particles().species.size();
  // The tail below the cutoff radiates M_cut with the shares there.
  std::vector<double> out = ml.power_shares(points.back().mass, points.back().hole_spin);
  for (double& x : out) x *= points.back().mass;
  std::vector<double> previous = ml.power_shares(points.front().mass, points.front().hole_spin);
  for (std::size_t i = 1; i < points.size(); ++i) {
    const std::vector<double> here = ml.power_shares(points[i].mass, points[i].hole_spin);
    const double dm = points[i - 1].mass - points[i].mass;
    for (std::size_t s = 0; s < n_species; ++s) out[s] += 0.5 * (previous[s] + here[s]) * dm;
    previous = here;
  }
  for (double& x : out) x /= points.front().mass;
  return out;
}

}  // namespace ember::evaporation
