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

}  // namespace

Decay decay_along(const Formation& formation, const evaporation::MassLoss& ml,
                  const evaporation::TrajectoryOptions& topt, const tunnelling::ActionTable& table,
                  const cosmology::Background& b, const DecayOptions& o) {
  Decay d;
  const evaporation::Trajectory tr(ml, formation.mass, topt);
  const double available = b.age() - formation.time;  // time from formation to today
  // The hazard runs down to the semiclassical floor: the trajectory's cutoff_mass only decides
  // where its integration hands over to the analytic tail, never where the hazard stops.
  const double floor = table.floor();
  d.evaporated = tr.lifetime() <= available;
  d.lifetime = tr.lifetime();
  d.end_mass = d.evaporated ? floor : std::max(floor, tr.mass_at_age(available));
  // Gamma_D / Gamma_H as a function of ln M (the hazard per unit ln M).
  const auto ratio = [&](double u) {
    const double m = std::exp(u);
    const tunnelling::Rates r = tunnelling::rates_at(table.at(m), ml, o.prefactor);
    return r.evaporation_rate > 0 ? r.decay_rate / r.evaporation_rate : 0.0;
  };
  const double u_lo = std::log(d.end_mass), u_hi = std::log(formation.mass);
  if (!(u_hi > u_lo)) {  // formed below the floor: outside the semiclassical regime
    d.formed_below_floor = true;
    return d;
  }
  d.hazard = qag(ratio, u_lo, u_hi, o.relative_tolerance, "decay hazard quadrature (GSL qag, ln M)");
  d.probability = -std::expm1(-d.hazard);

  // The same hazard in time: int Gamma_D dt = int Gamma_D(M(tau)) tau d ln tau, tau the time left.
  const auto in_time = [&](double s) {
    const double tau = std::exp(s), m = tr.mass_at_time_left(tau);
    return tunnelling::rates_at(table.at(m), ml, o.prefactor).decay_rate * tau;
  };
  d.hazard_in_time = qag(in_time, std::log(tr.time_left(d.end_mass)), std::log(tr.time_left(formation.mass)),
                         o.relative_tolerance, "decay hazard quadrature (GSL qag, ln time left)");

  // Crossover and the decay time on a grid from the formation mass down.
  const int n = o.grid_points;
  double cumulative = 0, weight_sum = 0, weighted_time = 0, previous = ratio(u_hi);
  if (previous >= 1) {  // decay outruns evaporation from the start
    d.crossover_mass = formation.mass;
    d.branching_at_crossover = previous / (1 + previous);
  }
  for (int i = 1; i <= n; ++i) {
    const double u = u_hi + (u_lo - u_hi) * i / n, du = (u_hi - u_lo) / n;
    const double r = ratio(u);
    if (!d.crossover_mass && r >= 1 && previous < 1) {
      double a = u - (u_lo - u_hi) / n, c = u;  // bracket [c, a] in ln M
      for (int k = 0; k < 60; ++k) {
        const double mid = 0.5 * (a + c);
        (ratio(mid) >= 1 ? c : a) = mid;
      }
      d.crossover_mass = std::exp(c);
      const double rc = ratio(c);
      d.branching_at_crossover = rc / (1 + rc);
    }
    const double dh = 0.5 * (r + previous) * du;
    const double w = std::exp(-cumulative) * -std::expm1(-dh);  // probability of decaying in this step
    cumulative += dh;
    const double m = std::exp(u);
    weighted_time += w * (formation.time + tr.age_at(m));
    weight_sum += w;
    previous = r;
  }
  if (weight_sum > 0) {
    d.decay_time = std::min(weighted_time / weight_sum, b.age());
    d.lightcone_radius = b.lightcone_radius(d.decay_time);
  }
  // Below the floor the semiclassical rate is not trusted: say when it would have mattered.
  if (d.evaporated && d.probability < 0.5) d.decays_below_floor = ratio(std::log(floor)) > 1;
  return d;
}

double lightcone_decays_per_beta(const Formation& f, const Decay& d) {
  if (!(d.probability > 0)) return 0.0;
  return comoving_number_per_beta(f) * d.probability * 4 * units::pi / 3 * std::pow(d.lightcone_radius, 3);
}

double hubble_decays_per_beta(const Formation& f, const Decay& d, const cosmology::Background& b) {
  if (!(d.probability > 0)) return 0.0;
  const double a = b.scale_factor(d.decay_time), h = b.hubble_rate(a);
  return comoving_number_per_beta(f) / (a * a * a) * d.probability * 4 * units::pi / 3 / (h * h * h);
}

}  // namespace ember::population
