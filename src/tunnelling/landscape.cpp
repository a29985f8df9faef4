#include "ember/tunnelling/landscape.hpp"

#include <fmt/format.h>

#include <cmath>
#include <functional>

#include "ember/core/errors.hpp"
#include "ember/core/gsl_tools.hpp"

namespace ember::tunnelling {

namespace {
using Fn = std::function<double(double)>;

// The escape point and the barrier top to 1e-14 in ln phi: near double precision.
double root_of(const Fn& f, double a, double b) {
  return ember::brent_root(f, a, b, 1e-14).x;
}
}  // namespace

Landscape analyse_landscape(const higgs::Potential& p, double from, double step) {
  const double lo = std::log(from), hi = std::log(p.field_max());
  if (!(hi > lo))
    throw InputError(
        fmt::format("potential scan: from {:.3g} GeV is not below field_max {:.3g} GeV", from, p.field_max()));
  Landscape L;
  L.false_mass_squared = p.curvature(from);
  // Barrier: V rises from 0, peaks, and falls through zero at the escape point.
  double t = lo, best = -INFINITY, best_t = lo;
  for (; t <= hi; t += step) {
    const double v = p.value(std::exp(t));
    if (v > best) {
      best = v;
      best_t = t;
    }
    if (v < 0 && best > 0) break;
  }
  if (!(best > 0) || t > hi)
    throw InputError(
        fmt::format("potential \"{}\": no barrier followed by V < 0 between {:.3g} and {:.3g} GeV; expected a "
                    "false vacuum at phi = 0 that can decay",
                    p.description(), from, p.field_max()));
  // The barrier top: where V' changes sign near best_t.
  const Fn slope = [&](double u) { return p.slope(std::exp(u)); };
  const double a = best_t - step, b = best_t + step;
  L.barrier_top = (slope(a) > 0 && slope(b) < 0) ? std::exp(root_of(slope, a, b)) : std::exp(best_t);
  L.barrier_height = p.value(L.barrier_top);
  const Fn value = [&](double u) { return p.value(std::exp(u)); };
  L.escape = std::exp(root_of(value, t - step, t));
  // A true minimum beyond the escape point: V' turning from negative to positive.
  for (double u = t; u + step <= hi; u += step)
    if (slope(u) < 0 && slope(u + step) >= 0) {
      L.true_minimum = std::exp(root_of(slope, u, u + step));
      break;
    }
  return L;
}

}  // namespace ember::tunnelling
