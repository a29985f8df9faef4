// Renormalisation-group functions of the Standard Model couplings (MS-bar), in t = ln mu:
//   d g/dt = beta^(1)/(16 pi^2) + beta^(2)/(16 pi^2)^2 + beta^(3)/(16 pi^2)^3.
// One and two loops: Machacek & Vaughn, Nucl. Phys. B222 (1983) 83, B236 (1984) 221, B249 (1985)
// 70; Luo & Xiao, PRL 90 (2003) 011601 (transcribed from memory; validated by the
// lambda(M_Pl) test). Three loops: only the pure-QCD terms (see beta.cpp).
#pragma once

#include "ember/higgs/inputs.hpp"

namespace ember::higgs {

// d/dt of (g1, g2, g3, yt, lambda) at the given loop order (1, 2, or 3 = two-loop running plus
// three-loop QCD terms in g3 and yt; loop_order_name).
Couplings beta(const Couplings& c, int loops);

// The Higgs field's anomalous dimension at one loop in Landau gauge:
//   16 pi^2 gamma = 3 yt^2 - 9/4 g2^2 - 3/4 gY^2.
double field_anomalous_dimension(const Couplings& c);

}  // namespace ember::higgs
