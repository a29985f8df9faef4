// A rotating hole's evaporation: mass and spin together, from (M_0, a*_0) down to the cutoff mass.
//
// Units: internal natural units (GeV for masses, GeV^-1 for times).
//
// Method: with u = ln M and the rates of kerr_mass_loss.hpp,
//   d ln a* / du = q(M, a*) - 2,   dt / du = -M^3 / alpha(M, a*)
// (from dM/dt = -alpha / M^2 and J = a* G M^2 / c; Page, PRD 14 (1976) 3260, with q = g / f),
// integrated downward in u by Boost.Odeint's Dormand-Prince 5(4), with the state recorded at
// `nodes_per_e_fold` points per e-fold of mass. Below the cutoff the tail is analytic with alpha
// held at its cutoff value, as trajectory.hpp; the spin left there is reported.
// A hole that starts at a* = 0 stays there: use the Schwarzschild Trajectory (the commands do).
#pragma once

#include <string>
#include <vector>

#include "ember/evaporation/kerr_mass_loss.hpp"
#include "ember/evaporation/trajectory.hpp"

namespace ember::evaporation {

struct KerrTrajectoryPoint {
  double mass;           // GeV
  double hole_spin;      // a*
  double age;            // GeV^-1 since the start
  double age_rate;       // -d age / d ln M = M^3 / alpha (GeV^-1)
  double spin_exponent;  // d ln a* / d ln M = q - 2
};

class KerrTrajectory {
 public:
  // With stop_spin > 0 the integration ends at the first recorded point where a* <= stop_spin
  // (stopped() is then true, and the last point is there); the tail below is the analytic one
  // from that point, as from the cutoff.
  KerrTrajectory(const KerrMassLoss& mass_loss, double initial_mass, double initial_spin,
                 const TrajectoryOptions& options = {}, double stop_spin = 0);

  double initial_mass() const { return points_.front().mass; }
  double initial_spin() const { return points_.front().hole_spin; }
  double cutoff_mass() const { return points_.back().mass; }  // where the integration ended
  bool stopped() const { return stopped_; }
  double spin_at_cutoff() const { return points_.back().hole_spin; }
  double tail_duration() const { return tail_; }
  double lifetime() const { return points_.back().age + tail_; }  // GeV^-1

  // a* and the age at a mass between the cutoff and the initial mass: cubic Hermite in ln M
  // between the recorded points (1/nodes_per_e_fold apart), from the rates at each.
  double spin_at(double mass) const;
  double age_at(double mass) const;
  // The mass at an age since the start; in the tail, M^3 = 3 alpha_cut (lifetime - age); 0 once
  // the hole has evaporated.
  double mass_at_age(double age) const;
  // Time to the end: lifetime - age above the last point, the tail's own M^3 / (3 alpha) below.
  double time_left(double mass) const;
  // The largest mass at which a* has fallen to `spin` (0 when it never does above the cutoff).
  double mass_at_spin(double spin) const;

  const std::vector<KerrTrajectoryPoint>& points() const { return points_; }
  const std::string& message() const { return message_; }

  static constexpr int nodes_per_e_fold = 20;

 private:
  std::vector<KerrTrajectoryPoint> points_;
  double tail_ = 0, alpha_cut_ = 0;
  bool stopped_ = false;
  std::string message_;
  std::size_t bracket(double mass) const;
};

}  // namespace ember::evaporation
