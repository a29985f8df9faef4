#include "ember/greybody/kerr_mode.hpp"

#include <fmt/format.h>

#include <cmath>
#include <numbers>

#include "ember/core/errors.hpp"
#include "ember/greybody/mode.hpp"

namespace ember::greybody {

namespace {

int kerr_twice(double v, const char* name) {
  const double t = 2.0 * v;
  if (!std::isfinite(v) || std::abs(v) > 1e4 || t != std::round(t))
    throw InputError(fmt::format("Kerr mode: {} = {}: expected a whole or half-whole number", name, v));
  return static_cast<int>(std::lround(t));
}

}  // namespace

KerrMode make_kerr_mode(double spin, double l, double m) {
  const Mode base = make_mode(spin, l);  // spin and l checked as for Schwarzschild
  const int tm = kerr_twice(m, "m");
  if (std::abs(tm) > base.twice_l || (base.twice_l - tm) % 2 != 0)
    throw InputError(fmt::format("Kerr mode: m = {}: expected one of -l, -l+1, ..., l with l = {}", m, base.l()));
  return {base.twice_spin, base.twice_l, tm};
}

std::string describe(const KerrMode& mode) {
  const auto half = [](int twice) {
    return twice % 2 == 0 ? fmt::format("{}", twice / 2) : fmt::format("{}/2", twice);
  };
  return fmt::format("spin {}, {} = {}, m = {}", spin_text(mode.twice_spin), mode.twice_spin % 2 ? "j" : "l",
                     half(mode.twice_l), half(mode.twice_m));
}

double KerrHole::temperature() const {
  return surface_gravity / (2.0 * std::numbers::pi);
}

double KerrHole::area() const {
  return 4.0 * std::numbers::pi * (r_plus * r_plus + a * a);
}

KerrHole make_kerr_hole(double a) {
  if (!std::isfinite(a) || a < 0 || a >= 1)
    throw InputError(
        fmt::format("Kerr hole: a* = {}: expected 0 <= a* < 1 (the extremal hole, a* = 1, has no "
                    "Hawking temperature)",
                    a));
  // sqrt(1 - a^2) as sqrt((1 - a)(1 + a)) keeps its digits near a = 1.
  const double root = std::sqrt((1.0 - a) * (1.0 + a));
  KerrHole h;
  h.a = a;
  h.r_plus = 1.0 + root;
  h.r_minus = a * a / h.r_plus;  // = 1 - root, without the cancellation
  h.angular_velocity = a / (2.0 * h.r_plus);
  h.surface_gravity = 2.0 * root / (4.0 * h.r_plus);  // (r_+ - r_-) / (2 (r_+^2 + a^2)), r_+^2 + a^2 = 2 r_+
  return h;
}

}  // namespace ember::greybody
