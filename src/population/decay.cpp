#include "ember/population/decay.hpp"

#include <fmt/format.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_integration.h>

#include <cmath>
#include <functional>
#include <vector>

#include "ember/core/errors.hpp"
#include "ember/core/gsl_status.hpp"
#include "ember/core/gsl_tools.hpp"
#include "ember/evaporation/spinning_clock.hpp"
#include "ember/units/constants.hpp"

namespace ember::population {

namespace {

double qag(const std::function<double(double)>& f, double lo, double hi, double rel, const char* what) {
  if (!(hi > lo)) return 0.0;
  gsl_function g{[](double x, void* p) { return (*static_cast<const std::function<double(double)>*>(p))(x); },
                 const_cast<std::function<double(double)>*>(&f)};
  const IntegrationWorkspace w = integration_workspace(1000);
  double r = 0, e = 0;
  use_gsl_status_codes();
  const int status = gsl_integration_qag(&g, lo, hi, 0.0, rel, 1000, GSL_INTEG_GAUSS31, w.get(), &r, &e);
  if (status != GSL_SUCCESS && status != GSL_EROUND && !(std::abs(e) <= 1e-4 * std::abs(r)))
    throw NumericalError(
        what, fmt::format("{} over [{:.4g}, {:.4g}]: result {:.6e} +- {:.1e}", gsl_strerror(status), lo, hi, r, e));
  return r;
}

// What the decay grid records at one ln M: Gamma_D / Gamma_H, the cosmic time, and whether the
// plasma is cold enough (plasma.hpp) and B at least the minimum action there.
struct Sample {
  double u = 0, ratio = 0, time = 0;
  bool cold = false, semiclassical = true;
  bool open = true;  // the seeded rate counts here (a spinning hole's spin has fallen to the limit)
};

// The pieces of [lo, hi] in ln M where keep(u) holds, from `grid` (increasing u), each change
// refined by bisection to 1e-12 in ln M.
std::vector<std::pair<double, double>> pieces(const std::vector<Sample>& grid, const std::function<bool(double)>& keep,
                                              const std::function<bool(const Sample&)>& kept) {
  std::vector<std::pair<double, double>> out;
  bool inside = kept(grid.front());
  double start = grid.front().u;
  for (std::size_t i = 1; i < grid.size(); ++i) {
    if (kept(grid[i]) == inside) continue;
    double a = grid[i - 1].u, b = grid[i].u;  // kept at a is `inside`, at b the opposite
    for (int k = 0; k < 60 && b - a > 1e-12; ++k) {
      const double mid = 0.5 * (a + b);
      (keep(mid) == inside ? a : b) = mid;
    }
    if (inside) out.emplace_back(start, 0.5 * (a + b));
    start = 0.5 * (a + b);
    inside = !inside;
  }
  if (inside) out.emplace_back(start, grid.back().u);
  return out;
}

// The mean time of a decay within a step of duration dt and hazard dh at a constant rate, as a
// fraction of dt: 1/dh - 1/(e^dh - 1), the mean of the exponential truncated to the step (derived);
// 1/2 - dh/12 for a small hazard. It resolves prompt decays, where 1/Gamma_D is far below a step.
double mean_offset(double dh) {
  return dh < 1e-4 ? 0.5 - dh / 12 : 1 / dh - 1 / std::expm1(dh);
}

// Walks the grid from formation (the last sample) down, accumulating one treatment's decay time.
struct TimeWeights {
  double cumulative = 0, weight = 0, weighted_time = 0;
  void step(double r_early, double r_late, double du, double t_early, double t_late) {
    const double dh = 0.5 * (r_early + r_late) * du;
    const double w = std::exp(-cumulative) * -std::expm1(-dh);  // probability of decaying in this step
    cumulative += dh;
    weighted_time += w * (t_early + mean_offset(dh) * (t_late - t_early));
    weight += w;
  }
  void finish(Treatment& t, const cosmology::Background& b) const {
    if (weight <= 0) return;
    t.decay_time = std::min(weighted_time / weight, b.age());
    t.lightcone_radius = b.lightcone_radius(t.decay_time);
  }
};

// The spin gate of a spinning hole: the seeded rate counts only at masses up to `gate`, where a*
// has fallen to the spin limit (hole_spin.hpp); infinite for a non-rotating hole.
struct Gate {
  double mass = HUGE_VAL;
  bool open(double m) const { return m <= mass * (1 + 1e-12); }  // exp(ln M) may round up
  bool everywhere() const { return mass == HUGE_VAL; }
};

// The decay along one history. Clock: Trajectory or SpinningClock (lifetime, age_at, mass_at_age,
// time_left, mass_at_time_left); gamma_h(M, rates): Gamma_H at M.
template <class Clock, class EvaporationRate>
Decay decay_with(const Formation& formation, const Clock& tr, EvaporationRate gamma_h, Gate gate,
                 const evaporation::MassLoss& ml, const tunnelling::ActionTable& table, const cosmology::Background& b,
                 const DecayOptions& o, const higgs::StandardModelPotential* sm) {
  Decay d;
  const double available = b.age() - formation.time;  // time from formation to today
  // The hazard runs down to the semiclassical floor: the trajectory's cutoff_mass only decides
  // where its integration hands over to the analytic tail, never where the hazard stops.
  const double floor = table.floor();
  d.evaporated = tr.lifetime() <= available;
  d.lifetime = tr.lifetime();
  d.end_mass = d.evaporated ? floor : std::max(floor, tr.mass_at_age(available));
  const double u_lo = std::log(d.end_mass), u_hi = std::log(formation.mass);
  if (!(u_hi > u_lo)) {  // formed below the floor: outside the semiclassical regime
    d.formed_below_floor = true;
    return d;
  }
  const auto ratio_of = [&](double m, const tunnelling::Rates& r) {
    const double h = gamma_h(m, r);
    return h > 0 ? r.decay_rate / h : 0.0;
  };
  const auto sample = [&](double u) {
    const double m = std::exp(u);
    const tunnelling::ActionPoint a = table.at(m);
    const tunnelling::Rates r = tunnelling::rates_at(a, ml, o.prefactor);
    Sample s{u, ratio_of(m, r), formation.time + tr.age_at(m)};
    s.cold = check_plasma(b, sm, s.time, m, a, units::newton_G).cold_enough();
    s.semiclassical = !a.flags.below_minimum_action;
    s.open = gate.open(m);
    return s;
  };
  // Gamma_D / Gamma_H as a function of ln M (the hazard per unit ln M).
  const auto ratio = [&](double u) {
    const double m = std::exp(u);
    return ratio_of(m, tunnelling::rates_at(table.at(m), ml, o.prefactor));
  };
  const int n = o.grid_points;
  std::vector<Sample> grid;
  for (int i = 0; i <= n; ++i) grid.push_back(sample(u_lo + (u_hi - u_lo) * i / n));

  const bool postpone = o.hot_era == HotEra::postpone;
  const double whole = qag(ratio, u_lo, u_hi, o.relative_tolerance, "decay hazard quadrature (GSL qag, ln M)");
  // Each distinct set of pieces is integrated once: the hot era and the minimum action usually
  // restrict the hazard to the same pieces (or to none), and the whole range is the counted hazard.
  std::vector<std::pair<std::vector<std::pair<double, double>>, double>> integrated{{{{u_lo, u_hi}}, whole}};
  const auto hazard_where = [&](const std::function<bool(const Sample&)>& kept) {
    const auto parts = pieces(
        grid, [&](double u) { return kept(sample(u)); }, kept);
    for (const auto& [known, h] : integrated)
      if (known == parts) return h;
    double h = 0;
    for (const auto& [a, c] : parts)
      h += qag(ratio, a, c, o.relative_tolerance, "decay hazard quadrature (GSL qag, ln M)");
    integrated.emplace_back(parts, h);
    return h;
  };
  d.counted.hazard = gate.everywhere() ? whole : hazard_where([](const Sample& s) { return s.open; });
  d.postponed.hazard = hazard_where([](const Sample& s) { return s.cold && s.open; });
  const double semiclassical =
      hazard_where([&](const Sample& s) { return s.open && s.semiclassical && (s.cold || !postpone); });
  d.counted.probability = -std::expm1(-d.counted.hazard);
  d.postponed.probability = -std::expm1(-d.postponed.hazard);
  d.probability_semiclassical = -std::expm1(-semiclassical);

  // The same hazard in time: int Gamma_D dt = int Gamma_D(M(tau)) tau d ln tau, tau the time left.
  const auto in_time = [&](double s) {
    const double tau = std::exp(s), m = tr.mass_at_time_left(tau);
    return tunnelling::rates_at(table.at(m), ml, o.prefactor).decay_rate * tau;
  };
  const double top = std::min(formation.mass, gate.mass);
  if (top > d.end_mass)
    d.hazard_in_time = qag(in_time, std::log(tr.time_left(d.end_mass)), std::log(tr.time_left(top)),
                           o.relative_tolerance, "decay hazard quadrature (GSL qag, ln time left)");

  // Crossover, the first cold moment and the decay times, on the grid from the formation mass down.
  const auto crossing = [&](std::size_t i) {  // Gamma_D reaches Gamma_H between grid[i] and grid[i + 1]
    double a = grid[i].u, c = grid[i + 1].u;  // ratio(a) >= 1 > ratio(c)
    for (int k = 0; k < 60; ++k) {
      const double mid = 0.5 * (a + c);
      (ratio(mid) >= 1 ? a : c) = mid;
    }
    d.crossover_mass = std::exp(a);
    const double rc = ratio(a);
    d.branching_at_crossover = rc / (1 + rc);
  };
  if (grid.back().ratio >= 1) {  // decay outruns evaporation from the start
    d.crossover_mass = formation.mass;
    d.branching_at_crossover = grid.back().ratio / (1 + grid.back().ratio);
  }
  if (grid.back().cold) d.cooled_time = grid.back().time;
  TimeWeights all, cold;
  const double du = (u_hi - u_lo) / n;
  Sample at_gate;
  const bool gate_inside = !gate.everywhere() && gate.mass > d.end_mass && gate.mass < formation.mass;
  if (gate_inside) {
    at_gate = sample(std::log(gate.mass));
    at_gate.open = true;
  }
  for (std::size_t i = grid.size() - 1; i-- > 0;) {
    const Sample &early = grid[i + 1], &late = grid[i];
    if (!d.crossover_mass && late.ratio >= 1 && early.ratio < 1) crossing(i);
    if (!d.cooled_time && late.cold) {  // the plasma cools between these two: refined by bisection
      double hot = early.u, cool = late.u;
      for (int k = 0; k < 60 && hot - cool > 1e-15 * std::abs(hot); ++k) {
        const double mid = 0.5 * (hot + cool);
        (sample(mid).cold ? cool : hot) = mid;
      }
      d.cooled_time = sample(cool).time;
    }
    // The step through the spin gate starts at the gate, so no decay is timed before it.
    const bool through_gate = gate_inside && !early.open && late.open;
    const Sample& from = through_gate ? at_gate : early;
    const double step = through_gate ? at_gate.u - late.u : du;
    const double late_ratio = late.open ? late.ratio : 0.0;
    all.step(from.open ? from.ratio : 0.0, late_ratio, step, from.time, late.time);
    cold.step(from.cold && from.open ? from.ratio : 0.0, late.cold ? late_ratio : 0.0, step, from.time, late.time);
  }
  all.finish(d.counted, b);
  cold.finish(d.postponed, b);

  const Treatment& chosen = postpone ? d.postponed : d.counted;
  d.hazard = chosen.hazard;
  d.probability = chosen.probability;
  d.decay_time = chosen.decay_time;
  d.lightcone_radius = chosen.lightcone_radius;
  if (d.probability > 0) d.plasma_at_decay = plasma_temperature(b, d.decay_time);
  if (d.crossover_mass) d.plasma_at_crossover = plasma_temperature(b, formation.time + tr.age_at(*d.crossover_mass));
  // Below the floor the semiclassical rate is not trusted: say when it would have mattered.
  if (d.evaporated && d.probability < 0.5) d.decays_below_floor = ratio(std::log(floor)) > 1;
  return d;
}

}  // namespace

Decay decay_along(const Formation& formation, const evaporation::MassLoss& ml,
                  const evaporation::TrajectoryOptions& topt, const tunnelling::ActionTable& table,
                  const cosmology::Background& b, const DecayOptions& o, const higgs::StandardModelPotential* sm) {
  const evaporation::Trajectory tr(ml, formation.mass, topt);
  const auto gamma_h = [](double, const tunnelling::Rates& r) { return r.evaporation_rate; };
  return decay_with(formation, tr, gamma_h, Gate{}, ml, table, b, o, sm);
}

Decay decay_along_spinning(const Formation& formation, double hole_spin, const SpinningRates& rates,
                           const tunnelling::ActionTable& table, const cosmology::Background& b, const DecayOptions& o,
                           const higgs::StandardModelPotential* sm) {
  const evaporation::SpinningClock clock(*rates.kerr, *rates.schwarzschild, formation.mass, hole_spin,
                                         rates.trajectory);
  const auto gamma_h = [&](double m, const tunnelling::Rates&) { return clock.evaporation_rate(m); };
  const Gate gate{hole_spin <= rates.spin_limit ? formation.mass : clock.mass_at_spin(rates.spin_limit)};
  Decay d = decay_with(formation, clock, gamma_h, gate, *rates.schwarzschild, table, b, o, sm);
  d.gate_mass = gate.mass;
  if (d.crossover_mass) {
    d.spin_at_crossover = clock.spin_at(*d.crossover_mass);
    d.spinning_crossover = *d.spin_at_crossover > rates.spin_limit;
  }
  return d;
}

double lightcone_decays_per_beta(const Formation& f, double probability, double lightcone_radius) {
  if (!(probability > 0)) return 0.0;
  return comoving_number_per_beta(f) * probability * 4 * units::pi / 3 * std::pow(lightcone_radius, 3);
}

double lightcone_decays_per_beta(const Formation& f, const Decay& d) {
  return lightcone_decays_per_beta(f, d.probability, d.lightcone_radius);
}

double hubble_decays_per_beta(const Formation& f, const Decay& d, const cosmology::Background& b) {
  if (!(d.probability > 0)) return 0.0;
  const double a = b.scale_factor(d.decay_time), h = b.hubble_rate(a);
  return comoving_number_per_beta(f) / (a * a * a) * d.probability * 4 * units::pi / 3 / (h * h * h);
}

}  // namespace ember::population
