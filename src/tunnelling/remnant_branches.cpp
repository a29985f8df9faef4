#include "ember/tunnelling/remnant_branches.hpp"

#include <fmt/format.h>
#include <gsl/gsl_errno.h>

#include <algorithm>
#include <cmath>
#include <exception>
#include <memory>

#include "ember/core/errors.hpp"
#include "ember/core/gsl_tools.hpp"

namespace ember::tunnelling {

void RemnantSearchOptions::validate() const {
  const auto bad = [](const char* field, double v, const char* rule) {
    throw InputError(fmt::format("remnant search options: {} = {}: {}", field, v, rule));
  };
  if (!(fixed_point_tolerance > 0 && fixed_point_tolerance < 1e-6))
    bad("fixed_point_tolerance", fixed_point_tolerance, "must lie in (0, 1e-6)");
  if (fixed_point_iterations < 1) bad("fixed_point_iterations", fixed_point_iterations, "must be >= 1");
  if (!(strong_back_reaction > 0 && strong_back_reaction < 1))
    bad("strong_back_reaction", strong_back_reaction, "must lie in (0, 1)");
  if (!(scan_decades > 0 && scan_decades <= 10)) bad("scan_decades", scan_decades, "must lie in (0, 10]");
  if (scan_points < 3) bad("scan_points", scan_points, "must be >= 3");
  if (!(root_tolerance > 1e-15 && root_tolerance < 1e-3))
    bad("root_tolerance", root_tolerance, "must lie in (1e-15, 1e-3)");
  if (!(branch_point_slope > 0 && branch_point_slope < 1))
    bad("branch_point_slope", branch_point_slope, "must lie in (0, 1)");
  if (!(slope_step > 1e-10 && slope_step < 1e-1)) bad("slope_step", slope_step, "must lie in (1e-10, 0.1)");
}

namespace {

// Works in u = ln M_- with the mismatch g(u) = (M_- + DeltaM(M_-) - M_+) / M_+.
class Search {
 public:
  Search(double seed, const MassShiftFn& shift, const RemnantSearchOptions& o, RemnantSearch& out)
      : seed_(seed), shift_(shift), o_(o), out_(out) {}

  std::optional<double> mismatch(double u) {
    ++out_.evaluations;
    const std::optional<double> d = shift_(std::exp(u));
    if (!d) return std::nullopt;
    return (std::exp(u) + *d - seed_) / seed_;
  }

  // Fixed point M_- <- M_+ - DeltaM(M_-). Returns the remnant where it settles, with DeltaM there;
  // sets `strong` when DeltaM / M_+ exceeded the threshold on the way.
  std::optional<RemnantRoot> fixed_point(bool& strong) {
    double m = seed_;
    strong = false;
    for (int it = 0; it < o_.fixed_point_iterations; ++it) {
      ++out_.evaluations;
      const std::optional<double> d = shift_(m);
      if (!d) return std::nullopt;
      strong |= std::abs(*d) > o_.strong_back_reaction * seed_;
      const double next = seed_ - *d;
      if (!(next > 0)) return std::nullopt;
      // Settled: the mismatch m + DeltaM(m) - M_+ = m - next is below the tolerance.
      if (std::abs(next - m) <= o_.fixed_point_tolerance * seed_) {
        RemnantRoot r;
        r.remnant_mass = m;
        r.mass_shift = *d;
        return r;
      }
      m = next;
    }
    strong = true;  // did not settle: let the scan decide
    return std::nullopt;
  }

  void scan(std::vector<double>& found) {
    out_.scanned = true;
    struct Sample {
      double u;
      std::optional<double> g;
    };
    std::vector<Sample> s;
    const double top = std::log(seed_ * (1 - 1e-9)), span = o_.scan_decades * std::log(10.0);
    for (int i = 0; i < o_.scan_points; ++i) {
      const double u = top - span + span * i / (o_.scan_points - 1);
      s.push_back({u, mismatch(u)});
    }
    for (std::size_t i = 0; i + 1 < s.size(); ++i)
      if (s[i].g && s[i + 1].g && (*s[i].g < 0) != (*s[i + 1].g < 0)) add(found, root_in(s[i].u, s[i + 1].u));
    // A fold between samples: |g| dips without changing sign. Find the dip's extremum; if g
    // crosses zero there, the two branches about to merge both lie in this interval.
    for (std::size_t i = 1; i + 1 < s.size(); ++i) {
      if (!s[i - 1].g || !s[i].g || !s[i + 1].g) continue;
      const double sign = *s[i].g < 0 ? -1 : 1, a = sign * *s[i - 1].g, b = sign * *s[i].g, c = sign * *s[i + 1].g;
      if (!(a > 0 && c > 0 && b < a && b < c)) continue;
      const std::optional<double> u_min = extremum(s[i - 1].u, s[i].u, s[i + 1].u, sign);
      if (!u_min) continue;
      const std::optional<double> g_min = mismatch(*u_min);
      if (!g_min || sign * *g_min >= 0) continue;
      add(found, root_in(s[i - 1].u, *u_min));
      add(found, root_in(*u_min, s[i + 1].u));
    }
  }

