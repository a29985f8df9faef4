#include "ember/tunnelling/action_table.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <optional>
#include <sstream>

#include "ember/core/errors.hpp"
#include "ember/core/gsl_tools.hpp"
#include "ember/core/parallel.hpp"
#include "ember/core/record.hpp"

namespace ember::tunnelling {

void ActionTableOptions::validate() const {
  if (points < 4 || points > 100000)
    throw InputError(fmt::format("B(M) table options: points = {}: must lie in [4, 100000]", points));
  if (!(stop_action > 0)) throw InputError("B(M) table options: stop_action must be > 0");
  if (!(max_seed > 0)) throw InputError("B(M) table options: max_seed must be > 0");
  if (midpoint_stride < 1) throw InputError("B(M) table options: midpoint_stride must be >= 1");
  if (threads < 1) throw InputError("B(M) table options: threads must be >= 1");
}

// A run of nodes with increasing seed mass and finite B, splined in (ln M_+, ln B).
struct ActionTable::Branch {
  std::vector<double> ln_m, ln_b, ln_prefactor;
  std::vector<std::size_t> index;      // into nodes_
  std::optional<Spline> b, prefactor;  // none for a one-node branch
  bool has_prefactor = false;

  bool covers(double u) const { return u >= ln_m.front() && u <= ln_m.back(); }
  double eval(const std::optional<Spline>& i, const std::vector<double>& y, double u) const {
    return i ? i->value(u) : y.front();
  }
};

namespace {

// Steffen's monotone cubic, so B(M) has no overshoot between nodes; linear through two nodes.
std::optional<Spline> make_interp(const std::vector<double>& x, const std::vector<double>& y) {
  if (x.size() < 2) return std::nullopt;
  return Spline(x.size() >= 3 ? Spline::Kind::steffen : Spline::Kind::linear, x, y, "B(M) table branch");
}

// A table's accuracy is measured against direct solves at interval midpoints; the field-equation
// residual check would only cost time (the nodes' notes say it was skipped).
constexpr ActionEffort node_effort{.residual_check = false, .rough = false};
// The top of the table only needs to know where B passes stop_action.
constexpr ActionEffort top_effort{.residual_check = false, .rough = true};

// The node for a grid mass: entropy_drop is solved at the remnant mass, the rest at the seed.
ActionPoint solve_node(Prescription p, const TunnellingSetup& s, double mass) {
  if (p != Prescription::entropy_drop) return action_at(p, s, mass, node_effort);
  const StaticOptions o = static_options(s, node_effort, true);
  ActionPoint a;
  try {
    const StaticSolution sol = solve_static(*s.potential, mass, o);
    a.remnant_mass = mass;
    a.seed_mass = mass + sol.mass_shift.value;
    const double k = 4 * units::pi * s.newton_G * (2 * mass + sol.mass_shift.value);
    a.action = {k * sol.mass_shift.value, k * sol.mass_shift.error};
    a.phi_horizon = sol.phi_horizon;
    a.flags.resolution_limit = sol.at_resolution_limit;
    a.flags.unconverged = sol.summary.status != SolveStatus::converged && !sol.at_resolution_limit;
    a.note = sol.summary.message;
  } catch (const NumericalError& e) {
    if (!no_static_solution(e)) throw;
    a = action_at(p, s, mass, node_effort);  // the fallback, at the seed mass
  }
  a.flags.below_floor = a.seed_mass < s.semiclassical_floor;
  return a;
}

}  // namespace

ActionTable::ActionTable(Prescription p, const TunnellingSetup& s, const ActionTableOptions& o) : prescription_(p) {
  o.validate();
  const auto start = std::chrono::steady_clock::now();
  floor_ = s.semiclassical_floor;
  minimum_action_ = s.minimum_action;
  // Coarse decade search for the top: the first decade where B passes stop_action.
  top_ = o.max_seed;
  for (double m = floor_ * 10; m < o.max_seed; m *= 10) {
    const ActionPoint a = action_at(p, s, m, top_effort);
    if (!a.flags.no_decay && a.action.value > o.stop_action) {
      top_ = m;
      break;
    }
  }
  const double lo = std::log(floor_), hi = std::log(top_);
  const auto grid = [&](double i) { return std::exp(lo + (hi - lo) * i / (o.points - 1)); };
  nodes_.resize(static_cast<std::size_t>(o.points));
  parallel_for(nodes_.size(), o.threads,
               [&](std::size_t i) { nodes_[i] = solve_node(p, s, grid(static_cast<double>(i))); });

  build_branches();

  // Interpolation error at midpoints, as an absolute error in B (solved first, compared in order).
  std::vector<ActionPoint> checks(static_cast<std::size_t>((o.points - 2) / o.midpoint_stride + 1));
  parallel_for(checks.size(), o.threads, [&](std::size_t k) {
    checks[k] = solve_node(p, s, grid(static_cast<double>(k) * o.midpoint_stride + 0.5));
  });
  for (const ActionPoint& direct : checks) {
    if (direct.flags.no_decay) continue;
    const ActionPoint looked = interpolate(direct.seed_mass);
    if (looked.flags.no_decay) continue;
    summary_.interpolation_error =
        std::max(summary_.interpolation_error,
                 std::abs(looked.action.value - direct.action.value) / std::max(direct.action.value, 1.0));
    ++summary_.checks;
  }
  summary_.nodes = static_cast<int>(nodes_.size());
  summary_.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  set_message();
}

void ActionTable::build_branches() {
  // Branches: maximal runs of finite B with increasing seed mass.
  auto branch = std::make_shared<Branch>();
  const auto close_branch = [&] {
    if (branch->ln_m.empty()) return;
    branch->b = make_interp(branch->ln_m, branch->ln_b);
    if (branch->has_prefactor) branch->prefactor = make_interp(branch->ln_m, branch->ln_prefactor);
    branches_.push_back(branch);
    branch = std::make_shared<Branch>();
  };
  for (std::size_t i = 0; i < nodes_.size(); ++i) {
    const ActionPoint& a = nodes_[i];
    const bool usable = !a.flags.no_decay && a.action.value > 0 && std::isfinite(a.action.value);
    const double u = std::log(a.seed_mass);
    if (!usable || (!branch->ln_m.empty() && !(u > branch->ln_m.back()))) close_branch();
    if (!usable) continue;
    branch->ln_m.push_back(u);
    branch->ln_b.push_back(std::log(a.action.value));
    branch->has_prefactor = a.own_prefactor.has_value();
    branch->ln_prefactor.push_back(a.own_prefactor ? std::log(*a.own_prefactor) : 0.0);
    branch->index.push_back(i);
  }
  close_branch();
}

void ActionTable::set_message() {
  summary_.message = fmt::format(
      "{}: {} nodes from {:.3g} to {:.3g} M_Pl, {} branch{}, interpolation error in B "
      "{:.2g} of max(B, 1) ({} checks)",
      name_of(prescription_), summary_.nodes, floor_ / units::planck_mass, top_ / units::planck_mass, branches_.size(),
      branches_.size() == 1 ? "" : "es", summary_.interpolation_error, summary_.checks);
}

ActionPoint ActionTable::interpolate(double seed) const {
  const double u = std::log(seed);
  ActionPoint best;
  best.seed_mass = seed;
  best.action = {INFINITY, 0};
  best.flags.no_decay = true;
  int covering = 0;
  for (const auto& b : branches_) {
    if (!b->covers(u)) continue;
    ++covering;
    const double value = std::exp(b->eval(b->b, b->ln_b, u));
    if (value >= best.action.value) continue;
    // Flags and notes from the nearer bracketing node.
    const auto it = std::lower_bound(b->ln_m.begin(), b->ln_m.end(), u);
    std::size_t k = static_cast<std::size_t>(std::max<std::ptrdiff_t>(0, it - b->ln_m.begin()));
    if (k > 0 && (k == b->ln_m.size() || u - b->ln_m[k - 1] < b->ln_m[k] - u)) --k;
    const ActionPoint& node = nodes_[b->index[k]];
    best = node;
    best.seed_mass = seed;
    best.remnant_mass = seed * node.remnant_mass / node.seed_mass;
    best.action = {value, node.action.error * value / node.action.value};
    best.own_prefactor =
        b->has_prefactor ? std::optional<double>(std::exp(b->eval(b->prefactor, b->ln_prefactor, u))) : std::nullopt;
  }
  best.flags.several_branches |= covering > 1;
  return best;
}

ActionPoint ActionTable::at(double seed) const {
  if (!(seed > 0) || !std::isfinite(seed))
    throw InputError(fmt::format("B(M) table lookup: seed mass {} GeV; expected a finite mass > 0", seed));
  const double lowest = nodes_.front().seed_mass, highest = nodes_.back().seed_mass;
  ActionPoint a = interpolate(std::clamp(seed, lowest, highest));
  a.seed_mass = seed;
  if (seed < lowest) a.flags.below_floor = true;
  if (seed > highest && !a.flags.no_decay) {
    // Beyond the top B only grows: hold it at least at the top value, extrapolated in ln-ln.
    const auto& b = branches_.back();
    if (b->ln_m.size() >= 2) {
      const std::size_t n = b->ln_m.size();
      const double slope = (b->ln_b[n - 1] - b->ln_b[n - 2]) / (b->ln_m[n - 1] - b->ln_m[n - 2]);
      a.action.value = std::exp(b->ln_b[n - 1] + std::max(0.0, slope) * (std::log(seed) - b->ln_m[n - 1]));
    }
    a.flags.beyond_table = true;
  }
  if (!a.flags.no_decay) a.action.error += summary_.interpolation_error * std::max(a.action.value, 1.0);
  // From the interpolated B, not the nearer node's flag.
  a.flags.below_minimum_action = !a.flags.no_decay && a.action.value < minimum_action_;
  return a;
}

}  // namespace ember::tunnelling

