#include "ember/evaporation/mass_loss.hpp"

#include <fmt/format.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_integration.h>

#include <chrono>
#include <cmath>
#include <functional>
#include <optional>

#include "ember/core/errors.hpp"
#include "ember/core/finite.hpp"
#include "ember/core/gsl_status.hpp"
#include "ember/core/gsl_tools.hpp"
#include "ember/core/progress.hpp"
#include "ember/core/record.hpp"
#include "ember/units/constants.hpp"
#include "kernel_grid.hpp"

namespace ember::evaporation {

namespace {
using kernel_grid::a_of;
using kernel_grid::spin_order;
using kernel_grid::v_of;
using units::pi;

// 1/(e^{8 pi x} -+ 1), minus for bosons.
double thermal(double x, bool fermion) {
  const double a = 8 * pi * x;
  return fermion ? 1.0 / (std::expm1(a) + 2.0) : 1.0 / std::expm1(a);
}

}  // namespace

double hawking_temperature(double mass) {
  return units::planck_mass * units::planck_mass / (8 * pi * mass);
}

double parton_weight(double temperature, const MassLossOptions& o) {
  return 0.5 * std::erfc(-std::log(temperature / o.qcd_scale) / (std::sqrt(2.0) * o.qcd_width));
}

double hadron_weight(double temperature, const MassLossOptions& o) {
  return 0.5 * std::erfc(std::log(temperature / o.qcd_scale) / (std::sqrt(2.0) * o.qcd_width));
}

double macgibbon_alpha_unit() {
  // 5.34e25 g^3 s^-1 (MacGibbon, PRD 44 (1991) 376), converted to GeV^4 = GeV^3 / GeV^-1.
  return 5.34e25 * units::gram * units::gram * units::gram / units::second;
}

void MassLossOptions::validate() const {
  if (!(qcd_scale >= qcd_scale_min && qcd_scale <= qcd_scale_max))
    throw InputError(fmt::format("mass-loss options: qcd_scale = {} GeV: must lie between {} GeV and {} GeV", qcd_scale,
                                 qcd_scale_min, qcd_scale_max));
  if (!(qcd_width >= qcd_width_min && qcd_width <= qcd_width_max))
    throw InputError(fmt::format("mass-loss options: qcd_width = {}: must lie between {} and {} (a width in ln T_H)",
                                 qcd_width, qcd_width_min, qcd_width_max));
  if (nodes_per_decade < 5 || nodes_per_decade > 10000)
    throw InputError(fmt::format("mass-loss options: nodes_per_decade = {}: must lie in [5, 10000]", nodes_per_decade));
}

// The emission kernel of one spin: S(x) = sum_l (2l+1) Gamma_l(x) from the greybody table.
struct MassLoss::Kernel {
  int twice_spin = 0;
  bool fermion = false;
  std::shared_ptr<const greybody::Table> greybody;
  std::optional<Spline> ln_j;  // ln J against v (natural cubic)
  double j_at_min = 0;

  double weighted(double x) const { return greybody->weighted_sum(twice_spin, x).value; }
  double energy_integrand(double x) const { return x * weighted(x) * thermal(x, fermion) / (2 * pi); }

  // J(a) = (1/2pi) int_a^inf x S(x) th(x) dx.
  double J(double a) const {
    if (a <= tolerance::kernel_a_min) return j_at_min;
    if (a >= tolerance::kernel_a_max) return 0.0;
    return std::exp(ln_j->value(v_of(a)));
  }

