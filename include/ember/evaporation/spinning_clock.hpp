// The clock of a hole born spinning: its mass against time under the Kerr rates, for the decay
// hazard of a spinning population (population/decay.hpp).
//
// Units: internal natural units (GeV for masses, GeV^-1 for times).
//
// From (M_0, a*_0) the Kerr trajectory (kerr_trajectory.hpp) runs until a* has fallen to
// handover_spin; from that mass on the hole is a Schwarzschild hole to well within the
// trajectory's tolerance, since the rates are even in a* (f(M, a*) - f(M, 0) = O(a*^2); Page, PRD 14
// (1976) 3260), and the Schwarzschild Trajectory takes over, whose time left stays accurate to the
// last instant. A hole that keeps spin above handover_spin to the cutoff is Kerr throughout.
#pragma once

#include <optional>

#include "ember/evaporation/kerr_trajectory.hpp"
#include "ember/evaporation/trajectory.hpp"

namespace ember::evaporation {

class SpinningClock {
 public:
  // a*^2 at the handover is 1e-8 of order-one coefficients: far below the Kerr table's 2e-4.
  static constexpr double handover_spin = 1e-4;

  SpinningClock(const KerrMassLoss& kerr, const MassLoss& schwarzschild, double initial_mass, double initial_spin,
                const TrajectoryOptions& options = {});

  double initial_mass() const { return kerr_.initial_mass(); }
  double initial_spin() const { return kerr_.initial_spin(); }
  double lifetime() const;               // GeV^-1
  double time_left(double mass) const;   // GeV^-1 until the hole is gone
  double age_at(double mass) const;      // GeV^-1 since formation
  double mass_at_age(double age) const;  // 0 once the hole has evaporated
  double mass_at_time_left(double left) const;
  // a* at a mass; below the handover a bound, the handover spin scaled by (M / M_h)^(q - 2)
  // with Page's q at the handover (the spin keeps falling there).
  double spin_at(double mass) const;
  // The largest mass at which a* has fallen to `spin` (spin above the handover spin).
  double mass_at_spin(double spin) const { return kerr_.mass_at_spin(spin); }
  // Gamma_H = |dM/dt| / M = alpha(M, a*) / M^3 (GeV), with a* along this trajectory.
  double evaporation_rate(double mass) const;
  std::optional<double> handover_mass() const;  // none: Kerr to the cutoff

 private:
  const KerrMassLoss* kerr_rates_;
  const MassLoss* rates_;
  KerrTrajectory kerr_;
  std::optional<Trajectory> rest_;  // from the handover mass down
  double handover_slope_ = 0;       // q - 2 at the handover
};

// The initial mass of a hole born at a* = hole_spin whose lifetime on this clock is `lifetime`
// (GeV^-1), as mass_with_lifetime (trajectory.hpp) on this clock.
double spinning_mass_with_lifetime(const KerrMassLoss& kerr, const MassLoss& schwarzschild, double hole_spin,
                                   double lifetime, const TrajectoryOptions& options = {});

}  // namespace ember::evaporation
