// Standard Model inputs and the MS-bar couplings they fix at mu = M_t.
//
// Units: GeV for masses; couplings dimensionless. Conventions: V = lambda (H^dag H - v^2/2)^2, so
// V ~ lambda h^4 / 4 at large h; g1 is GUT-normalised, g1^2 = (5/3) gY^2.
#pragma once

#include <string>
#include <vector>

namespace ember::higgs {

struct Measured {
  double value, sigma;
};

// data/standard_model.yaml (PDG 2024), compiled into the binary.
struct MeasuredInputs {
  Measured top_mass, higgs_mass, alpha_s, w_mass;  // GeV, except alpha_s
};
const MeasuredInputs& measured_inputs();

struct Inputs {
  double top_mass = 172.57;   // GeV, pole
  double higgs_mass = 125.2;  // GeV, pole
  double alpha_s = 0.118;     // alpha_s(M_Z), MS-bar, five flavours
  double w_mass = 80.3692;    // GeV, pole
  int loops = 3;              // 1, 2, or 3: see loop_order_name

  void validate() const;  // throws InputError naming the field and the rule
};
Inputs default_inputs();  // the measured central values

// What each loop order runs, in words, for every place that prints it: 1 "one-loop running",
// 2 "two-loop running", 3 "two-loop running plus three-loop QCD terms in g3 and yt" (beta.hpp:
// order 3 adds only the pure-QCD three-loop terms, not the full three-loop functions).
std::string loop_order_name(int loops);
// "1 = one-loop running, 2 = ..., 3 = ...": the choices, for help texts and the schema.
std::string loop_order_choices();

struct Couplings {
  double g1, g2, g3, yt, lambda;
  double gY2() const { return 0.6 * g1 * g1; }  // gY^2 = (3/5) g1^2
};

// MS-bar couplings at mu = M_t from the fits of Buttazzo et al., JHEP 12 (2013) 089, in terms of
// pole masses and alpha_s(M_Z) (from memory). Fits are valid near the central values only.
Couplings couplings_at_top(const Inputs& inputs);

// Warnings when inputs stray from the ranges where those fits hold (|dM_t| > 3 GeV,
// |dM_h| > 3 GeV, |d alpha_s| > 0.003, |dM_W| > 0.1 GeV from Buttazzo et al.'s central values).
std::vector<std::string> fit_warnings(const Inputs& inputs);

}  // namespace ember::higgs
