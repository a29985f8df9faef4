// The stability verdict of the electroweak vacuum and its unseeded decay.
//
// Units: GeV.
//
// Unseeded decay (the prescription): the flat-space Fubini bounce of a negative quartic has
// action S = 8 pi^2 / (3 |q|) for any size R (Fubini 1976; Lipatov 1977). With the quartic taken
// at mu = 1/R, q(mu) = lambda(mu) + (2/3) lambda6 mu^2/Mbar^2 + (1/2) lambda8 mu^4/Mbar^4 (the MS-bar
// lambda, plus the Planck-suppressed operators at field ~ mu, an approximation while they are
// small), the probability that our past light cone has decayed is
//   p ~ max_mu (mu / H0)^4 e^{-S(mu)},  V_U ~ H0^-4,
// maximised over mu in [M_t, M_Pl] where q < 0 (as in Isidori, Ridolfi & Strumia, Nucl. Phys.
// B609 (2001) 387, and Buttazzo et al. 2013, sec. 7; from memory). Verdict: stable when
// V(h) >= 0 for all h up to mu_max; else metastable when p < 1 and unstable when p >= 1.
#pragma once

#include <optional>
#include <string>

#include "ember/higgs/potential.hpp"
#include "ember/units/constants.hpp"

namespace ember::higgs {

enum class Verdict { stable, metastable, unstable };
std::string name_of(Verdict v);

struct StabilityOptions {
  // Hubble rate today (GeV): H0 = 67.66 km/s/Mpc (Planck 2018 VI, A&A 641 (2020) A6, Table 2,
  // TT,TE,EE+lowE+lensing+BAO).
  double hubble_rate = 0.6766 * 1e5 / (1e6 * units::si::parsec) / units::second;
  // lambda_min and the bounce scale are searched up to this scale (GeV): the Planck mass,
  // 1.22e19 GeV, beyond which gravity cannot be left out.
  double scale_limit = units::planck_mass;
};

struct StabilityReport {
  std::optional<double> instability_scale;              // where lambda_eff first turns negative above M_t
  double lambda_min = 0, lambda_min_scale = 0;          // MS-bar lambda(mu), mu in [M_t, M_Pl]
  double lambda_eff_min = 0, lambda_eff_min_scale = 0;  // lambda_eff(h), h in [M_t, mu_max]
  Verdict verdict = Verdict::stable;
  // log10 of the expected number N of unseeded decays in the past light cone (N, not a
  // probability: it exceeds 1 when the vacuum would not have survived); none when no flat-space
  // bounce exists.
  std::optional<double> log10_expected_decays;
  double bounce_scale = 0;           // the mu = 1/R that maximises N
  bool bounce_at_scan_edge = false;  // the maximum sits at an end of the mu range: N is a lower bound
  std::string prescription;          // the decay prescription, in words
};

StabilityReport analyse_stability(const StandardModelPotential& potential, const StabilityOptions& options = {});

// The top mass at which lambda_min = 0 for the other inputs held fixed (Brent's method, GSL).
// Throws NumericalError if lambda_min does not change sign over M_t in [160, 185] GeV.
double critical_top_mass(const Inputs& inputs, const RunOptions& run = {}, const StabilityOptions& options = {});

}  // namespace ember::higgs
