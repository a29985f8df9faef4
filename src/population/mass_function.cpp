#include "ember/population/mass_function.hpp"

#include <fmt/format.h>
#include <gsl/gsl_sf_gamma.h>

#include <cmath>
#include <fstream>
#include <optional>
#include <sstream>

#include "ember/core/errors.hpp"
#include "ember/core/gsl_tools.hpp"
#include "ember/core/input_file.hpp"
#include "ember/core/text.hpp"
#include "ember/units/constants.hpp"
#include "ember/units/quantity.hpp"

namespace ember::population {

namespace {

class Monochromatic final : public MassFunction {
 public:
  explicit Monochromatic(double m) : m_(m) {}
  double psi(double mass) const override { return mass == m_ ? INFINITY : 0.0; }
  double low() const override { return m_; }
  double high() const override { return m_; }
  bool monochromatic() const override { return true; }
  double characteristic_mass() const override { return m_; }
  std::string description() const override { return fmt::format("monochromatic at {:.4g} g", m_ / units::gram); }

 private:
  double m_;
};

class Lognormal final : public MassFunction {
 public:
  Lognormal(double mc, double s) : mc_(mc), s_(s) {}
  double psi(double m) const override {
    const double l = std::log(m / mc_);
    return std::exp(-l * l / (2 * s_ * s_)) / (std::sqrt(2 * units::pi) * s_ * m);
  }
  double low() const override { return mc_ * std::exp(-7.5 * s_); }  // 7.5 sigma: 1e-13 of the weight
  double high() const override { return mc_ * std::exp(7.5 * s_); }
  double characteristic_mass() const override { return mc_; }
  std::string description() const override {
    return fmt::format("lognormal, peak {:.4g} g, width {}", mc_ / units::gram, format_real(s_));
  }

 private:
  double mc_, s_;
};

class PowerLaw final : public MassFunction {
 public:
  PowerLaw(double lo, double hi, double p) : lo_(lo), hi_(hi), p_(p) {
    norm_ = std::abs(p + 1) < 1e-12 ? std::log(hi / lo) : (std::pow(hi, p + 1) - std::pow(lo, p + 1)) / (p + 1);
  }
  double psi(double m) const override { return (m < lo_ || m > hi_) ? 0.0 : std::pow(m, p_) / norm_; }
  double low() const override { return lo_; }
  double high() const override { return hi_; }
  double characteristic_mass() const override { return hi_; }
  std::string description() const override {
    return fmt::format("power law M^{} from {:.4g} g to {:.4g} g", format_real(p_), lo_ / units::gram,
                       hi_ / units::gram);
  }

 private:
  double lo_, hi_, p_, norm_;
};

class CriticalCollapse final : public MassFunction {
 public:
  CriticalCollapse(double mf, double k) : mf_(mf), k_(k) {
    norm_ = std::pow(mf, k + 1) * gsl_sf_gamma((k + 1) / k) / k;
  }
  double psi(double m) const override { return std::pow(m, k_) * std::exp(-std::pow(m / mf_, k_)) / norm_; }
  double low() const override { return mf_ * std::pow(1e-13, 1 / (k_ + 1)); }
  double high() const override { return mf_ * std::pow(30.0, 1 / k_); }  // e^-30 of the peak beyond
  double characteristic_mass() const override { return mf_; }
  std::string description() const override {
    return fmt::format("critical collapse, cut-off {:.4g} g, exponent {}", mf_ / units::gram, format_real(k_));
  }

 private:
  double mf_, k_, norm_;
};

class Tabulated final : public MassFunction {
 public:
  Tabulated(std::vector<double> ln_m, std::vector<double> psi, std::string file)
      : ln_m_(std::move(ln_m)), psi_(std::move(psi)), file_(std::move(file)) {
    // Normalise: int psi dM = int psi e^u du with psi linear in u = ln M between nodes, exactly:
    // each segment gives e^{u1} (psi1 - s) - e^{u0} (psi0 - s), s = (psi1 - psi0)/(u1 - u0) (derived).
    double total = 0;
    for (std::size_t i = 0; i + 1 < ln_m_.size(); ++i) {
      const double s = (psi_[i + 1] - psi_[i]) / (ln_m_[i + 1] - ln_m_[i]);
      total += std::exp(ln_m_[i + 1]) * (psi_[i + 1] - s) - std::exp(ln_m_[i]) * (psi_[i] - s);
    }
    if (!(total > 0) || !std::isfinite(total))
      throw InputError(fmt::format("{}: psi integrates to {}; expected a positive total", file_, total));
    for (double& p : psi_) p /= total;
    spline_.emplace(Spline::Kind::linear, ln_m_, psi_, file_);
  }
  double psi(double m) const override {
    const double u = std::log(m);
    if (u < ln_m_.front() || u > ln_m_.back()) return 0.0;
    return spline_->value(u);
  }
  double low() const override { return std::exp(ln_m_.front()); }
  double high() const override { return std::exp(ln_m_.back()); }
  double characteristic_mass() const override { return std::sqrt(low() * high()); }
  std::string description() const override { return "table " + file_; }

