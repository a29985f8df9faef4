#include "ember/evaporation/kerr_mass_loss.hpp"

#include <fmt/format.h>
#include <gsl/gsl_integration.h>

#include <algorithm>
#include <array>
#include <chrono>
#include <cmath>
#include <functional>
#include <memory>
#include <optional>

#include "ember/core/errors.hpp"
#include "ember/core/finite.hpp"
#include "ember/core/gsl_tools.hpp"
#include "ember/core/parallel.hpp"
#include "ember/greybody/kerr_emission.hpp"
#include "ember/units/constants.hpp"
#include "kernel_grid.hpp"

namespace ember::evaporation {

namespace {
using kernel_grid::spin_index;
using kernel_grid::spin_order;
using units::pi;

// The kernels' grid in the cut x_c: v = kernel_grid::v_of(x_c), as the Schwarzschild kernels,
// from kerr_cut_min (below it J(x_c) = J(kerr_cut_min): the part cut off is O(x_c^3) of a power
// that starts at x ~ T_H) to the node's highest mode top, in steps of kerr_cut_spacing; each
// piece by one 21-point Gauss-Kronrod rule (the integrand is smooth through every threshold:
// Gamma th = G T phi(u) / x, kerr_table.hpp).
constexpr double kerr_cut_min = 1e-6;
constexpr double kerr_cut_spacing = 0.05;
constexpr std::size_t kerr_rule_points = 20;

// b = sqrt(1 - a*^2), the variable between nodes.
double spin_b(double a) {
  return std::sqrt(std::max(0.0, 1.0 - a * a));
}

}  // namespace

double kerr_hawking_temperature(double mass, double hole_spin) {
  return greybody::make_kerr_hole(hole_spin).temperature() * units::planck_mass * units::planck_mass / mass;
}

// One node: per spin, the power and torque kernels against the cut.
struct KerrMassLoss::NodeKernels {
  double hole_spin = 0, temperature_unit = 0;  // T_H for M = 1
  struct Kernel {
    std::optional<Spline> power, torque;  // against v; power as ln J, torque as K itself (sign-free)
    double power_at_min = 0, torque_at_min = 0, v_top = 0;
  };
  Kernel by_spin[4];

