#include "ember/cosmology/background.hpp"

#include <fmt/format.h>
#include <yaml-cpp/yaml.h>

#include <cmath>
#include <functional>
#include <optional>
#include <vector>

#include "ember/core/embedded.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/finite.hpp"
#include "ember/core/gsl_tools.hpp"
#include "ember/core/text.hpp"
#include "ember/units/constants.hpp"
#include "ember/units/quantity.hpp"

namespace ember::cosmology {

namespace {
using units::pi;
// The background is tabulated from this temperature (GeV) down to today, in steps of ln a.
constexpr double t_top = 1e19;
constexpr double ln_a_step = 0.01;
// H0 = 100 h km/s/Mpc in GeV.
const double h100 = 1e5 / (1e6 * units::si::parsec) / units::second;

YAML::Node embedded() {
  return YAML::Load(std::string(embedded::cosmology_yaml()));
}
}  // namespace

Parameters planck2018() {
  const YAML::Node n = embedded();
  Parameters p;
  p.hubble = parse_real(n["hubble"].Scalar()).value();
  p.omega_b_h2 = parse_real(n["omega_b_h2"].Scalar()).value();
  p.omega_cdm_h2 = parse_real(n["omega_cdm_h2"].Scalar()).value();
  p.cmb_temperature = units::parse_quantity(n["cmb_temperature"].Scalar(), units::temperature).value;
  p.n_eff = parse_real(n["n_eff"].Scalar()).value();
  return p;
}

void Parameters::validate() const {
  const auto require = [](bool ok, const char* field, double v, const char* rule) {
    if (!ok) throw InputError(fmt::format("cosmology: {} = {}: {}", field, format_real(v), rule));
  };
  require(hubble >= 0.3 && hubble <= 1.2, "hubble", hubble, "expected between 0.3 and 1.2");
  require(omega_b_h2 >= 0 && omega_b_h2 <= 0.1, "omega_b_h2", omega_b_h2, "expected between 0 and 0.1");
  require(omega_cdm_h2 >= 0.001 && omega_cdm_h2 <= 0.5, "omega_cdm_h2", omega_cdm_h2, "expected between 0.001 and 0.5");
  require(cmb_temperature > 0, "cmb_temperature", cmb_temperature, "expected > 0");
  require(n_eff >= 0 && n_eff <= 10, "n_eff", n_eff, "expected between 0 and 10");
}

struct Background::Tables {
  std::vector<double> ln_a, ln_t, ln_chi_plus, ln_temp;
  std::optional<Spline> t_of_a, a_of_t, chi_of_a;  // natural cubics in ln a, ln t
  double chi_total = 0;                            // particle horizon
};

namespace {}  // namespace

Background::Background(const Parameters& parameters, DegreesOfFreedom dof) : p_(parameters), dof_(std::move(dof)) {
  if (!(p_.cmb_temperature > 0)) p_.cmb_temperature = 2.7255 * units::kelvin;
  p_.validate();
  g_rho0_ = 2 + 1.75 * p_.n_eff * std::pow(4.0 / 11, 4.0 / 3);
  g_s0_ = 2 + 1.75 * p_.n_eff * (4.0 / 11);
  dof_.set_low_temperature_limit(g_rho0_, g_s0_);
  const double h0 = p_.hubble * h100;
  rho_crit_ = 3 * h0 * h0 / (8 * pi * units::newton_G);
  rho_m0_ = (p_.omega_b_h2 + p_.omega_cdm_h2) / (p_.hubble * p_.hubble) * rho_crit_;
  rho_l_ = rho_crit_ - rho_m0_ - radiation_density(p_.cmb_temperature);  // flat

  auto t = std::make_shared<Tables>();
  const double ln_a_min = std::log(scale_factor_at_temperature(t_top));
  const int n = static_cast<int>(std::ceil(-ln_a_min / ln_a_step)) + 1;
  t->ln_a.resize(static_cast<std::size_t>(n));
  for (int i = 0; i < n; ++i) t->ln_a[static_cast<std::size_t>(i)] = ln_a_min * (1 - static_cast<double>(i) / (n - 1));
  // dt/d ln a = 1/H; before the first node the universe is radiation dominated at fixed g:
  // t = 1/(2H) (derived from H ~ a^-2).
  const std::function<double(double)> dt = [&](double u) { return 1 / hubble_rate(std::exp(u)); };
  const std::function<double(double)> dchi = [&](double u) { return 1 / (std::exp(u) * hubble_rate(std::exp(u))); };
  std::vector<double> time(static_cast<std::size_t>(n)), chi(static_cast<std::size_t>(n));
  time[0] = 1 / (2 * hubble_rate(std::exp(t->ln_a[0])));
  for (std::size_t i = 1; i < time.size(); ++i) time[i] = time[i - 1] + gauss_kronrod21(dt, t->ln_a[i - 1], t->ln_a[i]);
  chi.back() = 0;
  for (std::size_t i = chi.size() - 1; i-- > 0;)
    chi[i] = chi[i + 1] + gauss_kronrod21(dchi, t->ln_a[i], t->ln_a[i + 1]);
  // Comoving distance before the first node (radiation era, 1/(aH) ~ a): 1/(a H) there.
  t->chi_total = chi[0] + 1 / (std::exp(t->ln_a[0]) * hubble_rate(std::exp(t->ln_a[0])));
  t->ln_t.resize(time.size());
  t->ln_chi_plus.resize(chi.size());
  t->ln_temp.resize(chi.size());
  for (std::size_t i = 0; i < time.size(); ++i) {
    t->ln_t[i] = std::log(time[i]);
    // ln(chi + c) with c > 0 so the last node (chi = 0) stays finite: c = 1/(H0) * 1e-6.
    t->ln_chi_plus[i] = std::log(chi[i] + 1e-6 / h0);
    t->ln_temp[i] = std::log(temperature(std::exp(t->ln_a[i])));
  }
  t->t_of_a.emplace(Spline::Kind::cubic, t->ln_a, t->ln_t, "background t(a)");
  t->a_of_t.emplace(Spline::Kind::cubic, t->ln_t, t->ln_a, "background a(t)");
  t->chi_of_a.emplace(Spline::Kind::cubic, t->ln_a, t->ln_chi_plus, "background chi(a)");
  t_ = t;
}

double Background::radiation_density(double temperature) const {
  return pi * pi / 30 * dof_.g_rho(temperature) * std::pow(temperature, 4);
}

double Background::temperature(double a) const {
  // g_s(T) T^3 a^3 = g_s0 T0^3, solved by fixed-point iteration (g_s varies slowly in ln T).
  double t = p_.cmb_temperature / a;
  for (int i = 0; i < 50; ++i) {
    const double next = p_.cmb_temperature / a * std::cbrt(g_s0_ / dof_.g_s(t));
    if (std::abs(next - t) <= 1e-14 * t) return next;
    t = next;
  }
  return t;
}

double Background::scale_factor_at_temperature(double temp) const {
  // a = (T0/T) (g_s0/g_s(T))^(1/3), exact.
  return p_.cmb_temperature / temp * std::cbrt(g_s0_ / dof_.g_s(temp));
}

double Background::hubble_from(double a, double temp) const {
  return std::sqrt(8 * pi * units::newton_G / 3 * (radiation_density(temp) + rho_m0_ / (a * a * a) + rho_l_));
}

double Background::hubble_rate(double a) const {
  return hubble_from(a, temperature(a));
}

double Background::time(double a) const {
  const double u = std::log(a);
  if (u <= t_->ln_a.front()) return 1 / (2 * hubble_rate(a));
  return std::exp(t_->t_of_a->value(std::min(u, 0.0)));
}

double Background::scale_factor(double time) const {
  const double u = std::log(time);
  if (u <= t_->ln_t.front()) {
    // Radiation era above the table: a ~ t^(1/2) at fixed g_rho (derived from H = 1/(2t)).
    return std::exp(t_->ln_a.front()) * std::sqrt(time / std::exp(t_->ln_t.front()));
  }
  if (u >= t_->ln_t.back()) return 1.0;
  return std::exp(t_->a_of_t->value(u));
}

double Background::lightcone_radius(double time) const {
  // Module boundary (no NaN leaves a module): the time a caller asks about must be finite.
  require_finite(time, "cosmology: background", "time", "the past light cone of a decay",
                 "a formation mass inside the scan's range (1e-6 g to 1e50 g)");
  const double a = scale_factor(time);
  const double u = std::log(a);
  // Before the first node (radiation era) the light travelled 1/(a H) since the big bang.
  if (u <= t_->ln_a.front()) return t_->chi_total - 1 / (a * hubble_rate(a));
  const double h0 = p_.hubble * h100;
  return std::max(0.0, std::exp(t_->chi_of_a->value(std::min(u, 0.0))) - 1e-6 / h0);
}

double Background::particle_horizon() const {
  return t_->chi_total;
}
double Background::age() const {
  return std::exp(t_->ln_t.back());
}
double Background::horizon_mass(double time) const {
  return 1 / (2 * units::newton_G * hubble_rate(scale_factor(time)));
}
double Background::critical_density() const {
  return rho_crit_;
}
double Background::omega_cdm() const {
  return p_.omega_cdm_h2 / (p_.hubble * p_.hubble);
}

}  // namespace ember::cosmology