  void add(std::vector<double>& found, std::optional<double> u) {
    if (!u) return;
    for (double f : found)
      if (std::abs(f - *u) < 1e-6) return;
    found.push_back(*u);
  }

  RemnantRoot describe(double u, bool with_slope, const std::optional<RemnantRoot>& known) {
    RemnantRoot r;
    if (known && std::abs(std::log(known->remnant_mass) - u) < 1e-6) {
      r = *known;
    } else {
      r.remnant_mass = std::exp(u);
      ++out_.evaluations;
      r.mass_shift = shift_(r.remnant_mass).value_or(NAN);
    }
    if (with_slope) {
      const double h = o_.slope_step;
      const std::optional<double> up = mismatch(u + h), down = mismatch(u - h);
      if (up && down) {
        // dM_+/dM_- = M_+ (g(u+h) - g(u-h)) / (M_- (e^h - e^-h)).
        r.slope = seed_ * (*up - *down) / (r.remnant_mass * 2 * std::sinh(h));
        r.near_branch_point = std::abs(*r.slope) < o_.branch_point_slope;
      }
    }
    return r;
  }

 private:
  double seed_;
  const MassShiftFn& shift_;
  const RemnantSearchOptions& o_;
  RemnantSearch& out_;

  // A point with no bubble ends a search: it is thrown past GSL (core/gsl_tools keeps it until GSL
  // has returned) and the search gives no answer.
  struct NoBubble {};
  double signed_mismatch(double u, double sign) {
    const std::optional<double> g = mismatch(u);
    if (!g) throw NoBubble{};
    return sign * *g;
  }

  // Brent's method on g over [lo, hi] (a sign change), to hi - lo < root_tolerance in ln M_-.
  std::optional<double> root_in(double lo, double hi) {
    try {
      const BrentResult r = brent_root([&](double u) { return signed_mismatch(u, 1); }, lo, hi, o_.root_tolerance);
      if (r.status != GSL_SUCCESS) return std::nullopt;
      return r.x;
    } catch (const NoBubble&) {
      return std::nullopt;
    }
  }

  // The minimum of sign * g over [lo, hi] with g(mid) below both ends (Brent's minimiser), to 1e-8
  // in ln M_-; it stops once g dips below zero: the crossing is all the caller needs.
  std::optional<double> extremum(double lo, double mid, double hi, double sign) {
    constexpr double crossing = 0;
    try {
      const BrentResult r =
          brent_minimum([&](double u) { return signed_mismatch(u, sign); }, mid, lo, hi, 1e-8, 100, &crossing);
      if (r.status != GSL_SUCCESS) return std::nullopt;
      return r.x;
    } catch (const NoBubble&) {
      return std::nullopt;
    }
  }
};

}  // namespace

RemnantSearch find_remnants(double seed, const MassShiftFn& shift, const RemnantSearchOptions& o) {
  o.validate();
  if (!(seed > 0) || !std::isfinite(seed))
    throw InputError(fmt::format("remnant search: seed mass {} GeV; expected a finite mass > 0", seed));
  RemnantSearch out;
  Search search(seed, shift, o, out);
  bool strong = false;
  const std::optional<RemnantRoot> settled = search.fixed_point(strong);
  std::vector<double> found;
  if (settled) found.push_back(std::log(settled->remnant_mass));
  if (strong || !settled) search.scan(found);
  std::sort(found.begin(), found.end());
  for (double u : found) {
    RemnantRoot r = search.describe(u, out.scanned, settled);
    if (std::isfinite(r.mass_shift)) out.roots.push_back(r);
  }
  return out;
}

}  // namespace ember::tunnelling
