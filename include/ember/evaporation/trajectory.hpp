// A hole's mass-loss trajectory M(t), from an initial mass down to a cutoff mass, with the last
// stage below the cutoff added analytically.
//
// Units: internal natural units (GeV for masses and temperatures, GeV^-1 for times).
//
// Method: with u = ln M, the time still to go obeys d tau/du = M^3 / alpha(M). Its logarithm
// w = ln tau (d w/du = e^{3u - w} / alpha) is nearly linear in u, so Boost.Odeint's
// Dormand-Prince 5(4) with dense output integrates it in a few hundred steps over any range of
// mass. The integration runs upward from the cutoff, where tau is known analytically, so the time
// left is accurate to the tolerance everywhere, even in the last instants; the age (time since
// formation) is lifetime - tau. Below the cutoff alpha is held at alpha(M_cut): the analytic tail
// tau = M^3 / (3 alpha(M_cut)), flagged in every result.
#pragma once

#include <functional>
#include <string>
#include <vector>

#include "ember/evaporation/mass_loss.hpp"
#include "ember/units/constants.hpp"

namespace ember::evaporation {

struct TrajectoryOptions {
  // Where numerical integration stops and the analytic tail takes over (GeV); well above the
  // Planck mass by default: 1e3 M_Pl.
  double cutoff_mass = 1e3 * units::planck_mass;
  // Step control: accept a step when its error in ln tau is below this.
  double relative_tolerance = tolerance::trajectory_relative;

  void validate() const;  // throws InputError naming the field and the rule
};

struct TrajectorySummary {
  long steps = 0;
  long rhs_evaluations = 0;
  std::string message;
};

struct DecadeTime {
  double mass_low, mass_high;  // GeV: one decade of mass, [10^k g, 10^(k+1) g)
  double time;                 // GeV^-1 spent there
};

class Trajectory {
 public:
  Trajectory(const MassLoss& mass_loss, double initial_mass, const TrajectoryOptions& options = {});

  double initial_mass() const { return initial_mass_; }
  double cutoff_mass() const { return cutoff_; }
  double lifetime() const { return time_left(initial_mass_); }  // GeV^-1
  // The tail below the cutoff is analytic (constant alpha); true whenever the hole gets there.
  bool analytic_tail() const { return true; }
  double tail_duration() const { return tail_; }  // GeV^-1

  double time_left(double mass) const;  // GeV^-1 until the hole is gone, at mass <= initial
  double age_at(double mass) const { return lifetime() - time_left(mass); }
  // The mass at an age since formation; 0 once the hole has evaporated.
  double mass_at_age(double age) const { return mass_at_time_left(lifetime() - age); }
  // The mass when `left` (GeV^-1) remains; no subtraction, so exact to the end.
  double mass_at_time_left(double left) const;

  std::vector<DecadeTime> decade_times() const;
  const TrajectorySummary& summary() const { return summary_; }

 private:
  double initial_mass_, cutoff_, alpha_cut_, tail_;
  std::vector<double> u_, w_, dw_;  // nodes of ln M, ln tau, d ln tau / d ln M
  TrajectorySummary summary_;
  double w_at(double u) const;  // cubic Hermite between nodes
};

// The initial mass whose lifetime is `lifetime` (GeV^-1), by Brent's method (GSL) on ln M.
// Throws NumericalError if it does not converge, InputError if no mass in [1e-5, 1e40] g has it.
double mass_with_lifetime(const MassLoss& mass_loss, double lifetime, const TrajectoryOptions& options = {});

// The same root for any clock: `lifetime_of` maps an initial mass (GeV) to its lifetime (GeV^-1);
// `hole` is said in the errors after the lifetime (" at a* = 0.9", or empty).
double mass_with_lifetime_of(const std::function<double(double)>& lifetime_of, double lifetime,
                             const std::string& hole);

}  // namespace ember::evaporation
