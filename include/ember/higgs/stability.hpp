// The stability verdict of the electroweak vacuum and its unseeded decay.
//
// Units: GeV.
//
// Unseeded decay (the prescription): the flat-space Fubini bounce of a negative quartic has
// action S = 8 pi^2 / (3 |lambda|) for any size R (Fubini 1976; Lipatov 1977). With the MS-bar
// quartic taken at mu = 1/R, and the Planck-suppressed operators integrated over the bounce
// profile (which reaches h = sqrt(8/|lambda|) mu, about 28 mu, at its centre) to first order,
//   S(mu) = 8 pi^2 / (3 |lambda(mu)|) + Delta S_ops(mu)   (fubini.hpp: operator_action),
// the expected number of decays in our past light cone is
//   N ~ max_mu (mu / H0)^4 e^{-S(mu)},  V_U ~ H0^-4,
// maximised over mu in [M_t, M_Pl] where lambda < 0 (as in Isidori, Ridolfi & Strumia, Nucl. Phys.
// B609 (2001) 387, and Buttazzo et al. 2013, sec. 7; from memory). First order holds while
// |Delta S_ops| / (8 pi^2/(3|lambda|)) <= StabilityOptions::operator_first_order_bound at the
// maximum; beyond it the report says so, and tunnelling/unseeded.hpp solves the bounce of the
// full potential numerically (this module cannot: the solver lives downstream, in tunnelling).
// Verdict: stable when V(h) >= 0 for all h up to mu_max; else metastable when N < 1 and unstable
// when N >= 1.
#pragma once

#include <optional>
#include <string>

#include "ember/higgs/potential.hpp"
#include "ember/units/constants.hpp"

namespace ember::higgs {

enum class Verdict { stable, metastable, unstable };
std::string name_of(Verdict v);

// How the unseeded bounce action was obtained.
enum class UnseededMethod {
  fubini_first_order,  // the Fubini family, operators on its profile to first order (this module)
  numerical_bounce,    // the O(4) bounce of the full potential, solved numerically (tunnelling)
};
std::string name_of(UnseededMethod m);

struct StabilityOptions {
  // Hubble rate today (GeV): H0 = 67.66 km/s/Mpc (Planck 2018 VI, A&A 641 (2020) A6, Table 2,
  // TT,TE,EE+lowE+lensing+BAO).
  double hubble_rate = 0.6766 * 1e5 / (1e6 * units::si::parsec) / units::second;
  // lambda_min and the bounce scale are searched up to this scale (GeV): the Planck mass,
  // 1.22e19 GeV, beyond which gravity cannot be left out.
  double scale_limit = units::planck_mass;
  // The operators' first-order action is trusted while |Delta S_ops| / S_Fubini stays below this
  // at the maximum. Measured (tests/test_tunnelling.cpp, numerical bounces with both operators):
  // the first-order Delta S is off by 0.65 (Delta S/S) Delta S, so at the bound the operator
  // share is good to 1.3% and S, for S ~ 2500, to about 0.7.
  double operator_first_order_bound = 0.02;
};

struct StabilityReport {
  std::optional<double> instability_scale;              // where lambda_eff first turns negative above M_t
  double lambda_min = 0, lambda_min_scale = 0;          // MS-bar lambda(mu), mu in [M_t, M_Pl]
  double lambda_eff_min = 0, lambda_eff_min_scale = 0;  // lambda_eff(h), h in [M_t, mu_max]
  // 4 V(h)/h^4 with every term of the potential (Coleman-Weinberg terms and operators when on),
  // h in [M_t, mu_max]: negative exactly when the potential falls below the false vacuum.
  double quartic_min = 0, quartic_min_scale = 0;
  Verdict verdict = Verdict::stable;
  // log10 of the expected number N of unseeded decays in the past light cone (N, not a
  // probability: it exceeds 1 when the vacuum would not have survived); none when no flat-space
  // bounce exists.
  std::optional<double> log10_expected_decays;
  double bounce_scale = 0;  // the mu = 1/R that maximises N
  // The maximum sits at an end of the mu range, or the operators' share is held at its bound
  // (restrict_unseeded_to_first_order): N is a lower bound.
  bool bounce_at_scan_edge = false;
  UnseededMethod unseeded_method = UnseededMethod::fubini_first_order;
  double bounce_action = 0, bounce_action_error = 0;  // S at bounce_scale, operators included
  // The operators' first-order action at the first-order maximum, and its share of the Fubini
  // action there; first order holds when |operator_fraction| <= operator_first_order_bound.
  double operator_action = 0, operator_fraction = 0;
  bool operators_first_order = true;
  std::string prescription;  // the decay prescription, in words
};

StabilityReport analyse_stability(const StandardModelPotential& potential, const StabilityOptions& options = {});

// The Fubini family's maximum with the operators' share of S held within
// +- operator_first_order_bound of the Fubini action (first order overstates |Delta S_ops| beyond
// it: tests/test_tunnelling.cpp). Where the hold binds at the maximum, N is a lower bound for
// operators that lower V (bounce_at_scan_edge is set) and an upper one for operators that raise
// it; the prescription says which. For callers whose numerical bounce does not exist (operators
// that make V fall faster than h^4: the action then has no minimum over the bounce size;
// tunnelling/unseeded.hpp).
void restrict_unseeded_to_first_order(const StandardModelPotential& potential, const StabilityOptions& options,
                                      StabilityReport& report);

// The verdict rule above, for callers that replace the unseeded estimate (tunnelling/unseeded.hpp).
Verdict verdict_of(double quartic_min, const std::optional<double>& log10_expected_decays);

// Critical top mass, MS-bar criterion: the M_t at which lambda_min (MS-bar lambda, mu in
// [M_t, M_Pl]) is 0, the other inputs held fixed (Brent's method, GSL). Throws NumericalError if
// lambda_min does not change sign over M_t in [160, 185] GeV.
double critical_top_mass(const Inputs& inputs, const RunOptions& run = {}, const StabilityOptions& options = {});

// Critical top mass, effective-potential criterion: the M_t at which quartic_min (4V/h^4 with the
// potential options in force: Coleman-Weinberg terms, lambda6, lambda8) is 0, i.e. where the
// verdict turns from stable to metastable. Same bracket and errors as critical_top_mass.
double critical_top_mass_effective(const Inputs& inputs, const StandardModelOptions& potential,
                                   const RunOptions& run = {}, const StabilityOptions& options = {});

}  // namespace ember::higgs
