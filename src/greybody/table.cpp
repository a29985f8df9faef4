// The interpolating lookup over the greybody table.
#include "ember/greybody/table.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <optional>

#include "ember/core/errors.hpp"
#include "ember/core/gsl_tools.hpp"

namespace ember::greybody {

struct Table::Curve {
  int twice_spin = 0, twice_l = 0, power = 0;
  double x_min = 0, x_end = 0;
  double low_coefficient = 0, low_relative_error = 0;  // Gamma = C x^p below x_min
  double solver_relative_error = 0;                    // largest error/Gamma of the rows
  double end_reflection = 0;                           // |R|^2 at x_end
  std::optional<Spline> spline;                        // L = ln(Gamma/|R|^2) against ln x (natural cubic)

  double logit(double x) const { return spline->value(std::log(x)); }
};

namespace {

std::shared_ptr<const Table::Curve> make_curve(const std::vector<TableRow>& rows, std::size_t begin, std::size_t end) {
  auto c = std::make_shared<Table::Curve>();
  const TableRow& first = rows[begin];
  c->twice_spin = first.twice_spin;
  c->twice_l = first.twice_l;
  c->power = Mode{first.twice_spin, first.twice_l}.low_frequency_power();
  const std::size_t n = end - begin;
  if (n < 4)
    throw InputError(fmt::format("greybody table: spin {}, 2l = {}: {} rows; expected at least 4 per mode",
                                 spin_text(first.twice_spin), first.twice_l, n));
  std::vector<double> ln_x(n), logit(n);
  for (std::size_t i = 0; i < n; ++i) {
    const TableRow& r = rows[begin + i];
    ln_x[i] = std::log(r.x);
    logit[i] = std::log(r.transmission) - std::log(r.reflection);
    c->solver_relative_error = std::max(c->solver_relative_error, r.error / r.transmission);
  }
  c->spline.emplace(Spline::Kind::cubic, ln_x, logit,
                    fmt::format("greybody table: spin {}, 2l = {}", spin_text(first.twice_spin), first.twice_l));
  c->x_min = first.x;
  c->x_end = rows[end - 1].x;
  c->end_reflection = rows[end - 1].reflection;
  c->low_coefficient = first.transmission / std::pow(first.x, c->power);
  if (!std::isfinite(c->low_coefficient) || !std::isfinite(c->solver_relative_error) ||
      !std::all_of(logit.begin(), logit.end(), [](double v) { return std::isfinite(v); }))
    throw InputError(
        fmt::format("greybody table: spin {}, 2l = {}: rows starting at x = {} give a non-finite fit; "
                    "expected transmissions and reflections of physical size",
                    spin_text(first.twice_spin), first.twice_l, first.x));
  // d ln Gamma / d ln x = (1 - Gamma) dL/d ln x.
  const double slope = (1 - first.transmission) * c->spline->slope(ln_x[0]);
  c->low_relative_error = std::abs(slope - c->power);
  return c;
}

}  // namespace

Table::Table(TableHeader header, std::vector<TableRow> rows) : header_(header), rows_(std::move(rows)) {
  std::size_t begin = 0;
  for (std::size_t i = 1; i <= rows_.size(); ++i) {
    const bool boundary =
        i == rows_.size() || rows_[i].twice_spin != rows_[begin].twice_spin || rows_[i].twice_l != rows_[begin].twice_l;
    if (!boundary) continue;
    curves_.push_back(make_curve(rows_, begin, i));
    begin = i;
  }
}

const Table::Curve* Table::find(int twice_spin, int twice_l) const {
  for (const auto& c : curves_)
    if (c->twice_spin == twice_spin && c->twice_l == twice_l) return c.get();
  return nullptr;
}

std::vector<int> Table::twice_ls(int twice_spin) const {
  std::vector<int> out;
  for (const auto& c : curves_)
    if (c->twice_spin == twice_spin) out.push_back(c->twice_l);
  std::sort(out.begin(), out.end());
  return out;
}

namespace {
Estimate evaluate(const Table::Curve& c, double interpolation_error, double x) {
  if (x < c.x_min) {
    const double g = c.low_coefficient * std::pow(x, c.power);
    return {g, (c.low_relative_error + interpolation_error) * g};
  }
  if (x > c.x_end) return {1.0, std::max(c.end_reflection, 1e-14)};
  const double g = 1.0 / (1.0 + std::exp(-c.logit(x)));
  return {g, (interpolation_error + c.solver_relative_error) * g};
}
}  // namespace

Estimate Table::transmission(int twice_spin, int twice_l, double x) const {
  if (!(x > 0) || !std::isfinite(x))
    throw InputError(fmt::format("greybody lookup: x = {}; expected a finite x > 0", x));
  const Curve* c = find(twice_spin, twice_l);
  if (!c) {
    const auto ls = twice_ls(twice_spin);
    throw InputError(
        fmt::format("greybody lookup: spin {}, {} = {}: not in the table; expected {} up to {} "
                    "(or a direct solve)",
                    spin_text(twice_spin), twice_spin % 2 ? "j" : "l", 0.5 * twice_l, twice_spin % 2 ? "j" : "l",
                    ls.empty() ? 0.0 : 0.5 * ls.back()));
  }
  return evaluate(*c, header_.interpolation_error, x);
}

Estimate Table::weighted_sum(int twice_spin, double x) const {
  Estimate sum;
  double last = 0, before_last = 0;  // Gamma of the two highest tabulated l
  int last_twice_l = -1;
  for (const auto& c : curves_) {
    if (c->twice_spin != twice_spin) continue;
    const Estimate g = evaluate(*c, header_.interpolation_error, x);
    sum.value += (c->twice_l + 1) * g.value;
    sum.error += (c->twice_l + 1) * g.error;
    if (c->twice_l > last_twice_l) {
      before_last = last;
      last = g.value;
      last_twice_l = c->twice_l;
    }
  }
  // The untabulated partial waves: the next one, estimated by the ratio of the last two
  // (transmission falls with l at fixed x), bounds what the truncation leaves out.
  if (last_twice_l >= 0) {
    const double ratio = before_last > 0 ? std::min(1.0, last / before_last) : 1.0;
    sum.error += (last_twice_l + 3) * last * ratio;
  }
  return sum;
}

}  // namespace ember::greybody
