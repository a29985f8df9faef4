#include "ember/greybody/mode.hpp"

#include <fmt/format.h>

#include <cmath>

#include "ember/core/errors.hpp"

namespace ember::greybody {

std::string spin_text(int twice_spin) {
  return twice_spin % 2 == 0 ? fmt::format("{}", twice_spin / 2) : fmt::format("{}/2", twice_spin);
}

std::string describe(const Mode& mode) {
  const std::string l =
      mode.fermion() ? fmt::format("j = {}/2", mode.twice_l) : fmt::format("l = {}", mode.twice_l / 2);
  const char* which = mode.potential == Potential::zerilli       ? " (polar)"
                      : mode.potential == Potential::dirac_minus ? " (W^2 - W')"
                                                                 : "";
  return fmt::format("spin {}, {}{}", spin_text(mode.twice_spin), l, which);
}

Mode make_mode(double spin, double l) {
  const double twice_s = 2 * spin, twice_l = 2 * l;
  const bool known_spin = twice_s == 0 || twice_s == 1 || twice_s == 2 || twice_s == 4;
  if (!known_spin)
    throw InputError(fmt::format("spin {}: not a spin the Standard Model emits; expected 0, 0.5, 1 or 2", spin));
  const int ts = static_cast<int>(twice_s);
  if (twice_l != std::round(twice_l) || twice_l < twice_s || twice_l > 2000 ||
      (static_cast<int>(twice_l) - ts) % 2 != 0)
    throw InputError(
        fmt::format("l {} for spin {}: not allowed; expected {} (and below 1000)", l, spin_text(ts),
                    ts % 2 == 1 ? "j = 1/2, 3/2, 5/2, ..." : fmt::format("a whole number l >= {}", ts / 2)));
  return Mode{ts, static_cast<int>(twice_l), ts == 1 ? Potential::dirac_plus : Potential::regge_wheeler};
}

Mode lowest_mode(int twice_spin) {
  return Mode{twice_spin, twice_spin, twice_spin == 1 ? Potential::dirac_plus : Potential::regge_wheeler};
}

}  // namespace ember::greybody
