#include "ember/higgs/beta.hpp"

#include <cmath>

#include "ember/units/constants.hpp"

namespace ember::higgs {

namespace {
using units::pi;
constexpr double loop = 1.0 / (16 * pi * pi);
constexpr double zeta3 = 1.2020569031595942854;
}  // namespace

double field_anomalous_dimension(const Couplings& c) {
  return loop * (3 * c.yt * c.yt - 2.25 * c.g2 * c.g2 - 0.75 * c.gY2());
}

Couplings beta(const Couplings& c, int loops) {
  const double g1 = c.g1, g2 = c.g2, g3 = c.g3, yt = c.yt, l = c.lambda;
  const double g12 = g1 * g1, g22 = g2 * g2, g32 = g3 * g3, yt2 = yt * yt, gy2 = c.gY2();
  const double g24 = g22 * g22, gy4 = gy2 * gy2, yt4 = yt2 * yt2;

  // One loop.
  Couplings b{
      41.0 / 10 * g1 * g12, -19.0 / 6 * g2 * g22, -7 * g3 * g32,
      yt * (4.5 * yt2 - 8 * g32 - 2.25 * g22 - 17.0 / 20 * g12),
      24 * l * l - 6 * yt4 + 3.0 / 8 * (2 * g24 + (g22 + gy2) * (g22 + gy2)) + l * (12 * yt2 - 9 * g22 - 3 * gy2)};
  b.g1 *= loop;
  b.g2 *= loop;
  b.g3 *= loop;
  b.yt *= loop;
  b.lambda *= loop;
  if (loops < 2) return b;

  // Two loops.
  const double loop2 = loop * loop;
  b.g1 += loop2 * g1 * g12 * (199.0 / 50 * g12 + 27.0 / 10 * g22 + 44.0 / 5 * g32 - 17.0 / 10 * yt2);
  b.g2 += loop2 * g2 * g22 * (9.0 / 10 * g12 + 35.0 / 6 * g22 + 12 * g32 - 1.5 * yt2);
  b.g3 += loop2 * g3 * g32 * (11.0 / 10 * g12 + 4.5 * g22 - 26 * g32 - 2 * yt2);
  b.yt += loop2 * yt *
          (-12 * yt4 + yt2 * (393.0 / 80 * g12 + 225.0 / 16 * g22 + 36 * g32) + 1187.0 / 600 * g12 * g12 -
           9.0 / 20 * g12 * g22 + 19.0 / 15 * g12 * g32 - 23.0 / 4 * g24 + 9 * g22 * g32 - 108 * g32 * g32 + 6 * l * l -
           12 * l * yt2);
  b.lambda +=
      loop2 * (-312 * l * l * l - 144 * l * l * yt2 - 3 * l * yt4 + 30 * yt4 * yt2 - 32 * g32 * yt4 +
               80 * g32 * l * yt2 + l * l * (108 * g22 + 36 * gy2) + l * yt2 * (45.0 / 2 * g22 + 85.0 / 6 * gy2) -
               8.0 / 3 * gy2 * yt4 + l * (-73.0 / 8 * g24 + 39.0 / 4 * g22 * gy2 + 629.0 / 24 * gy4) +
               yt2 * (-9.0 / 4 * g24 + 21.0 / 2 * g22 * gy2 - 19.0 / 4 * gy4) + 305.0 / 16 * g24 * g22 -
               289.0 / 48 * g24 * gy2 - 559.0 / 48 * g22 * gy4 - 379.0 / 48 * gy4 * gy2);
  if (loops < 3) return b;

  // Three loops, pure QCD only: beta_g3 gets +65/2 g3^7 (the six-flavour three-loop QCD beta
  // function); beta_yt gets -2 gamma_2 yt g3^6 with the three-loop quark-mass anomalous dimension
  // at nf = 6, 64 gamma_2 = 1249 - 13296/27 - 320 zeta3 - 5040/81 (Tarasov 1982, from
  // memory).
  const double loop3 = loop2 * loop;
  const double g36 = g32 * g32 * g32;
  b.g3 += loop3 * 65.0 / 2 * g3 * g36;
  b.yt += loop3 * -2 * (1249 - 13296.0 / 27 - 320 * zeta3 - 5040.0 / 81) * yt * g36;
  return b;
}

}  // namespace ember::higgs
