#include "ember/population/counts.hpp"

#include <fmt/format.h>

#include <cmath>

#include "ember/core/errors.hpp"
#include "ember/core/finite.hpp"
#include "ember/units/constants.hpp"

namespace ember::population {

namespace {

void add_counts(Response& r, const Decay& d, double w, const ResponseContext& c) {
  const double lc = lightcone_decays_per_beta(r.formation, d);
  r.lightcone_per_beta += w * lc;
  r.lightcone_per_beta_counted +=
      w * lightcone_decays_per_beta(r.formation, d.counted.probability, d.counted.lightcone_radius);
  r.lightcone_per_beta_postponed +=
      w * lightcone_decays_per_beta(r.formation, d.postponed.probability, d.postponed.lightcone_radius);
  r.lightcone_per_beta_semiclassical +=
      w * lightcone_decays_per_beta(r.formation, d.probability_semiclassical, d.lightcone_radius);
  r.hubble_per_beta += w * hubble_decays_per_beta(r.formation, d, *c.background);
  if (d.spinning_crossover) {
    r.lightcone_per_beta_spinning += w * lc;
    r.spinning_crossover_share += w;
  }
}

// The weighted means over the spin nodes, on the median node's decay (counts.hpp says which).
Decay mean_decay(const std::vector<Decay>& ds, const SpinDistribution& spins, const cosmology::Background& b,
                 bool postpone) {
  Decay d = ds[spins.median_node()];
  const auto mean = [&](auto field) {
    double m = 0;
    for (std::size_t j = 0; j < ds.size(); ++j) m += spins.nodes[j].weight * field(ds[j]);
    return m;
  };
  const auto treatment = [&](Treatment Decay::*t) {
    Treatment out;
    out.hazard = mean([&](const Decay& x) { return (x.*t).hazard; });
    out.probability = mean([&](const Decay& x) { return (x.*t).probability; });
    if (out.probability > 0) {
      out.decay_time = mean([&](const Decay& x) { return (x.*t).probability * (x.*t).decay_time; }) / out.probability;
      out.lightcone_radius = b.lightcone_radius(out.decay_time);
    }
    return out;
  };
  d.counted = treatment(&Decay::counted);
  d.postponed = treatment(&Decay::postponed);
  const Treatment& chosen = postpone ? d.postponed : d.counted;
  d.hazard = chosen.hazard;
  d.probability = chosen.probability;
  d.decay_time = chosen.decay_time;
  d.lightcone_radius = chosen.lightcone_radius;
  d.hazard_in_time = mean([](const Decay& x) { return x.hazard_in_time; });
  d.probability_semiclassical = mean([](const Decay& x) { return x.probability_semiclassical; });
  d.spinning_crossover = false;
  for (const auto& x : ds) d.spinning_crossover = d.spinning_crossover || x.spinning_crossover;
  return d;
}

}  // namespace

Response response_at(double mass, const tunnelling::ActionTable& table, const ResponseContext& c) {
  Response r;
  r.mass = mass;
  r.formation = formation_of(mass, c.collapse_fraction, *c.background);
  if (!c.hole_spin.spinning()) {
    r.decay = decay_along(r.formation, *c.mass_loss, c.trajectory, table, *c.background, c.decay, c.standard_model);
    add_counts(r, r.decay, 1.0, c);
  } else {
    if (!c.spinning.kerr) throw InputError("population: a spinning population without the Kerr rates");
    std::vector<Decay> ds;
    for (const auto& node : c.hole_spin.nodes) {
      ds.push_back(node.spin > 0 ? decay_along_spinning(r.formation, node.spin, c.spinning, table, *c.background,
                                                        c.decay, c.standard_model)
                                 : decay_along(r.formation, *c.mass_loss, c.trajectory, table, *c.background, c.decay,
                                               c.standard_model));
      add_counts(r, ds.back(), node.weight, c);
    }
    r.decay =
        ds.size() == 1 ? ds.front() : mean_decay(ds, c.hole_spin, *c.background, c.decay.hot_era == HotEra::postpone);
  }
  r.f_per_beta = f_pbh_per_beta(r.formation, *c.background);
  r.count_per_beta = lightcone_count_per_beta(r.formation, *c.background);
  // Module boundary (no NaN leaves a module): a response leaves the population module finite.
  const auto inputs = [&] { return fmt::format("formation mass {:.6e} g", mass / units::gram); };
  const char* hint = "a formation mass nearer the scan's other rows, or more decay_grid_points";
  require_finite(r.lightcone_per_beta, "population: decays per beta", "N_lightcone / beta", inputs, hint);
  require_finite(r.hubble_per_beta, "population: decays per beta", "N_hubble / beta", inputs, hint);
  require_finite(r.f_per_beta, "population: abundance conversion", "f_PBH / beta", inputs, hint);
  require_finite(r.count_per_beta, "population: abundance conversion", "holes in the light cone / beta", inputs, hint);
  return r;
}

std::vector<double> response_masses(double low, double high, int per_decade) {
  if (!(high > low)) return {low};
  const int n = std::max(2, static_cast<int>(std::ceil(std::log10(high / low) * per_decade)) + 1);
  std::vector<double> out;
  for (int i = 0; i < n; ++i) out.push_back(low * std::pow(high / low, static_cast<double>(i) / (n - 1)));
  return out;
}

std::vector<Response> response_grid(double low, double high, int per_decade, const tunnelling::ActionTable& table,
                                    const ResponseContext& c) {
  std::vector<Response> out;
  for (const double m : response_masses(low, high, per_decade)) out.push_back(response_at(m, table, c));
  return out;
}

namespace {

// int psi(M) g(M) dM = int M psi(M) g(M) d ln M over the response grid, trapezoidal.
double integrate(const MassFunction& s, const std::vector<Response>& rs,
                 const std::function<double(const Response&)>& g) {
  double total = 0;
  for (std::size_t i = 0; i + 1 < rs.size(); ++i) {
    const double a = rs[i].mass * s.psi(rs[i].mass) * g(rs[i]),
                 b = rs[i + 1].mass * s.psi(rs[i + 1].mass) * g(rs[i + 1]);
    total += 0.5 * (a + b) * std::log(rs[i + 1].mass / rs[i].mass);
  }
  return total;
}

const Response& nearest(const std::vector<Response>& rs, double mass) {
  const Response* best = &rs.front();
  for (const auto& r : rs)
    if (std::abs(std::log(r.mass / mass)) < std::abs(std::log(best->mass / mass))) best = &r;
  return *best;
}

}  // namespace

std::vector<double> contributions(const MassFunction& s, double f_pbh, const std::vector<Response>& rs) {
  std::vector<double> out;
  for (const auto& r : rs)
    out.push_back(r.f_per_beta > 0 ? f_pbh * r.mass * s.psi(r.mass) * r.lightcone_per_beta / r.f_per_beta : 0.0);
  return out;
}

std::optional<ContributionRange> contribution_range(const std::vector<Response>& rs, const std::vector<double>& dn,
                                                    double share) {
  if (rs.size() < 2 || dn.size() != rs.size()) return std::nullopt;
  std::vector<double> cumulative{0};
  for (std::size_t i = 0; i + 1 < rs.size(); ++i)
    cumulative.push_back(cumulative.back() + 0.5 * (dn[i] + dn[i + 1]) * std::log(rs[i + 1].mass / rs[i].mass));
  const double total = cumulative.back();
  if (!(total > 0)) return std::nullopt;
  const auto at = [&](double q) {  // the mass where the cumulative share reaches q
    for (std::size_t i = 0; i + 1 < cumulative.size(); ++i)
      if (cumulative[i + 1] >= q * total) {
        const double step = cumulative[i + 1] - cumulative[i];
        const double x = step > 0 ? (q * total - cumulative[i]) / step : 0.0;
        return std::exp(std::log(rs[i].mass) + x * std::log(rs[i + 1].mass / rs[i].mass));
      }
    return rs.back().mass;
  };
  return ContributionRange{at(0.5 * (1 - share)), at(0.5), at(0.5 * (1 + share))};
}

double lightcone_per_amplitude(const MassFunction& s, const std::vector<Response>& rs) {
  if (rs.empty()) throw InputError("counts: no responses");
  if (s.monochromatic()) return rs.front().lightcone_per_beta;
  return integrate(s, rs, [](const Response& r) { return r.lightcone_per_beta / r.f_per_beta; });
}

namespace {

Counts counts_unchecked(const MassFunction& s, AbundanceMeasure measure, double value,
                        const std::vector<Response>& rs) {
  Counts c;
  if (s.monochromatic()) {
    const Response& r = rs.front();
    c.beta = measure == AbundanceMeasure::beta    ? value
             : measure == AbundanceMeasure::f_pbh ? value / r.f_per_beta
                                                  : value / r.count_per_beta;
    c.f_pbh = c.beta * r.f_per_beta;
    c.lightcone = c.beta * r.lightcone_per_beta;
    c.hubble = c.beta * r.hubble_per_beta;
    c.from_evaporated = r.decay.evaporated ? c.lightcone : 0.0;
    c.lightcone_counted = c.beta * r.lightcone_per_beta_counted;
    c.lightcone_postponed = c.beta * r.lightcone_per_beta_postponed;
    c.lightcone_semiclassical = c.beta * r.lightcone_per_beta_semiclassical;
    c.lightcone_spinning = c.beta * r.lightcone_per_beta_spinning;
    return c;
  }
  const Response& mid = nearest(rs, s.characteristic_mass());
  // The amplitude is f_PBH; beta is quoted at the characteristic mass.
  c.f_pbh = measure == AbundanceMeasure::f_pbh ? value
            : measure == AbundanceMeasure::beta
                ? value * mid.f_per_beta
                : value / integrate(s, rs, [](const Response& r) { return r.count_per_beta / r.f_per_beta; });
  c.beta = c.f_pbh / mid.f_per_beta;
  c.lightcone = c.f_pbh * integrate(s, rs, [](const Response& r) { return r.lightcone_per_beta / r.f_per_beta; });
  c.hubble = c.f_pbh * integrate(s, rs, [](const Response& r) { return r.hubble_per_beta / r.f_per_beta; });
  c.from_evaporated = c.f_pbh * integrate(s, rs, [](const Response& r) {
                        return r.decay.evaporated ? r.lightcone_per_beta / r.f_per_beta : 0.0;
                      });
  c.lightcone_counted =
      c.f_pbh * integrate(s, rs, [](const Response& r) { return r.lightcone_per_beta_counted / r.f_per_beta; });
  c.lightcone_postponed =
      c.f_pbh * integrate(s, rs, [](const Response& r) { return r.lightcone_per_beta_postponed / r.f_per_beta; });
  c.lightcone_semiclassical =
      c.f_pbh * integrate(s, rs, [](const Response& r) { return r.lightcone_per_beta_semiclassical / r.f_per_beta; });
  c.lightcone_spinning =
      c.f_pbh * integrate(s, rs, [](const Response& r) { return r.lightcone_per_beta_spinning / r.f_per_beta; });
  return c;
}

}  // namespace

Counts counts_for(const MassFunction& s, AbundanceMeasure measure, double value, const std::vector<Response>& rs) {
  if (rs.empty()) throw InputError("counts: no responses");
  const Counts c = counts_unchecked(s, measure, value, rs);
  // Module boundary (no NaN leaves a module): the counts leave the population module finite.
  const auto inputs = [&] { return fmt::format("abundance {} on {}", value, s.description()); };
  const char* hint = "another abundance measure (beta or f_pbh), or a spectrum inside the formable masses";
  for (const auto& [what, v] : {std::pair{"beta", c.beta}, std::pair{"f_PBH", c.f_pbh},
                                std::pair{"N_lightcone", c.lightcone}, std::pair{"N_hubble", c.hubble}})
    require_finite(v, "population: counts", what, inputs, hint);
  return c;
}

}  // namespace ember::population
