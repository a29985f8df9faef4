#include "ember/tunnelling/thin_wall.hpp"

#include <algorithm>
#include <cmath>
#include <functional>

#include "ember/units/constants.hpp"

namespace ember::tunnelling {

double thin_wall_radius(const ThinWall& w) {
  return 3 * w.sigma / w.epsilon;
}

double thin_wall_action(const ThinWall& w) {
  return 27 * units::pi * units::pi * std::pow(w.sigma, 4) / (2 * std::pow(w.epsilon, 3));
}

std::optional<GravitatingThinWall> coleman_de_luccia(const ThinWall& w, double newton_G) {
  const double r0 = thin_wall_radius(w);
  const double l2 = 3 / (8 * units::pi * newton_G * w.epsilon);  // AdS radius squared of the true vacuum
  const double x = 1 - r0 * r0 / (4 * l2);
  if (!(x > 0)) return std::nullopt;
  return GravitatingThinWall{thin_wall_action(w) / (x * x), r0 / x};
}

double static_bubble_energy(const ThinWall& w) {
  return 16 * units::pi * std::pow(w.sigma, 3) / (3 * w.epsilon * w.epsilon);
}

namespace {

// The remnant horizon r_- of the interior Schwarzschild-AdS metric, 1 - 2 G M_-/r + r^2/L^2 = 0,
// i.e. r + r^3/L^2 = 2 G M_- (one positive root); Newton's method from r = 2 G M_-, where the
// left side is convex and increasing, converges from above.
double interior_horizon(double m_minus, double inv_l2, double G) {
  const double target = 2 * G * m_minus;
  double r = target;
  for (int i = 0; i < 200; ++i) {
    const double step = (r + r * r * r * inv_l2 - target) / (1 + 3 * r * r * inv_l2);
    r -= step;
    if (std::abs(step) <= 4e-16 * r) break;  // a few ulps: the iteration stalls below that
  }
  return r;
}

// M_- of the junction is the interior metric's mass parameter, which counts the true vacuum's
// negative energy inside r_- too: the remnant hole, as the numerical solver defines it, has the
// horizon mass r_- / (2G) = M_- - r_-^3 / (2 G L^2) (derived from the line above). B is the drop in
// horizon area, B = pi (r_+^2 - r_-^2) / G = 4 pi G (M_+ + M_h)(M_+ - M_h), formed from
// M_+ - M_h = Delta + r_-^3 / (2 G L^2) without cancellation.
SeededWall wall_at(double radius, double seed, double delta, double inv_l2, double G) {
  const double r_minus = interior_horizon(seed - delta, inv_l2, G);
  const double gap = delta + r_minus * r_minus * r_minus * inv_l2 / (2 * G), horizon_mass = seed - gap;
  return {radius, horizon_mass, 4 * units::pi * G * (seed + horizon_mass) * gap};
}

}  // namespace

std::vector<SeededWall> seeded_thin_walls(const ThinWall& w, double seed, double G) {
  const double k = 4 * units::pi * G * w.sigma;
  const double inv_l2 = 8 * units::pi * G * w.epsilon / 3;  // 1 / L^2
  const double r_h = 2 * G * seed;
  // M_+ - M_- from the junction condition at radius R.
  const auto delta = [&](double r) {
    const double b = std::sqrt(1 - r_h / r);
    return k * r * r / G * (b - r * inv_l2 / (2 * k) + k * r / 2);
  };
  // Force balance with M_- fixed: g(R) = b b' - G M_+ / R^2.
  const auto g = [&](double r) {
    const double b = std::sqrt(1 - r_h / r);
    const double db = -2 * G * delta(r) / (k * r * r * r) + inv_l2 / (2 * k) - k / 2;
    return b * db - G * seed / (r * r);
  };
  std::vector<SeededWall> out;
  // Scan R in ln from just outside the horizon to far beyond the flat-space radius.
  const double r_flat = 2 * w.sigma / w.epsilon;
  const double lo = std::log(r_h * (1 + 1e-9)), hi = std::log(std::max(r_flat, r_h) * 1e4);
  const int n = 20000;
  double prev_u = lo, prev = g(std::exp(lo));
  for (int i = 1; i <= n; ++i) {
    const double u = lo + (hi - lo) * i / n, cur = g(std::exp(u));
    if (std::isfinite(prev) && std::isfinite(cur) && (prev < 0) != (cur < 0)) {
      double a = prev_u, b = u, ga = prev;
      for (int it = 0; it < 200; ++it) {
        const double m = 0.5 * (a + b), gm = g(std::exp(m));
        if ((gm < 0) == (ga < 0)) {
          a = m;
          ga = gm;
        } else {
          b = m;
        }
      }
      // Kept when the interior has a horizon (M_- >= 0) and the remnant's horizon mass lies below
      // the seed (B > 0); Delta itself may be negative, the interior vacuum energy making up.
      const double r = std::exp(0.5 * (a + b)), d = delta(r);
      if (seed - d >= 0) {
        const SeededWall wall = wall_at(r, seed, d, inv_l2, G);
        if (wall.action > 0 && wall.remnant_mass >= 0) out.push_back(wall);
      }
    }
    prev_u = u;
    prev = cur;
  }
  std::sort(out.begin(), out.end(), [](const SeededWall& a, const SeededWall& b) { return a.action < b.action; });
  return out;
}

}  // namespace ember::tunnelling
