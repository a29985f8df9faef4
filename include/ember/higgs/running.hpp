// The running MS-bar couplings from mu = M_t upward, and the field's anomalous-dimension
// integral Gamma(mu) = int_{M_t}^{mu} gamma d ln mu.
//
// Units: mu in GeV. Method: Boost.Odeint Dormand-Prince 5(4) with dense output in t = ln mu,
// sampled at evenly spaced nodes in t and interpolated by natural cubic splines (GSL). The
// interpolation error is measured at every interval midpoint against the dense output and
// stated in the summary.
#pragma once

#include <memory>
#include <string>

#include "ember/higgs/beta.hpp"
#include "ember/higgs/inputs.hpp"

namespace ember::higgs {

struct RunOptions {
  // Run up to this scale (GeV); above the Planck mass, so Planck-scale fields are covered.
  double mu_max = 1e21;
  // Step control: accept a step when each coupling's error is below this (relative and absolute).
  double relative_tolerance = 1e-10;
  // Spline nodes this far apart in ln mu.
  double node_spacing = 0.05;

  void validate() const;  // throws InputError naming the field and the rule
};

struct RunSummary {
  long steps = 0;
  long rhs_evaluations = 0;
  double max_midpoint_error = 0;  // largest |spline - dense output| of lambda at the midpoints
  std::string message;
};

class Running {
 public:
  Running(const Inputs& inputs, const RunOptions& options = {});

  // Couplings at mu; below M_t they are held at their M_t values, above mu_max an InputError.
  Couplings couplings(double mu) const;
  double lambda(double mu) const;
  double gamma_integral(double mu) const;  // Gamma(mu)

  double mu_min() const { return inputs_.top_mass; }
  double mu_max() const { return options_.mu_max; }
  const Inputs& inputs() const { return inputs_; }
  const RunOptions& options() const { return options_; }
  const RunSummary& summary() const { return summary_; }

  struct Splines;

 private:
  Inputs inputs_;
  RunOptions options_;
  std::shared_ptr<const Splines> splines_;
  RunSummary summary_;
  double t_of(double mu) const;
};

}  // namespace ember::higgs
