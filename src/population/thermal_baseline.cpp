#include "ember/population/thermal_baseline.hpp"

#include <fmt/format.h>

#include <cmath>
#include <vector>

#include "ember/core/errors.hpp"
#include "ember/population/plasma.hpp"
#include "ember/tunnelling/flat_bounce.hpp"
#include "ember/tunnelling/thermal_potential.hpp"
#include "ember/units/constants.hpp"

namespace ember::population {

void ThermalBaselineOptions::validate() const {
  if (points_per_decade < 2 || points_per_decade > 1000)
    throw InputError(fmt::format("thermal baseline: points_per_decade = {}: must lie in [2, 1000]", points_per_decade));
  if (!(lowest_temperature > 0))
    throw InputError(fmt::format("thermal baseline: lowest_temperature = {} GeV: must be > 0", lowest_temperature));
}

namespace {

// ln of (Gamma/V) (4 pi/3) (a chi)^3 t at plasma temperature T: the integrand per ln t. None
// where the thermal mass leaves no bubble.
std::optional<double> log_integrand(const higgs::StandardModelPotential& sm, const cosmology::Background& b,
                                    double temperature, double& time) {
  const double a = b.scale_factor_at_temperature(temperature);
  time = b.time(a);
  const tunnelling::ThermalPotential hot(sm, tunnelling::thermal_mass_squared(sm, temperature));
  tunnelling::FlatBounceOptions o;
  o.dimensions = 3;
  tunnelling::FlatBounce bounce;
  try {
    bounce = tunnelling::solve_flat_bounce(hot, o);
  } catch (const InputError&) {
    return std::nullopt;  // the thermal mass lifts the potential everywhere: no bubble
  }
  const double s3 = bounce.action.value / temperature;
  const double radius = a * b.lightcone_radius(time);
  return 4 * std::log(temperature) + 1.5 * std::log(s3 / (2 * units::pi)) - s3 +
         std::log(4 * units::pi / 3 * radius * radius * radius * time);
}

}  // namespace

ThermalBaseline thermal_baseline(const higgs::StandardModelPotential& sm, const cosmology::Background& b,
                                 double earliest, const ThermalBaselineOptions& o) {
  o.validate();
  ThermalBaseline out;
  out.highest_temperature = plasma_temperature(b, earliest);
  const double lowest = std::min(o.lowest_temperature, out.highest_temperature);
  out.lowest_temperature = lowest;
  const int n =
      std::max(2, static_cast<int>(std::ceil(std::log10(out.highest_temperature / lowest) * o.points_per_decade)) + 1);
  std::vector<double> log_f(static_cast<std::size_t>(n), -INFINITY), ln_t(static_cast<std::size_t>(n));
  double largest = -INFINITY;
  for (int i = 0; i < n; ++i) {
    const double temperature =
        out.highest_temperature * std::pow(lowest / out.highest_temperature, double(i) / (n - 1));
    double time = 0;
    const auto I = static_cast<std::size_t>(i);
    if (const auto f = log_integrand(sm, b, temperature, time)) {
      log_f[I] = *f;
      ++out.bubbles;
      if (*f > largest) {
        largest = *f;
        out.peak_temperature = temperature;
      }
    }
    ln_t[I] = std::log(time);
    // Colder plasma only decays less (S3/T grows as T falls): once the integrand is 1e-100 of its
    // largest value the rest of the way adds nothing a double can hold.
    if (log_f[I] < largest - 100 * std::log(10.0)) {
      log_f.resize(I + 1);
      ln_t.resize(I + 1);
      out.lowest_temperature = temperature;
      break;
    }
  }
  if (out.bubbles == 0) {
    out.note = "no thermal bubble between these temperatures: the thermal mass lifts the potential everywhere";
    return out;
  }
  // Trapezoid in ln t, each term scaled by e^-largest so the sum stays in range.
  double sum = 0;
  for (std::size_t i = 0; i + 1 < log_f.size(); ++i)
    sum += 0.5 * (std::exp(log_f[i] - largest) + std::exp(log_f[i + 1] - largest)) * (ln_t[i + 1] - ln_t[i]);
  out.log10_expected_decays = (largest + std::log(sum)) / std::log(10.0);
  out.note = fmt::format(
      "flat-space O(3) thermal decay of the plasma, T = {:.3g} GeV down to {:.3g} GeV ({} of {} temperatures with a "
      "bubble; largest rate at {:.3g} GeV)",
      out.highest_temperature, out.lowest_temperature, out.bubbles, log_f.size(), out.peak_temperature);
  return out;
}

}  // namespace ember::population