  // (1/2pi) int dx x S(p(x)) th(x) over x >= m, p = sqrt(x^2 - m^2): substituting p,
  // = (1/2pi) int dp p S(p) th(sqrt(p^2 + m^2)).
  double momentum_window(double m) const {
    if (m >= tolerance::kernel_a_max) return 0.0;
    const double x_top = m + 3.0;  // e^{-8 pi * 3} ~ 1e-33 of the start beyond
    const double p_lo = 0.0, p_hi = std::sqrt(x_top * x_top - m * m);
    const std::function<double(double)> f = [&](double p) {
      return p * weighted(p) * thermal(std::sqrt(p * p + m * m), fermion) / (2 * pi);
    };
    gsl_function g{[](double x, void* q) { return (*static_cast<const std::function<double(double)>*>(q))(x); },
                   const_cast<std::function<double(double)>*>(&f)};
    const IntegrationWorkspace w = integration_workspace(200);
    double result = 0, abserr = 0;
    use_gsl_status_codes();
    const int status = gsl_integration_qag(&g, p_lo, p_hi, 0.0, tolerance::window_quadrature_relative, 200,
                                           GSL_INTEG_GAUSS31, w.get(), &result, &abserr);
    if (status != GSL_SUCCESS && status != GSL_EROUND)
      throw NumericalError(
          "momentum-window quadrature (GSL qag)",
          fmt::format("spin {}/2, m = {:.4g}, momenta [0, {:.4g}]: {}", twice_spin, m, p_hi, gsl_strerror(status)));
    return result;
  }
};

namespace {
MassLoss::Kernel build_kernel(int twice_spin, const std::shared_ptr<const greybody::Table>& table) {
  MassLoss::Kernel k;
  k.twice_spin = twice_spin;
  k.fermion = twice_spin % 2 == 1;
  k.greybody = table;
  const std::function<double(double)> f = [&](double x) { return k.energy_integrand(x); };
  const double v_lo = v_of(tolerance::kernel_a_min), v_hi = v_of(tolerance::kernel_a_max);
  const int n = static_cast<int>(std::ceil((v_hi - v_lo) / tolerance::kernel_node_spacing)) + 1;
  std::vector<double> v(static_cast<std::size_t>(n)), ln_j(static_cast<std::size_t>(n));
  double cumulative = gauss_kronrod21(f, tolerance::kernel_a_max, tolerance::kernel_a_max + 3.0);
  for (int i = n - 1; i >= 0; --i) {
    const auto I = static_cast<std::size_t>(i);
    v[I] = v_lo + (v_hi - v_lo) * i / (n - 1);
    if (i < n - 1) cumulative += gauss_kronrod21(f, a_of(v[I]), a_of(v[I + 1]));
    ln_j[I] = std::log(cumulative);
  }
  k.ln_j.emplace(Spline::Kind::cubic, v, ln_j, "emission kernel J(a)");
  k.j_at_min = std::exp(ln_j.front());
  return k;
}
}  // namespace

struct MassLoss::Tabulated {
  std::optional<Spline> ln_alpha;  // against ln M (M in GeV), natural cubic
  std::vector<double> ln_alpha_nodes;
  double ln_m_lo = 0, ln_m_hi = 0, alpha_lo = 0, alpha_hi = 0;
};

// The species' emission integral over E >= m, times its weight at this hole's temperature.
double MassLoss::window(const Species& s, double mass) const {
  const Kernel& k = (*kernels_)[static_cast<std::size_t>(kernel_grid::spin_index(s.twice_spin))];
  const double a_m = s.mass * mass / (units::planck_mass * units::planck_mass);  // x = E M / M_Pl^2 at E = m
  const double t = hawking_temperature(mass);
  const double weight = s.window == Window::partons   ? parton_weight(t, options_)
                        : s.window == Window::hadrons ? hadron_weight(t, options_)
                                                      : 1.0;
  if (!(weight > 0)) return 0.0;
  if (options_.argument == GreybodyArgument::momentum && s.mass > 0) return weight * k.momentum_window(a_m);
  return weight * k.J(a_m);
}

std::vector<double> MassLoss::species_alpha(double mass) const {
  const double m4 = std::pow(units::planck_mass, 4);
  std::vector<double> out;
  for (const auto& s : particles_.species) out.push_back(m4 * s.dof * window(s, mass));
  return out;
}

double MassLoss::alpha_direct(double mass) const {
  double sum = 0;
  for (double a : species_alpha(mass)) sum += a;
  return sum;
}

double MassLoss::alpha(double mass) const {
  const double u = std::log(mass);
  if (u <= table_->ln_m_lo) return table_->alpha_lo;
  if (u >= table_->ln_m_hi) return table_->alpha_hi;
  // Module boundary (no NaN leaves a module): alpha leaves the evaporation module finite, or not at all.
  return require_finite(
      std::exp(table_->ln_alpha->value(u)), "evaporation: mass-loss table", "alpha(M)",
      [&] { return fmt::format("M = {:.6e} g", mass / units::gram); },
      "rebuilding the table (--no-cache) or a mass inside 1e-6 g to 1e50 g");
}

MassLoss::MassLoss(const greybody::Table& greybody, ParticleSet particles, const MassLossOptions& options)
    : MassLoss(greybody, std::move(particles), options, nullptr) {}

MassLoss MassLoss::from_nodes(const greybody::Table& greybody, ParticleSet particles, const MassLossOptions& options,
                              const std::string& text) {
  return MassLoss(greybody, std::move(particles), options, &text);
}

std::string MassLoss::nodes_text() const {
  RecordWriter w;
  w.word("ember-alpha-nodes").whole(1).end_line();
  w.word("error").real(summary_.max_midpoint_error).end_line();
  w.word("nodes").whole(static_cast<long long>(table_->ln_alpha_nodes.size()));
  for (double x : table_->ln_alpha_nodes) w.real(x);
  w.end_line();
  return w.str();
}

MassLoss::MassLoss(const greybody::Table& greybody, ParticleSet particles, const MassLossOptions& options,
                   const std::string* nodes)
    : particles_(std::move(particles)), options_(options) {
  options_.validate();
  const auto start = std::chrono::steady_clock::now();
  const auto table = std::make_shared<const greybody::Table>(greybody);
  auto kernels = std::make_shared<std::vector<Kernel>>();
  for (const int ts : spin_order) kernels->push_back(build_kernel(ts, table));
  kernels_ = kernels;

  auto t = std::make_shared<Tabulated>();
  t->ln_m_lo = std::log(tolerance::table_min_gram * units::gram);
  t->ln_m_hi = std::log(tolerance::table_max_gram * units::gram);
  const int decades = static_cast<int>(std::lround((t->ln_m_hi - t->ln_m_lo) / std::log(10.0)));
  const int n = decades * options_.nodes_per_decade + 1;
  std::vector<double> u(static_cast<std::size_t>(n)), ln_a(static_cast<std::size_t>(n));
  std::optional<double> known_error;
  if (nodes) {
    RecordReader in(*nodes, "alpha(M) nodes");
    in.expect("ember-alpha-nodes");
    in.expect("1");
    in.expect("error");
    known_error = in.real();
    in.expect("nodes");
    if (in.whole() != n) throw InputError(fmt::format("alpha(M) nodes: not {} nodes; expected this build's grid", n));
    for (auto& x : ln_a) x = in.real();
  }
  // Counted in direct sums: n nodes, then n - 1 midpoint checks.
  Progress progress("alpha(M) table", known_error ? 0 : 2L * n - 1, options_.quiet || known_error);
  for (int i = 0; i < n; ++i) {
    const auto I = static_cast<std::size_t>(i);
    u[I] = t->ln_m_lo + (t->ln_m_hi - t->ln_m_lo) * i / (n - 1);
    if (known_error) {
      if (!std::isfinite(ln_a[I])) throw InputError(fmt::format("alpha(M) nodes: node {} is not finite", i));
      continue;
    }
    const double a = alpha_direct(std::exp(u[I]));
    if (!(a > 0) || !std::isfinite(a))
      throw NumericalError("mass-loss table",
                           fmt::format("alpha = {} at M = {:.4e} g", a, std::exp(u[I]) / units::gram));
    ln_a[I] = std::log(a);
    progress.advance(i + 1);
  }
  t->ln_alpha.emplace(Spline::Kind::cubic, u, ln_a, "alpha(M) table");
  t->ln_alpha_nodes = ln_a;
  t->alpha_lo = std::exp(ln_a.front());
  t->alpha_hi = std::exp(ln_a.back());
  table_ = t;

  // The spline's error, measured against the direct sum at every interval midpoint (or as
  // measured when the nodes were first computed).
  if (known_error) summary_.max_midpoint_error = *known_error;
  for (int i = 0; i + 1 < n && !known_error; ++i) {
    const double mid = std::exp(0.5 * (u[static_cast<std::size_t>(i)] + u[static_cast<std::size_t>(i + 1)]));
    const double direct = alpha_direct(mid);
    summary_.max_midpoint_error = std::max(summary_.max_midpoint_error, std::abs(alpha(mid) - direct) / direct);
    progress.advance(n + i + 1);
  }
  progress.finish();
  summary_.nodes = n;
  summary_.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  relative_error_ = greybody.header().interpolation_error + 2 * summary_.max_midpoint_error;
  summary_.message =
      fmt::format("alpha(M) over {} species at {} nodes ({:g} to {:g} g), largest spline deviation {:.1e}, {:.2f} s",
                  particles_.species.size(), n, tolerance::table_min_gram, tolerance::table_max_gram,
                  summary_.max_midpoint_error, summary_.seconds);
}

}  // namespace ember::evaporation
