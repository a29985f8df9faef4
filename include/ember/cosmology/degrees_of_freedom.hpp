// Effective relativistic degrees of freedom of the Standard Model plasma: g_rho(T) for the energy
// density and g_s(T) for the entropy, from a published tabulation (data/relativistic_dof.tsv,
// which names its source), interpolated in ln T by GSL cubic splines.
// Units: T in GeV.
//
// Below the table the values go over to the present-day photon-and-neutrino plasma set by N_eff
// (background.hpp); above it they stay at the table's last values (the full Standard Model).
#pragma once

#include <filesystem>
#include <memory>
#include <string>

namespace ember::cosmology {

class DegreesOfFreedom {
 public:
  // Throws InputError naming the file and line for a malformed table.
  static DegreesOfFreedom load(const std::filesystem::path& file);
  static DegreesOfFreedom load_default();  // data/relativistic_dof.tsv

  double g_rho(double temperature) const;
  double g_s(double temperature) const;
  const std::string& source() const { return source_; }
  // The low-temperature values, set by the background from N_eff.
  void set_low_temperature_limit(double g_rho0, double g_s0);

  struct Splines;

 private:
  double t_min_ = 0, t_max_ = 0, low_rho_ = 0, low_s_ = 0, high_rho_ = 0, high_s_ = 0;
  std::string source_;
  std::shared_ptr<const Splines> s_;
};

}  // namespace ember::cosmology
