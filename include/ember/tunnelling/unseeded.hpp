// The unseeded decay of the Standard Model vacuum with the Planck-suppressed operators evaluated
// on the bounce: what `ember higgs`, the `no_seed` prescription and `ember run`'s unseeded
// baseline report.
//
// Units: GeV; actions dimensionless.
//
// Design. The higgs module's Fubini family (higgs/stability.hpp) puts the operators
// lambda6 h^6/(6 Mbar^2) + lambda8 h^8/(8 Mbar^4) (Mbar the reduced Planck mass) on the bounce
// profile to first order, and says whether first order holds (|Delta S_ops|/S below
// StabilityOptions::operator_first_order_bound at the maximum). Where it holds, that is the
// answer. Beyond it, the O(4) bounce of the full potential is solved numerically
// (solve_flat_bounce), with the running quartic placed on the field as the Fubini family places
// it on the bounce size: the family takes lambda at mu = 1/R, and a Fubini bounce of size R has
// phi(0) = kappa/R with kappa = sqrt(8/|lambda|), so the full potential is
//   V(h) = lambda(mu = h/kappa) h^4/4 + lambda6 h^6/(6 Mbar^2) + lambda8 h^8/(8 Mbar^4),
// with kappa = sqrt(8/|lambda_min|) fixed, and the bounce scale mu_b = phi(0)/kappa; then
// N = (mu_b/H0)^4 e^{-S}. Without operators the numerical bounce reproduces the family's action
// to 0.1% (tests/test_tunnelling.cpp); it also feels lambda's running across the profile, which
// the family leaves out (docs/methods.md says how much that matters once the operators move the
// bounce away from lambda_min).
#pragma once

#include <memory>

#include "ember/core/uniform_cubic.hpp"
#include "ember/higgs/stability.hpp"
#include "ember/tunnelling/flat_bounce.hpp"

namespace ember::tunnelling {

// V(h) = lambda(mu = h/kappa) h^4/4 + the operators, with the MS-bar lambda of the potential's
// running (held at its end values outside the running's range, as Running does) through a
// natural cubic in ln mu on the running's node spacing.
class FubiniScalePotential final : public higgs::Potential {
 public:
  FubiniScalePotential(const higgs::StandardModelPotential& sm, double kappa);
  double value(double h) const override { return value_slope(h).value; }
  double slope(double h) const override { return value_slope(h).slope; }
  double curvature(double h) const override;
  higgs::ValueSlope value_slope(double h) const override;
  double field_max() const override { return field_max_; }
  std::string description() const override;
  std::string identity() const override;
  double kappa() const { return kappa_; }

 private:
  std::string base_description_, base_identity_;
  double kappa_, ln_kappa_, lambda6_, lambda8_, field_max_;
  std::shared_ptr<const UniformCubic> lambda_;  // against ln mu
  UniformCubic::Point lambda_at(double h) const;
};

struct UnseededBounce {
  FlatBounce bounce;
  double kappa = 0;
  double scale = 0;  // mu_b = phi(0)/kappa
};

// The numerical bounce of FubiniScalePotential(sm, kappa). Throws InputError when that potential
// has no barrier into a region below the false vacuum, NumericalError from the shooting.
UnseededBounce solve_unseeded_bounce(const higgs::StandardModelPotential& sm, double kappa);

// higgs::analyse_stability, with the unseeded estimate replaced by the numerical bounce where the
// operators' first order does not hold (the design above). The verdict follows the estimate used.
higgs::StabilityReport analyse_unseeded(const higgs::StandardModelPotential& sm,
                                        const higgs::StabilityOptions& options = {});

}  // namespace ember::tunnelling