  double power(int twice_spin, double cut) const {
    const Kernel& k = by_spin[spin_index(twice_spin)];
    if (cut <= kerr_cut_min) return k.power_at_min;
    const double v = kernel_grid::v_of(cut);
    return v >= k.v_top ? 0.0 : std::exp(k.power->value(v));
  }
  double torque(int twice_spin, double cut) const {
    const Kernel& k = by_spin[spin_index(twice_spin)];
    if (cut <= kerr_cut_min) return k.torque_at_min;
    const double v = kernel_grid::v_of(cut);
    return v >= k.v_top ? 0.0 : k.torque->value(v);
  }
};

namespace {

KerrMassLoss::NodeKernels::Kernel build_kerr_kernel(const greybody::KerrTable& table, std::size_t node,
                                                    int twice_spin) {
  using namespace greybody;
  const KerrHole hole = make_kerr_hole(table.hole_spins()[node]);
  const std::vector<KerrMode> modes = table.modes(node, twice_spin);
  if (modes.empty())
    throw InputError(fmt::format("Kerr greybody table: no spin {}/2 modes at a* = {}", twice_spin, hole.a));
  std::vector<double> tops;
  double top = 0;
  for (const auto& m : modes) {
    tops.push_back(table.top(node, m));
    top = std::max(top, tops.back());
  }
  // (1/2pi) sum over modes of x Gamma th and m Gamma th at x; nothing above a mode's top.
  std::vector<double> gamma;
  const auto density = [&](double x) {
    table.transmissions(node, twice_spin, x, gamma);
    std::array<double, 2> sum{0.0, 0.0};
    for (std::size_t i = 0; i < modes.size(); ++i) {
      if (gamma[i] == 0.0) continue;
      const double rate = gamma[i] * kerr_thermal_factor(hole, modes[i], x) / (2 * pi);
      sum[0] += x * rate;
      sum[1] += modes[i].m() * rate;
    }
    return sum;
  };
  // Both moments from one set of nodes: a 20-point Gauss-Legendre rule per piece (GSL's fixed
  // tables), exact for polynomials of degree 39; the pieces are small enough for it to be
  // converged (checked against adaptive quadrature in the tests, to 1e-9).
  const std::unique_ptr<gsl_integration_glfixed_table, decltype(&gsl_integration_glfixed_table_free)> rule(
      gsl_integration_glfixed_table_alloc(kerr_rule_points), &gsl_integration_glfixed_table_free);
  const auto both = [&](double lo, double hi) {
    std::array<double, 2> sum{0.0, 0.0};
    for (std::size_t i = 0; i < kerr_rule_points; ++i) {
      double x = 0, w = 0;
      gsl_integration_glfixed_point(lo, hi, i, &x, &w, rule.get());
      const auto d = density(x);
      sum[0] += w * d[0];
      sum[1] += w * d[1];
    }
    return sum;
  };
  const double v_lo = kernel_grid::v_of(kerr_cut_min), v_hi = kernel_grid::v_of(top);
  const int n = static_cast<int>(std::ceil((v_hi - v_lo) / kerr_cut_spacing));
  // Nodes 0 .. n-1 below the top; the piece from the last node to the top is in every sum, and
  // above the last node the kernels are taken as 0 (less than e^-60 of any node's value: the
  // thermal factor at the top is e^-72 of its value at the threshold).
  std::vector<double> v(static_cast<std::size_t>(n)), ln_j(v.size()), k(v.size());
  double power = 0, torque = 0, upper = top;
  for (int i = n - 1; i >= 0; --i) {
    const auto I = static_cast<std::size_t>(i);
    v[I] = v_lo + (v_hi - v_lo) * i / n;
    const double lo = kernel_grid::a_of(v[I]);
    const auto piece = both(lo, upper);
    power += piece[0];
    torque += piece[1];
    upper = lo;
    ln_j[I] = std::log(std::max(power, 1e-300));
    k[I] = torque;
  }
  KerrMassLoss::NodeKernels::Kernel out;
  out.power.emplace(Spline::Kind::cubic, v, ln_j, "Kerr power kernel");
  out.torque.emplace(Spline::Kind::cubic, v, k, "Kerr torque kernel");
  out.power_at_min = power;
  out.torque_at_min = torque;
  out.v_top = v.back();
  return out;
}

}  // namespace

KerrMassLoss::KerrMassLoss(const greybody::KerrTable& table, ParticleSet particles, const MassLossOptions& options)
    : particles_(std::move(particles)), options_(options), spins_(table.hole_spins()) {
  options_.validate();
  if (options_.argument != GreybodyArgument::energy)
    throw InputError(
        "mass-loss options: argument = momentum: the Kerr rates take the greybody factors at the energy only");
  if (spins_.size() < 4 || spins_.front() != 0.0)
    throw InputError(
        fmt::format("Kerr greybody table: {} nodes; expected a* = 0 and at least three spinning nodes", spins_.size()));
  const auto start = std::chrono::steady_clock::now();
  auto nodes = std::make_shared<std::vector<NodeKernels>>(spins_.size());
  const std::size_t tasks = spins_.size() * 4;
  parallel_for(tasks, default_threads(), [&](std::size_t t) {
    const std::size_t node = t / 4;
    const int ts = spin_order[t % 4];
    (*nodes)[node].by_spin[spin_index(ts)] = build_kerr_kernel(table, node, ts);
  });
  for (std::size_t i = 0; i < spins_.size(); ++i) {
    (*nodes)[i].hole_spin = spins_[i];
    (*nodes)[i].temperature_unit = greybody::make_kerr_hole(spins_[i]).temperature();
  }
  nodes_ = nodes;
  // The interpolation between nodes, checked by leaving each interior node out, over masses
  // from where every species is massless to where only photons, neutrinos and gravitons are left.
  double worst = 0;
  for (const double gram : {1e6, 1e9, 1e11, 1e12, 1e13, 1e14, 1e16, 1e18})
    worst = std::max(worst, interpolation_check(gram * units::gram));
  summary_.interpolation_error = worst;
  summary_.nodes = static_cast<int>(spins_.size());
  relative_error_ = table.header().interpolation_error + worst;
  summary_.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  summary_.message = fmt::format(
      "Kerr alpha and torque over {} species at {} hole-spin nodes (a* = 0 to {}), a*-interpolation error "
      "(leave-one-out) {:.1e}, {:.2f} s",
      particles_.species.size(), spins_.size(), spins_.back(), worst, summary_.seconds);
}

double KerrMassLoss::weight(const Species& s, double temperature) const {
  return s.window == Window::partons   ? parton_weight(temperature, options_)
         : s.window == Window::hadrons ? hadron_weight(temperature, options_)
                                       : 1.0;
}

std::vector<double> KerrMassLoss::node_species_alpha(std::size_t node, double mass) const {
  const NodeKernels& k = (*nodes_)[node];
  const double m4 = std::pow(units::planck_mass, 4),
               t = k.temperature_unit * units::planck_mass * units::planck_mass / mass;
  std::vector<double> out;
  for (const auto& s : particles_.species) {
    const double cut = s.mass * mass / (units::planck_mass * units::planck_mass);
    out.push_back(m4 * s.dof * weight(s, t) * k.power(s.twice_spin, cut));
  }
  return out;
}

double KerrMassLoss::node_alpha(std::size_t node, double mass) const {
  double sum = 0;
  for (const double a : node_species_alpha(node, mass)) sum += a;
  return sum;
}

double KerrMassLoss::node_torque(std::size_t node, double mass) const {
  const NodeKernels& k = (*nodes_)[node];
  const double m4 = std::pow(units::planck_mass, 4),
               t = k.temperature_unit * units::planck_mass * units::planck_mass / mass;
  double sum = 0;
  for (const auto& s : particles_.species) {
    const double cut = s.mass * mass / (units::planck_mass * units::planck_mass);
    sum += m4 * s.dof * weight(s, t) * k.torque(s.twice_spin, cut);
  }
  return sum;
}

namespace {

// ln alpha_i and q_i at the nodes, as splines in b (increasing b: decreasing a*), leaving out
// node `skip` when it is given.
struct NodeSplines {
  std::optional<Spline> ln_alpha, ratio;
  double ratio_b_max = 0, ratio_end = 0, ratio_end_slope = 0;
};

NodeSplines node_splines(const std::vector<double>& spins, const std::vector<double>& ln_alpha,
                         const std::vector<double>& ratio, std::optional<std::size_t> skip) {
  std::vector<double> b, la, br, q;
  for (std::size_t j = spins.size(); j-- > 0;) {
    if (skip && *skip == j) continue;
    b.push_back(spin_b(spins[j]));
    la.push_back(ln_alpha[j]);
    if (spins[j] > 0) {
      br.push_back(b.back());
      q.push_back(ratio[j]);
    }
  }
  NodeSplines s;
  s.ln_alpha.emplace(Spline::Kind::cubic, b, la, "Kerr ln alpha in b");
  s.ratio.emplace(Spline::Kind::cubic, br, q, "Kerr torque ratio in b");
  s.ratio_b_max = br.back();
  s.ratio_end = q.back();
  s.ratio_end_slope = s.ratio->slope(br.back());
  return s;
}

double ratio_at(const NodeSplines& s, double b) {
  if (b <= s.ratio_b_max) return s.ratio->value(b);
  return s.ratio_end + s.ratio_end_slope * (b - s.ratio_b_max);
}

struct NodeValues {
  std::vector<double> ln_alpha, ratio;
};

}  // namespace

double KerrMassLoss::interpolation_check(double mass) const {
  NodeValues v;
  for (std::size_t i = 0; i < spins_.size(); ++i) {
    const double a = node_alpha(i, mass);
    v.ln_alpha.push_back(std::log(a));
    v.ratio.push_back(spins_[i] > 0 ? node_torque(i, mass) / (spins_[i] * a) : 0.0);
  }
  double worst = 0;
  // Interior nodes with at least two spinning nodes either side stay interpolation, not extrapolation.
  for (std::size_t k = 2; k + 1 < spins_.size(); ++k) {
    const NodeSplines s = node_splines(spins_, v.ln_alpha, v.ratio, k);
    const double b = spin_b(spins_[k]);
    worst = std::max(worst, std::abs(std::exp(s.ln_alpha->value(b) - v.ln_alpha[k]) - 1));
    worst = std::max(worst, std::abs(ratio_at(s, b) / v.ratio[k] - 1));
  }
  return worst;
}

void KerrMassLoss::check_spin(double hole_spin) const {
  if (!(hole_spin >= 0 && hole_spin <= spins_.back()))
    throw InputError(fmt::format("Kerr mass loss: a* = {}: expected 0 <= a* <= {} (the Kerr greybody table's range)",
                                 hole_spin, spins_.back()));
}

double KerrMassLoss::alpha(double mass, double hole_spin) const {
  check_spin(hole_spin);
  for (std::size_t i = 0; i < spins_.size(); ++i)
    if (spins_[i] == hole_spin) return node_alpha(i, mass);
  NodeValues v;
  for (std::size_t i = 0; i < spins_.size(); ++i) {
    v.ln_alpha.push_back(std::log(node_alpha(i, mass)));
    v.ratio.push_back(1.0);
  }
  const NodeSplines s = node_splines(spins_, v.ln_alpha, v.ratio, std::nullopt);
  return require_finite(
      std::exp(s.ln_alpha->value(spin_b(hole_spin))), "evaporation: Kerr mass loss", "alpha(M, a*)",
      [&] { return fmt::format("M = {:.6e} g, a* = {}", mass / units::gram, hole_spin); }, "a* inside the table");
}

double KerrMassLoss::spin_ratio(double mass, double hole_spin) const {
  check_spin(hole_spin);
  NodeValues v;
  for (std::size_t i = 0; i < spins_.size(); ++i) {
    const double a = node_alpha(i, mass);
    v.ln_alpha.push_back(std::log(a));
    v.ratio.push_back(spins_[i] > 0 ? node_torque(i, mass) / (spins_[i] * a) : 0.0);
  }
  for (std::size_t i = 1; i < spins_.size(); ++i)
    if (spins_[i] == hole_spin) return v.ratio[i];
  const NodeSplines s = node_splines(spins_, v.ln_alpha, v.ratio, std::nullopt);
  return require_finite(
      ratio_at(s, spin_b(hole_spin)), "evaporation: Kerr mass loss", "g/f(M, a*)",
      [&] { return fmt::format("M = {:.6e} g, a* = {}", mass / units::gram, hole_spin); }, "a* inside the table");
}

std::vector<double> KerrMassLoss::power_shares(double mass, double hole_spin) const {
  check_spin(hole_spin);
  const std::size_t n = particles_.species.size();
  std::vector<std::vector<double>> shares(n);
  std::vector<double> b;
  for (std::size_t j = spins_.size(); j-- > 0;) {
    const auto alphas = node_species_alpha(j, mass);
    double total = 0;
    for (const double a : alphas) total += a;
    b.push_back(spin_b(spins_[j]));
    for (std::size_t s = 0; s < n; ++s) shares[s].push_back(alphas[s] / total);
  }
  std::vector<double> out(n);
  double sum = 0;
  for (std::size_t s = 0; s < n; ++s) {
    out[s] = std::max(0.0, Spline(Spline::Kind::cubic, b, shares[s], "Kerr power share in b").value(spin_b(hole_spin)));
    sum += out[s];
  }
  for (auto& x : out) x /= sum;
  return out;
}

double KerrMassLoss::spin_slope(double mass, double hole_spin) const {
  return hole_spin * (spin_ratio(mass, hole_spin) - 2.0);
}

}  // namespace ember::evaporation
