// The Kerr greybody table's lookup: per node and mode, a spline of ln G in ln x.
#include "ember/greybody/kerr_table.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <map>
#include <optional>
#include <tuple>

#include "ember/core/errors.hpp"
#include "ember/core/gsl_tools.hpp"

namespace ember::greybody {

namespace {

// G / Gamma = x / (x - m Omega_H) for bosons (see kerr_table.hpp), 1 for spin 1/2.
double reduction(const KerrHole& hole, const KerrMode& mode, double x) {
  if (mode.twice_spin % 2 == 1 || mode.twice_m == 0) return 1.0;
  return x / (x - mode.m() * hole.angular_velocity);
}

int spin_slot(int twice_spin) {
  return twice_spin == 4 ? 3 : twice_spin;
}

// The interpolated variable L = ln(G / |R|^2), |R|^2 = 1 - Gamma (> 0 always: below 1 outside the
// superradiant band by flux conservation, above 1 inside it), floored where Gamma is 1 to within
// rounding (the floor moves Gamma by less than 1e-9, and keeps the file's 13 digits of Gamma
// from putting noise into L where |R|^2 is tiny); Gamma = rho e^L / (1 + rho e^L) with rho = Gamma / G. Like the
// Schwarzschild table's ln(Gamma / |R|^2) it is nearly linear where the wave gets over the barrier (measured: ten times
// smaller midpoint errors than ln G).
constexpr double reflection_floor = 1e-9;
double logit_of(double gamma, double rho) {
  return std::log(gamma / rho) - std::log(std::max(1.0 - gamma, reflection_floor));
}
double gamma_of(double logit, double rho) {
  const double e = rho * std::exp(logit);
  return e / (1.0 + e);
}

}  // namespace

double kerr_mode_top(const KerrHole& hole, const KerrMode& mode) {
  return std::max(mode.m() * hole.angular_velocity, 0.0) + tolerance::kerr_thermal_cut * hole.temperature();
}

struct KerrTable::Curve {
  std::size_t node = 0;
  KerrMode mode{};
  KerrHole hole;
  std::vector<double> ln_x, ln_g, relative_error;
  std::optional<Spline> spline;
  double low_slope = 0, low_slope_change = 0;

  Estimate at(double x, double stated) const {
    const double u = std::log(x);
    double ln_g_value = 0, extrapolation = 0;
    if (u < ln_x.front()) {
      ln_g_value = ln_g.front() + low_slope * (u - ln_x.front());
      extrapolation = low_slope_change * (ln_x.front() - u);
    } else {
      ln_g_value = spline->value(std::min(u, ln_x.back()));
    }
    const double gamma = gamma_of(ln_g_value, 1.0 / reduction(hole, mode, x));
    return {gamma, std::abs(gamma) * (stated + extrapolation)};
  }
};

KerrTable::KerrTable(KerrTableHeader header, std::vector<KerrTableRow> rows) : header_(header), rows_(std::move(rows)) {
  using Key = std::tuple<double, int, int, int>;
  std::map<Key, std::vector<const KerrTableRow*>> groups;
  for (const auto& r : rows_) groups[{r.hole_spin, r.twice_spin, r.twice_l, r.twice_m}].push_back(&r);
  for (const auto& [key, _] : groups)
    if (spins_.empty() || spins_.back() != std::get<0>(key)) spins_.push_back(std::get<0>(key));
  for (const auto& [key, group] : groups) {
    auto c = std::make_shared<Curve>();
    c->node = static_cast<std::size_t>(std::find(spins_.begin(), spins_.end(), std::get<0>(key)) - spins_.begin());
    c->mode = KerrMode{std::get<1>(key), std::get<2>(key), std::get<3>(key)};
    c->hole = make_kerr_hole(std::get<0>(key));
    if (group.size() < 3)
      throw InputError(fmt::format("Kerr greybody table: {} at a* = {} has {} rows; expected at least 3",
                                   describe(c->mode), std::get<0>(key), group.size()));
    for (const KerrTableRow* r : group) {
      const double rho = 1.0 / reduction(c->hole, c->mode, r->x);
      const double g = r->transmission / rho;
      if (!(g > 0) || !std::isfinite(g) || !(r->transmission < 1 + 1e-6))
        throw InputError(fmt::format(
            "Kerr greybody table: {} at a* = {}, x = {}: transmission {} has the wrong sign "
            "for its side of the threshold m Omega_H = {}",
            describe(c->mode), r->hole_spin, r->x, r->transmission, c->mode.m() * c->hole.angular_velocity));
      if (!c->ln_x.empty() && !(std::log(r->x) > c->ln_x.back()))
        throw InputError(fmt::format("Kerr greybody table: {} at a* = {}: x = {} does not increase", describe(c->mode),
                                     r->hole_spin, r->x));
      c->ln_x.push_back(std::log(r->x));
      c->ln_g.push_back(logit_of(r->transmission, rho));
    }
    const auto slope = [&](std::size_t i) { return (c->ln_g[i + 1] - c->ln_g[i]) / (c->ln_x[i + 1] - c->ln_x[i]); };
    c->low_slope = slope(0);
    c->low_slope_change = std::abs(slope(1) - slope(0));
    c->spline.emplace(Spline::Kind::cubic, c->ln_x, c->ln_g, "Kerr greybody table");
    curves_.push_back(c);
  }
  by_node_spin_.resize(spins_.size() * 4);
  for (const auto& c : curves_) by_node_spin_[c->node * 4 + spin_slot(c->mode.twice_spin)].push_back(c.get());
}

void KerrTable::transmissions(std::size_t node, int twice_spin, double x, std::vector<double>& out) const {
  const auto& curves = by_node_spin_.at(node * 4 + spin_slot(twice_spin));
  out.resize(curves.size());
  const double u = std::log(x);
  for (std::size_t i = 0; i < curves.size(); ++i)
    out[i] = u > curves[i]->ln_x.back() ? 0.0 : curves[i]->at(x, 0.0).value;
}

const KerrTable::Curve& KerrTable::find(std::size_t node, const KerrMode& mode) const {
  if (node < spins_.size())
    for (const Curve* c : by_node_spin_[node * 4 + spin_slot(mode.twice_spin)])
      if (c->mode.twice_l == mode.twice_l && c->mode.twice_m == mode.twice_m) return *c;
  throw InputError(fmt::format("Kerr greybody table: {} is not tabulated at a* = {}", describe(mode),
                               node < spins_.size() ? spins_[node] : -1.0));
}

std::vector<KerrMode> KerrTable::modes(std::size_t node, int twice_spin) const {
  std::vector<KerrMode> out;
  for (const Curve* c : by_node_spin_.at(node * 4 + spin_slot(twice_spin))) out.push_back(c->mode);
  return out;
}

double KerrTable::top(std::size_t node, const KerrMode& mode) const {
  return std::exp(find(node, mode).ln_x.back());
}

Estimate KerrTable::transmission(std::size_t node, const KerrMode& mode, double x) const {
  const Curve& c = find(node, mode);
  if (!(x > 0) || std::log(x) > c.ln_x.back() * (1 + 1e-12) + 1e-12)
    throw InputError(
        fmt::format("Kerr greybody table: x = {} for {} at a* = {}: expected 0 < x <= {:.6g}, the "
                    "top of the tabulated range (solve directly above it)",
                    x, describe(mode), spins_[node], std::exp(c.ln_x.back())));
  return c.at(x, header_.interpolation_error);
}

}  // namespace ember::greybody
