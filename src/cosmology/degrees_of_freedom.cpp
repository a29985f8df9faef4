#include "ember/cosmology/degrees_of_freedom.hpp"

#include <fmt/format.h>

#include <cmath>
#include <fstream>
#include <memory>
#include <sstream>
#include <vector>

#include "ember/core/data_files.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/gsl_tools.hpp"
#include "ember/core/text.hpp"

namespace ember::cosmology {

// Steffen's monotone cubic in ln T: g_* has no overshoot across the QCD and electroweak steps.
struct DegreesOfFreedom::Splines {
  Spline rho, s;
};

DegreesOfFreedom DegreesOfFreedom::load(const std::filesystem::path& file) {
  std::ifstream in(file);
  if (!in) throw InputError(fmt::format("{}: cannot be read; expected the g_*(T) table", file.string()));
  std::vector<double> ln_t, rho, s;
  std::string line;
  for (int n = 1; std::getline(in, line); ++n) {
    const std::string t = trim(line);
    if (t.empty() || t[0] == '#') continue;
    std::istringstream f(t);
    std::string a, b, c, extra;
    f >> a >> b >> c;
    const auto x = parse_real(a), y = parse_real(b), z = parse_real(c);
    if (!x || !y || !z || (f >> extra) || !(*x > 0) || !(*y > 0) || !(*z > 0))
      throw InputError(
          fmt::format("{}:{}: \"{}\"; expected T [GeV], g_rho and g_s, all positive", file.string(), n, t));
    if (!ln_t.empty() && !(std::log(*x) > ln_t.back()))
      throw InputError(
          fmt::format("{}:{}: T = {} not above the previous row; expected increasing T", file.string(), n, a));
    ln_t.push_back(std::log(*x));
    rho.push_back(*y);
    s.push_back(*z);
  }
  if (ln_t.size() < 4) throw InputError(fmt::format("{}: {} rows; expected at least 4", file.string(), ln_t.size()));
  DegreesOfFreedom d;
  d.source_ = file.string();
  d.t_min_ = std::exp(ln_t.front());
  d.t_max_ = std::exp(ln_t.back());
  d.low_rho_ = rho.front();
  d.low_s_ = s.front();
  d.high_rho_ = rho.back();
  d.high_s_ = s.back();
  d.s_ = std::make_shared<Splines>(Splines{Spline(Spline::Kind::steffen, ln_t, rho, "g_*rho(T)"),
                                           Spline(Spline::Kind::steffen, ln_t, s, "g_*s(T)")});
  return d;
}

DegreesOfFreedom DegreesOfFreedom::load_default() {
  return load(data_file("relativistic_dof.tsv"));
}

void DegreesOfFreedom::set_low_temperature_limit(double g_rho0, double g_s0) {
  low_rho_ = g_rho0;
  low_s_ = g_s0;
}

double DegreesOfFreedom::g_rho(double t) const {
  if (t <= t_min_) return low_rho_;
  if (t >= t_max_) return high_rho_;
  return s_->rho.value(std::log(t));
}

double DegreesOfFreedom::g_s(double t) const {
  if (t <= t_min_) return low_s_;
  if (t >= t_max_) return high_s_;
  return s_->s.value(std::log(t));
}

}  // namespace ember::cosmology
