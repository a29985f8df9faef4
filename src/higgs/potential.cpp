#include "ember/higgs/potential.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <fstream>
#include <sstream>

#include "ember/core/errors.hpp"
#include "ember/core/gsl_tools.hpp"
#include "ember/core/hash.hpp"
#include "ember/core/text.hpp"
#include "ember/core/uniform_cubic.hpp"
#include "ember/units/constants.hpp"

namespace ember::higgs {

namespace {
using units::pi;
constexpr double mbar2 = units::reduced_planck_mass * units::reduced_planck_mass;
}  // namespace

double Potential::quartic(double h) const {
  return 4 * value(h) / (h * h * h * h);
}

// --- Standard Model ----------------------------------------------------------------------------
struct StandardModelPotential::Table {
  UniformCubic lambda_eff;  // against t = ln h
};

double StandardModelPotential::lambda_eff_direct(double h) const {
  const double mu = std::clamp(h, running_->mu_min(), running_->mu_max());
  const Couplings c = running_->couplings(mu);
  const double g = running_->gamma_integral(mu);
  double bracket = c.lambda;
  if (options_.coleman_weinberg) {
    const double loop = 1 / (16 * pi * pi);
    const double kt = c.yt * c.yt / 2, kw = c.g2 * c.g2 / 4, kz = (c.g2 * c.g2 + c.gY2()) / 4;
    bracket += loop * (-12 * kt * kt * (std::log(kt) + 2 * g - 1.5) + 6 * kw * kw * (std::log(kw) + 2 * g - 5.0 / 6) +
                       3 * kz * kz * (std::log(kz) + 2 * g - 5.0 / 6));
  }
  return std::exp(4 * g) * bracket;
}

namespace {
// lambda_eff's nodes are this far apart in ln h (its stated error is measured below).
constexpr double lambda_eff_spacing = 0.05;
}  // namespace

StandardModelPotential::StandardModelPotential(std::shared_ptr<const Running> running, const StandardModelOptions& o)
    : running_(std::move(running)), options_(o) {
  if (!std::isfinite(o.lambda6) || !std::isfinite(o.lambda8))
    throw InputError("Standard Model potential: lambda6 and lambda8 must be finite numbers");
  const double t0 = std::log(running_->mu_min()), t1 = std::log(running_->mu_max());
  const int n = static_cast<int>(std::ceil((t1 - t0) / lambda_eff_spacing)) + 1;
  std::vector<double> t(static_cast<std::size_t>(n)), y(static_cast<std::size_t>(n));
  for (int i = 0; i < n; ++i) {
    t[static_cast<std::size_t>(i)] = t0 + (t1 - t0) * i / (n - 1);
    y[static_cast<std::size_t>(i)] = lambda_eff_direct(std::exp(t[static_cast<std::size_t>(i)]));
  }
  table_ = std::make_shared<const Table>(Table{UniformCubic(t0, t1, y)});
  for (int i = 0; i + 1 < n; ++i) {
    const double mid = 0.5 * (t[static_cast<std::size_t>(i)] + t[static_cast<std::size_t>(i + 1)]);
    interpolation_error_ =
        std::max(interpolation_error_, std::abs(lambda_eff(std::exp(mid)) - lambda_eff_direct(std::exp(mid))));
  }
  interpolation_error_ += running_->summary().max_midpoint_error;
}

namespace {
// lambda_eff and its t-derivatives at t = ln h: held constant outside the tabulated range, so
// the derivatives vanish there.
UniformCubic::Point lambda_eff_at(const UniformCubic& c, double t) {
  const bool inside = t > c.x0() && t < c.x1();
  UniformCubic::Point p = c.at(std::clamp(t, c.x0(), c.x1()));
  if (!inside) p.first = p.second = 0;
  return p;
}
}  // namespace

double StandardModelPotential::lambda_eff(double h) const {
  const UniformCubic& c = table_->lambda_eff;
  return c.value(std::clamp(std::log(h), c.x0(), c.x1()));
}

double StandardModelPotential::value(double h) const {
  return value_slope(h).value;
}

double StandardModelPotential::slope(double h) const {
  return value_slope(h).slope;
}

ValueSlope StandardModelPotential::value_slope(double h) const {
  const UniformCubic::Point p = lambda_eff_at(table_->lambda_eff, std::log(h));
  const double h2 = h * h, h3 = h2 * h, h4 = h2 * h2;
  ValueSlope v{p.value * h4 / 4, h3 * p.value + h3 * p.first / 4};
  // The operators' divisions cost a tenth of a shot's time: skipped when there are none.
  if (options_.lambda6 != 0 || options_.lambda8 != 0) {
    v.value += options_.lambda6 * h4 * h2 / (6 * mbar2) + options_.lambda8 * h4 * h4 / (8 * mbar2 * mbar2);
    v.slope += options_.lambda6 * h3 * h2 / mbar2 + options_.lambda8 * h3 * h3 * h / (mbar2 * mbar2);
  }
  return v;
}

double StandardModelPotential::curvature(double h) const {
  const UniformCubic::Point p = lambda_eff_at(table_->lambda_eff, std::log(h));
  const double l = p.value, d1 = p.first, d2 = p.second;
  // d/dh [h^3 (l + l'/4)] with d/dh = (1/h) d/dt.
  const double h2 = h * h;
  return h2 * (3 * l + 3 * d1 / 4 + d1 + d2 / 4) + 5 * options_.lambda6 * h2 * h2 / mbar2 +
         7 * options_.lambda8 * h2 * h2 * h2 / (mbar2 * mbar2);
}

std::string StandardModelPotential::description() const {
  const Inputs& in = running_->inputs();
  return fmt::format(
      "Standard Model, RG-improved ({}{}), M_t = {} GeV, M_h = {} GeV, alpha_s = {}{}", loop_order_name(in.loops),
      options_.coleman_weinberg ? ", one-loop Coleman-Weinberg terms, Landau gauge" : "", format_real(in.top_mass),
      format_real(in.higgs_mass), format_real(in.alpha_s),
      options_.lambda6 != 0 || options_.lambda8 != 0
          ? fmt::format(", lambda6 h^6/(6 Mbar^2) + lambda8 h^8/(8 Mbar^4) with lambda6 = {}, lambda8 = {} (Mbar the "
                        "reduced Planck mass)",
                        format_real(options_.lambda6), format_real(options_.lambda8))
          : "");
}

std::string StandardModelPotential::identity() const {
  const Inputs& in = running_->inputs();
  const RunOptions& ro = running_->options();
  return fmt::format(
      "standard_model mt {:a} mh {:a} as {:a} mw {:a} loops {} cw {} l6 {:a} l8 {:a} mu_max {:a} tol {:a} step {:a}",
      in.top_mass, in.higgs_mass, in.alpha_s, in.w_mass, in.loops, options_.coleman_weinberg ? 1 : 0, options_.lambda6,
      options_.lambda8, ro.mu_max, ro.relative_tolerance, ro.node_spacing);
}

// --- polynomial --------------------------------------------------------------------------------
PolynomialPotential::PolynomialPotential(double scale, std::vector<double> coefficients)
    : scale_(scale), a_(std::move(coefficients)) {
  if (!(scale > 0) || !std::isfinite(scale))
    throw InputError(fmt::format("polynomial potential: scale {} GeV; expected > 0", scale));
  if (a_.empty()) throw InputError("polynomial potential: no coefficients; expected at least one");
}

double PolynomialPotential::value(double h) const {
  const double z = h / scale_;
  double sum = 0;
  for (std::size_t n = a_.size(); n-- > 0;) sum = sum * z + a_[n];
  return std::pow(scale_, 4) * sum;
}

double PolynomialPotential::slope(double h) const {
  const double z = h / scale_;
  double sum = 0;
  for (std::size_t n = a_.size(); n-- > 1;) sum = sum * z + static_cast<double>(n) * a_[n];
  return std::pow(scale_, 3) * sum;
}

double PolynomialPotential::curvature(double h) const {
  const double z = h / scale_;
  double sum = 0;
  for (std::size_t n = a_.size(); n-- > 2;) sum = sum * z + static_cast<double>(n * (n - 1)) * a_[n];
  return scale_ * scale_ * sum;
}

std::string PolynomialPotential::identity() const {
  std::string out = fmt::format("polynomial scale {:a}", scale_);
  for (double a : a_) out += fmt::format(" {:a}", a);
  return out;
}

std::string PolynomialPotential::description() const {
  std::vector<std::string> terms;
  for (double a : a_) terms.push_back(format_real(a));
  return fmt::format("polynomial: scale {} GeV, coefficients [{}]", format_real(scale_), fmt::join(terms, ", "));
}

// --- table -------------------------------------------------------------------------------------
struct TabulatedPotential::Spline {
  ember::Spline v;  // V(phi), natural cubic
};

TabulatedPotential::TabulatedPotential(const std::filesystem::path& file) : file_(file.string()) {
  std::ifstream in(file);
  if (!in)
    throw InputError(fmt::format("{}: cannot be read; expected a potential table (phi in GeV, V in GeV^4)", file_));
  std::vector<double> phi, v;
  std::string line, all;
  for (int number = 1; std::getline(in, line); ++number) {
    all += line + "\n";
    const std::string t = trim(line);
    if (t.empty() || t[0] == '#') continue;
    std::istringstream fields(t);
    std::string a, b, extra;
    fields >> a >> b;
    const auto x = parse_real(a), y = parse_real(b);
    if (!x || !y || (fields >> extra))
      throw InputError(fmt::format("{}:{}: \"{}\"; expected two numbers: phi [GeV] and V [GeV^4]", file_, number, t));
    if (!phi.empty() && !(*x > phi.back()))
      throw InputError(
          fmt::format("{}:{}: phi {} after {}; expected phi increasing", file_, number, a, format_real(phi.back())));
    phi.push_back(*x);
    v.push_back(*y);
  }
  if (phi.size() < 4) throw InputError(fmt::format("{}: {} rows; expected at least 4", file_, phi.size()));
  phi_min_ = phi.front();
  phi_max_ = phi.back();
  content_fingerprint_ = fingerprint(all);
  spline_ = std::make_shared<Spline>(Spline{ember::Spline(ember::Spline::Kind::cubic, phi, v, file_)});
}

double TabulatedPotential::checked(double h) const {
  if (h < phi_min_ || h > phi_max_)
    throw InputError(
        fmt::format("{}: phi = {:.4g} GeV lies outside the table [{:.4g}, {:.4g}] GeV", file_, h, phi_min_, phi_max_));
  return h;
}
double TabulatedPotential::value(double h) const {
  return spline_->v.value(checked(h));
}
double TabulatedPotential::slope(double h) const {
  return spline_->v.slope(checked(h));
}
double TabulatedPotential::curvature(double h) const {
  return spline_->v.curvature(checked(h));
}
std::string TabulatedPotential::description() const {
  return "table " + file_;
}
// Keyed on the file's content, not its path, so an edited table never reuses a stale cache entry.
std::string TabulatedPotential::identity() const {
  return "table " + content_fingerprint_;
}
}  // namespace ember::higgs
