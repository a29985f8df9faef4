#include "ember/evaporation/spinning_clock.hpp"

#include <fmt/format.h>

#include <cmath>

namespace ember::evaporation {

SpinningClock::SpinningClock(const KerrMassLoss& kerr, const MassLoss& schwarzschild, double initial_mass,
                             double initial_spin, const TrajectoryOptions& options)
    : kerr_rates_(&kerr), rates_(&schwarzschild), kerr_(kerr, initial_mass, initial_spin, options, handover_spin) {
  if (kerr_.stopped()) {
    const double m = kerr_.cutoff_mass();
    rest_.emplace(schwarzschild, m, options);
    handover_slope_ = kerr.spin_ratio(m, kerr_.spin_at_cutoff()) - 2;
  }
}

std::optional<double> SpinningClock::handover_mass() const {
  return rest_ ? std::optional<double>(kerr_.cutoff_mass()) : std::nullopt;
}

double SpinningClock::lifetime() const {
  return rest_ ? kerr_.points().back().age + rest_->lifetime() : kerr_.lifetime();
}

double SpinningClock::time_left(double mass) const {
  if (!rest_) return kerr_.time_left(mass);
  if (mass <= rest_->initial_mass()) return rest_->time_left(mass);
  return rest_->lifetime() + (kerr_.points().back().age - kerr_.age_at(mass));
}

double SpinningClock::age_at(double mass) const {
  if (rest_ && mass <= rest_->initial_mass()) return kerr_.points().back().age + rest_->age_at(mass);
  return kerr_.age_at(mass);
}

double SpinningClock::mass_at_age(double age) const {
  if (!rest_) return kerr_.mass_at_age(age);
  const double handover = kerr_.points().back().age;
  return age < handover ? kerr_.mass_at_age(age) : rest_->mass_at_age(age - handover);
}

double SpinningClock::mass_at_time_left(double left) const {
  if (!rest_) return kerr_.mass_at_age(kerr_.lifetime() - left);
  if (left <= rest_->lifetime()) return rest_->mass_at_time_left(left);
  return kerr_.mass_at_age(kerr_.points().back().age - (left - rest_->lifetime()));
}

double SpinningClock::spin_at(double mass) const {
  if (rest_ && mass < rest_->initial_mass())
    return kerr_.spin_at_cutoff() * std::pow(mass / rest_->initial_mass(), handover_slope_);
  if (!rest_ && mass < kerr_.cutoff_mass()) return kerr_.spin_at_cutoff();
  return kerr_.spin_at(mass);
}

double SpinningClock::evaporation_rate(double mass) const {
  const double alpha =
      rest_ && mass <= rest_->initial_mass() ? rates_->alpha(mass) : kerr_rates_->alpha(mass, spin_at(mass));
  return alpha / (mass * mass * mass);
}

double spinning_mass_with_lifetime(const KerrMassLoss& kerr, const MassLoss& ml, double hole_spin, double lifetime,
                                   const TrajectoryOptions& options) {
  return mass_with_lifetime_of([&](double m) { return SpinningClock(kerr, ml, m, hole_spin, options).lifetime(); },
                               lifetime, fmt::format(" at a* = {}", hole_spin));
}

}  // namespace ember::evaporation
