// A flat Lambda-CDM background with radiation, from the end of inflation to today.
//
// Units: internal natural units: times and comoving lengths in GeV^-1 (a = 1 today), temperatures
// and H in GeV, densities in GeV^4.
//
//   H^2 = (8 pi G / 3) [rho_r(T(a)) + rho_m0 a^-3 + rho_L],   rho_r = (pi^2/30) g_rho(T) T^4,
//   with T(a) from entropy conservation, g_s(T) T^3 a^3 = g_s0 T0^3.
//   t(a) = int_0^a da'/(a' H), chi(a) = int_a^1 da'/(a'^2 H) (comoving distance light travels
//   from a to today, c = 1), the horizon mass M_H = (4 pi/3) rho (1/H)^3 = 1/(2 G H).
// Radiation today: photons and N_eff neutrinos, g_rho0 = 2 + (7/4) N_eff (4/11)^(4/3) and
// g_s0 = 2 + (7/4) N_eff (4/11) (the standard instantaneous-decoupling values).
// The tables are built once on a grid in ln a and interpolated (GSL cubic splines).
#pragma once

#include <memory>

#include "ember/cosmology/degrees_of_freedom.hpp"

namespace ember::cosmology {

struct Parameters {
  double hubble = 0.6766;         // h
  double omega_b_h2 = 0.02242;    // Omega_b h^2
  double omega_cdm_h2 = 0.11933;  // Omega_c h^2
  double cmb_temperature = 0;     // GeV (default: 2.7255 K)
  double n_eff = 3.046;

  void validate() const;
};
Parameters planck2018();  // data/cosmology.yaml, compiled in

class Background {
 public:
  Background(const Parameters& parameters, DegreesOfFreedom dof);

  double hubble_rate(double a) const;      // GeV
  double temperature(double a) const;      // photon temperature, GeV
  double time(double a) const;             // since the big bang, GeV^-1
  double scale_factor(double time) const;  // inverse of time(a)
  double scale_factor_at_temperature(double temperature) const;
  double lightcone_radius(double time) const;          // chi(t), comoving, GeV^-1
  double particle_horizon() const;                     // chi(0)
  double age() const;                                  // t(a = 1)
  double horizon_mass(double time) const;              // GeV
  double radiation_density(double temperature) const;  // GeV^4
  double critical_density() const;                     // today, GeV^4
  double omega_cdm() const;
  const Parameters& parameters() const { return p_; }
  const DegreesOfFreedom& dof() const { return dof_; }

  struct Tables;

 private:
  Parameters p_;
  DegreesOfFreedom dof_;
  double g_rho0_, g_s0_, rho_m0_, rho_l_, rho_crit_;
  std::shared_ptr<const Tables> t_;
  double hubble_from(double a, double temperature) const;
};

}  // namespace ember::cosmology
