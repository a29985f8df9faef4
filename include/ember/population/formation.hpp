// Where and when a primordial black hole of a given mass forms, and the conversions between the
// ways its abundance is quoted.
//
// Units: internal natural units (GeV, GeV^-1); a = 1 today.
//
// A hole of mass M forms when the horizon mass is M/gamma: M = gamma M_H(t_f), M_H = 1/(2 G H)
// (in the radiation era M_H = t/G, so t_f = G M/gamma; Carr 1975). With beta the energy fraction
// in holes at formation, their comoving number density is n a^3 = beta rho(t_f) a_f^3 / M (holes
// are neither made nor destroyed afterwards), and
//   f_PBH  = n a^3 M / (Omega_c rho_crit0)                (had they not evaporated)
//   N_lc   = n a^3 (4 pi/3) chi(t_f)^3                    (formed inside our past light cone)
//   N_H    = n_f (4 pi/3) H_f^-3 = beta M_H / M = beta/gamma   (per horizon volume, derived)
#pragma once

#include "ember/cosmology/background.hpp"

namespace ember::population {

struct Formation {
  double mass = 0;  // GeV
  double time = 0;  // GeV^-1
  double scale_factor = 0;
  double temperature = 0;    // GeV
  double total_density = 0;  // rho(t_f) = 3 H^2 / (8 pi G), GeV^4
};

// Throws InputError when the mass would form before the tabulated background (T > 1e19 GeV) or
// after today.
Formation formation_of(double mass, double collapse_fraction, const cosmology::Background& background);

// The formation masses formation_of accepts (GeV): gamma M_H at T = 1e19 GeV, and gamma M_H today.
struct MassRange {
  double low = 0, high = 0;
};
MassRange formable_masses(double collapse_fraction, const cosmology::Background& background);

double comoving_number_per_beta(const Formation& f);  // n a^3 / beta, GeV^3
double f_pbh_per_beta(const Formation& f, const cosmology::Background& b);
double lightcone_count_per_beta(const Formation& f, const cosmology::Background& b);
double per_horizon_per_beta(const Formation& f, const cosmology::Background& b);  // = 1/gamma

}  // namespace ember::population