 private:
  std::vector<double> ln_m_, psi_;
  std::string file_;
  std::optional<Spline> spline_;  // psi linear in ln M, as normalised above
};

}  // namespace

namespace {
class CutBelow final : public MassFunction {
 public:
  CutBelow(std::unique_ptr<MassFunction> s, double cut) : s_(std::move(s)), cut_(cut) {}
  double psi(double m) const override { return m < cut_ ? 0.0 : s_->psi(m); }
  double low() const override { return std::max(cut_, s_->low()); }
  double high() const override { return std::max(cut_, s_->high()); }
  double characteristic_mass() const override { return s_->characteristic_mass(); }
  std::string description() const override {
    return fmt::format("{}, cut below {:.4g} g", s_->description(), cut_ / units::gram);
  }

 private:
  std::unique_ptr<MassFunction> s_;
  double cut_;
};
}  // namespace

double share_outside(const MassFunction& s, double from, double to) {
  if (s.monochromatic()) return s.characteristic_mass() >= from && s.characteristic_mass() <= to ? 0.0 : 1.0;
  const int n = 4000;
  const double lo = std::log(s.low()), hi = std::log(s.high());
  double total = 0, outside = 0;
  for (int i = 0; i < n; ++i) {
    const double a = lo + (hi - lo) * i / n, b = lo + (hi - lo) * (i + 1) / n;
    const double piece = 0.5 * (std::exp(a) * s.psi(std::exp(a)) + std::exp(b) * s.psi(std::exp(b))) * (b - a);
    total += piece;
    const double mid = std::exp(0.5 * (a + b));
    if (mid < from || mid > to) outside += piece;
  }
  return total > 0 ? outside / total : 0.0;
}

std::unique_ptr<MassFunction> cut_below(std::unique_ptr<MassFunction> s, double mass) {
  return std::make_unique<CutBelow>(std::move(s), mass);
}

std::unique_ptr<MassFunction> monochromatic(double mass) {
  return std::make_unique<Monochromatic>(mass);
}
std::unique_ptr<MassFunction> lognormal(double peak, double width) {
  return std::make_unique<Lognormal>(peak, width);
}
std::unique_ptr<MassFunction> power_law(double lo, double hi, double p) {
  return std::make_unique<PowerLaw>(lo, hi, p);
}
std::unique_ptr<MassFunction> critical_collapse(double mf, double k) {
  return std::make_unique<CriticalCollapse>(mf, k);
}

namespace {
// A mass-function table has a few thousand rows; this is room for a million.
constexpr std::uintmax_t max_table_bytes = 64u << 20;
}  // namespace

std::unique_ptr<MassFunction> tabulated(const std::string& file, const std::string& unit) {
  return tabulated_text(read_input_file(file, "a mass-function table (mass, psi)", max_table_bytes), file, unit);
}

std::unique_ptr<MassFunction> tabulated_text(std::string_view text, const std::string& file, const std::string& unit) {
  const double factor = units::parse_quantity("1 " + unit, units::mass).value;
  std::istringstream in{std::string(text)};
  std::vector<double> ln_m, psi;
  std::string line;
  for (int n = 1; std::getline(in, line); ++n) {
    const std::string t = trim(line);
    if (t.empty() || t[0] == '#') continue;
    std::istringstream f(t);
    std::string a, b, extra;
    f >> a >> b;
    const auto m = parse_real(a), p = parse_real(b);
    if (!m || !p || (f >> extra) || !(*m > 0) || *p < 0)
      throw InputError(
          fmt::format("{}:{}: \"{}\"; expected a mass > 0 ({}) and psi >= 0", file, n, printable(t), unit));
    const double u = std::log(*m * factor), per_gev = *p / factor;
    if (!std::isfinite(u) || !std::isfinite(per_gev))
      throw InputError(fmt::format("{}:{}: \"{}\" overflows in GeV; expected a mass and psi of physical size", file, n,
                                   printable(t)));
    if (!ln_m.empty() && !(u > ln_m.back()))
      throw InputError(
          fmt::format("{}:{}: mass {} not above the previous row; expected increasing masses", file, n, printable(a)));
    ln_m.push_back(u);
    psi.push_back(per_gev);
  }
  if (ln_m.size() < 2) throw InputError(fmt::format("{}: {} rows; expected at least 2", file, ln_m.size()));
  return std::make_unique<Tabulated>(std::move(ln_m), std::move(psi), file);
}

}  // namespace ember::population
