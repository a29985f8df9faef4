// A partial wave of a massless field on a Schwarzschild background.
//
// Units of the greybody module: G = c = hbar = 1 and the hole's mass M = 1, so r_h = 2 and the
// frequency variable is x = G M omega / c^3 = omega. Spins and angular momenta are stored doubled,
// so that spin 1/2 and j = 1/2, 3/2, ... are exact integers.
#pragma once

#include <string>

namespace ember::greybody {

// Which radial potential carries the wave (see potentials.hpp).
enum class Potential {
  regge_wheeler,  // spin 0, 1 and the axial spin-2 wave
  zerilli,        // the polar spin-2 wave (same transmission as the axial one)
  dirac_plus,     // spin 1/2, V = W^2 + dW/dr*
  dirac_minus,    // spin 1/2, V = W^2 - dW/dr* (same transmission)
};

struct Mode {
  int twice_spin;  // 0, 1, 2, 4 for spin 0, 1/2, 1, 2
  int twice_l;     // 2l for bosons (l >= s), 2j for spin 1/2 (j = 1/2, 3/2, ...)
  Potential potential = Potential::regge_wheeler;

  double spin() const { return 0.5 * twice_spin; }
  double l() const { return 0.5 * twice_l; }
  int degeneracy() const { return twice_l + 1; }  // 2l + 1, or 2j + 1
  bool fermion() const { return twice_spin % 2 == 1; }
  // Leading low-frequency power: Gamma ~ x^(2l+2) for bosons, x^(2j+1) for spin 1/2.
  int low_frequency_power() const { return fermion() ? twice_l + 1 : twice_l + 2; }
};

// The mode with the usual potential for its spin; throws InputError when the spin is not one of
// 0, 1/2, 1, 2 or l is not allowed for it.
Mode make_mode(double spin, double l);
Mode lowest_mode(int twice_spin);

std::string describe(const Mode& mode);  // "spin 1/2, j = 3/2"
std::string spin_text(int twice_spin);   // "0", "1/2", "1", "2"

}  // namespace ember::greybody
