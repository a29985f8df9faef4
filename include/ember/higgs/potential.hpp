// Potentials for the tunnelling codes: the RG-improved Standard Model Higgs potential at large
// field, and users' own (a polynomial or a table) for models beyond it.
//
// Units: field h in GeV, V in GeV^4, V' in GeV^3, V'' in GeV^2. The false vacuum is at h ~ 0 with
// V = 0 there (the electroweak scale is negligible at the fields that matter).
#pragma once

#include <filesystem>
#include <memory>
#include <string>
#include <vector>

#include "ember/higgs/running.hpp"

namespace ember::higgs {

// V and dV/dh at one field, for the shooting codes' right-hand sides.
struct ValueSlope {
  double value = 0, slope = 0;
};

class Potential {
 public:
  virtual ~Potential() = default;
  virtual double value(double h) const = 0;
  virtual double slope(double h) const = 0;      // dV/dh
  virtual double curvature(double h) const = 0;  // d^2V/dh^2
  // Both at once; potentials that share work between the two override it (the same numbers).
  virtual ValueSlope value_slope(double h) const { return {value(h), slope(h)}; }
  virtual double field_max() const = 0;  // the largest field where V is defined
  virtual std::string description() const = 0;
  // Every parameter the potential depends on, exactly (hex floats, file fingerprints): equal
  // identities mean equal potentials. Used to key cached tables.
  virtual std::string identity() const = 0;
  // 4 V / h^4: the quartic a pure h^4 potential would need to match V at h.
  double quartic(double h) const;
};

struct StandardModelOptions {
  // Add the one-loop Coleman-Weinberg terms of the top, W and Z (Landau gauge, MS-bar).
  bool coleman_weinberg = false;
  // Planck-suppressed operators lambda6 h^6/(6 Mbar^2) + lambda8 h^8/(8 Mbar^4), Mbar the reduced
  // Planck mass (common practice in the vacuum-stability literature).
  double lambda6 = 0, lambda8 = 0;
};

// V(h) = lambda_eff(h) h^4/4 + lambda6 h^6/(6 Mbar^2) + lambda8 h^8/(8 Mbar^4), with
//   lambda_eff(h) = e^{4 Gamma(h)} [lambda(mu = h) + CW(h)]
// (RG-improved tree level; e.g. Buttazzo et al., JHEP 12 (2013) 089, sec. 6, from memory), and,
// when asked for, CW = (1/16pi^2) sum_p n_p k_p^2 (ln k_p + 2 Gamma - C_p) with k_t = yt^2/2
// (n = -12, C = 3/2), k_W = g2^2/4 (n = 6, C = 5/6), k_Z = (g2^2 + gY^2)/4 (n = 3, C = 5/6);
// the Higgs and Goldstone terms are left out. lambda_eff is a natural cubic spline in t = ln h on
// evenly spaced nodes (UniformCubic), so a lookup is one index computation, with no search.
class StandardModelPotential final : public Potential {
 public:
  StandardModelPotential(std::shared_ptr<const Running> running, const StandardModelOptions& options = {});

  double lambda_eff(double h) const;  // without the Planck-suppressed operators
  double value(double h) const override;
  double slope(double h) const override;
  double curvature(double h) const override;
  ValueSlope value_slope(double h) const override;
  double field_max() const override { return running_->mu_max(); }
  std::string description() const override;
  std::string identity() const override;

  const Running& running() const { return *running_; }
  const StandardModelOptions& options() const { return options_; }
  double interpolation_error() const { return interpolation_error_; }  // absolute, on lambda_eff
  // lambda_eff evaluated from the running couplings, without the spline (slow; for checks).
  double lambda_eff_direct(double h) const;

  struct Table;

 private:
  std::shared_ptr<const Running> running_;
  StandardModelOptions options_;
  std::shared_ptr<const Table> table_;
  double interpolation_error_ = 0;
};

// V = scale^4 sum_n a_n (phi/scale)^n.
class PolynomialPotential final : public Potential {
 public:
  PolynomialPotential(double scale, std::vector<double> coefficients);
  double value(double h) const override;
  double slope(double h) const override;
  double curvature(double h) const override;
  double field_max() const override { return 1e6 * scale_; }
  std::string description() const override;
  std::string identity() const override;

 private:
  double scale_;
  std::vector<double> a_;
};

// V(phi) from a two-column text file (phi in GeV, V in GeV^4), natural cubic spline; lines
// starting with # are comments. Errors name the file and line.
class TabulatedPotential final : public Potential {
 public:
  explicit TabulatedPotential(const std::filesystem::path& file);
  double value(double h) const override;
  double slope(double h) const override;
  double curvature(double h) const override;
  double field_max() const override { return phi_max_; }
  std::string description() const override;
  std::string identity() const override;

  struct Spline;

 private:
  std::string file_, content_fingerprint_;
  double phi_min_ = 0, phi_max_ = 0;
  std::shared_ptr<const Spline> spline_;
  double checked(double h) const;
};

}  // namespace ember::higgs
