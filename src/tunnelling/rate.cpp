#include "ember/tunnelling/rate.hpp"

#include <fmt/format.h>

#include <cmath>

#include "ember/core/errors.hpp"

namespace ember::tunnelling {

std::string name_of(Prefactor p) {
  return p == Prefactor::root_action ? "root_action" : "light_crossing";
}

Rates rates_at(const ActionPoint& a, const evaporation::MassLoss& ml, Prefactor prefactor, double G) {
  Rates r;
  const double m = a.seed_mass;
  r.evaporation_rate = ml.alpha(m) / (m * m * m);
  if (a.flags.no_decay) return r;
  const double b = a.action.value;
  // A negative or non-finite B is a solver failure upstream; never let it become a NaN rate.
  if (!std::isfinite(b) || b < 0)
    throw NumericalError("decay rate",
                         fmt::format("B = {} at seed mass {:.4g} GeV; expected a finite B >= 0 ({})", b, m, a.note));
  r.prefactor = a.own_prefactor                       ? *a.own_prefactor
                : prefactor == Prefactor::root_action ? std::sqrt(b / (2 * units::pi)) / (G * m)
                                                      : 1 / (G * m);
  r.decay_rate = r.prefactor * std::exp(-b);
  r.branching_ratio = r.decay_rate / (r.decay_rate + r.evaporation_rate);
  return r;
}

}  // namespace ember::tunnelling