namespace ember::tunnelling {

namespace {

std::string hex(double x) {
  return hex_float(x);
}

double unhex(const std::string& text) {
  return parse_hex_float(text, "B(M) table text");
}

unsigned flag_bits(const Flags& f) {
  return (f.below_floor ? 1u : 0u) | (f.fallback ? 2u : 0u) | (f.resolution_limit ? 4u : 0u) |
         (f.several_branches ? 8u : 0u) | (f.near_branch_point ? 16u : 0u) | (f.outside_running ? 32u : 0u) |
         (f.no_decay ? 64u : 0u) | (f.beyond_table ? 128u : 0u) | (f.unconverged ? 256u : 0u) |
         (f.remnant_free_regime ? 512u : 0u) | (f.below_minimum_action ? 1024u : 0u);
}

Flags flags_of(unsigned b) {
  Flags f;
  f.below_floor = b & 1u;
  f.fallback = b & 2u;
  f.resolution_limit = b & 4u;
  f.several_branches = b & 8u;
  f.near_branch_point = b & 16u;
  f.outside_running = b & 32u;
  f.no_decay = b & 64u;
  f.beyond_table = b & 128u;
  f.unconverged = b & 256u;
  f.remnant_free_regime = b & 512u;
  f.below_minimum_action = b & 1024u;
  return f;
}

}  // namespace

std::string ActionTable::to_text() const {
  std::string out = fmt::format(
      "ember-action-table 2\nprescription {}\nfloor {}\nminimum_action {}\ntop {}\ninterpolation_error {}\nchecks "
      "{}\nnodes {}\n",
      name_of(prescription_), hex(floor_), hex(minimum_action_), hex(top_), hex(summary_.interpolation_error),
      summary_.checks, nodes_.size());
  for (const auto& n : nodes_)
    out += fmt::format("{} {} {} {} {} {} {} {}\n", hex(n.seed_mass), hex(n.action.value), hex(n.action.error),
                       hex(n.remnant_mass), hex(n.phi_horizon), n.own_prefactor ? 1 : 0,
                       hex(n.own_prefactor.value_or(0.0)), flag_bits(n.flags));
  return out;
}

ActionTable ActionTable::from_text(const std::string& text) {
  std::istringstream in(text);
  std::string word, value;
  int version = 0;
  in >> word >> version;
  if (word != "ember-action-table" || version != 2)
    throw InputError("B(M) table text: not an ember-action-table version 2; expected the format to_text writes");
  ActionTable t;
  const auto field = [&](const char* name) {
    in >> word >> value;
    if (word != name) throw InputError(fmt::format("B(M) table text: \"{}\" where \"{}\" was expected", word, name));
    return value;
  };
  const auto p = prescription_named(field("prescription"));
  if (!p) throw InputError("B(M) table text: unknown prescription");
  t.prescription_ = *p;
  t.floor_ = unhex(field("floor"));
  t.minimum_action_ = unhex(field("minimum_action"));
  t.top_ = unhex(field("top"));
  t.summary_.interpolation_error = unhex(field("interpolation_error"));
  t.summary_.checks = std::stoi(field("checks"));
  const int n = std::stoi(field("nodes"));
  for (int i = 0; i < n; ++i) {
    std::string seed, b, err, remnant, phi, prefactor;
    int has = 0;
    unsigned flags = 0;
    if (!(in >> seed >> b >> err >> remnant >> phi >> has >> prefactor >> flags))
      throw InputError(fmt::format("B(M) table text: node {} of {} is incomplete", i + 1, n));
    ActionPoint a;
    a.seed_mass = unhex(seed);
    a.action = {unhex(b), unhex(err)};
    a.remnant_mass = unhex(remnant);
    a.phi_horizon = unhex(phi);
    if (has) a.own_prefactor = unhex(prefactor);
    a.flags = flags_of(flags);
    t.nodes_.push_back(a);
  }
  t.summary_.nodes = n;
  t.build_branches();
  t.set_message();
  return t;
}

}  // namespace ember::tunnelling
