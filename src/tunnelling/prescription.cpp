#include "ember/tunnelling/prescription.hpp"

#include <fmt/format.h>

#include <cmath>
#include <map>
#include <optional>

#include "ember/core/errors.hpp"
#include "ember/core/finite.hpp"
#include "ember/tunnelling/flat_bounce.hpp"
#include "ember/tunnelling/remnant_branches.hpp"
#include "ember/tunnelling/thermal_potential.hpp"
#include "ember/tunnelling/unseeded.hpp"
#include "ember/units/constants.hpp"

namespace ember::tunnelling {

std::string name_of(Prescription p) {
  switch (p) {
    case Prescription::entropy_drop: return "entropy_drop";
    case Prescription::probe_field: return "probe_field";
    case Prescription::hot_bubble: return "hot_bubble";
    case Prescription::no_seed: return "no_seed";
    case Prescription::thin_wall: return "thin_wall";
  }
  return "";
}

std::optional<Prescription> prescription_named(const std::string& name) {
  for (const auto p : all_prescriptions)
    if (name_of(p) == name) return p;
  return std::nullopt;
}

std::string assumptions(Prescription p) {
  switch (p) {
    case Prescription::entropy_drop:
      return "static Euclidean bubble around the hole with gravitational back-reaction; B = (A_+ - A_-)/(4G), the drop "
             "in horizon entropy; the hole in equilibrium with its radiation (Hartle-Hawking state), a remnant hole "
             "inside the bubble";
    case Prescription::probe_field:
      return "the static bubble on a fixed Schwarzschild background, no back-reaction; B = E/T_H, a Boltzmann factor "
             "for the bubble's energy at the Hawking temperature";
    case Prescription::hot_bubble:
      return "flat-space O(3) thermal bubble at T = T_H with the Standard Model thermal mass: the enhancement is only "
             "thermal; rate T^4 (S3/2piT)^(3/2) e^(-S3/T) in a near-horizon volume";
    case Prescription::no_seed:
      return "homogeneous flat-space O(4) decay with no black hole, the baseline; rate per volume times the horizon "
             "volume, for comparison only";
    case Prescription::thin_wall:
      return "a thin wall of tension sigma and energy gap epsilon: the static wall around the hole from the Israel "
             "junction conditions, or the Coleman-De Luccia no-seed action when there is none";
  }
  return "";
}

std::vector<std::string> Flags::list() const {
  std::vector<std::string> out;
  if (below_floor) out.emplace_back("below_semiclassical_floor");
  if (fallback) out.emplace_back("no_static_solution_fallback");
  if (resolution_limit) out.emplace_back("thinner_than_resolution");
  if (several_branches) out.emplace_back("several_branches");
  if (near_branch_point) out.emplace_back("near_branch_point");
  if (outside_running) out.emplace_back("outside_running_range");
  if (no_decay) out.emplace_back("no_decay");
  if (beyond_table) out.emplace_back("beyond_table");
  if (unconverged) out.emplace_back("unconverged");
  if (remnant_free_regime) out.emplace_back("remnant_free_regime");
  if (below_minimum_action) out.emplace_back("below_minimum_action");
  return out;
}

Flags& Flags::operator|=(const Flags& o) {
  below_floor |= o.below_floor;
  fallback |= o.fallback;
  resolution_limit |= o.resolution_limit;
  several_branches |= o.several_branches;
  near_branch_point |= o.near_branch_point;
  outside_running |= o.outside_running;
  no_decay |= o.no_decay;
  beyond_table |= o.beyond_table;
  unconverged |= o.unconverged;
  remnant_free_regime |= o.remnant_free_regime;
  below_minimum_action |= o.below_minimum_action;
  return *this;
}

namespace {

using units::pi;

double horizon_volume(const TunnellingSetup& s, double mass) {
  const double r_h = 2 * s.newton_G * mass;
  return 4 * pi * r_h * r_h * r_h / 3;
}

ActionPoint fallback_point(const TunnellingSetup& s, double seed, const std::string& why) {
  ActionPoint a;
  a.seed_mass = seed;
  a.remnant_mass = 0;
  a.action = {4 * pi * s.newton_G * seed * seed, 0.0};
  a.flags.fallback = true;
  a.note = why + "; fallback B = 4 pi G M^2 (remnant-free)";
  return a;
}

// Whether a static solution exists at a seed 10 times heavier: then this seed lies below the
// critical seed mass, where remnant-free instantons take over (rather than above the range where
// the bubble no longer fits, as for very heavy seeds).
bool static_solution_heavier(const TunnellingSetup& s, const StaticOptions& o, double seed) {
  try {
    (void)solve_static(*s.potential, 10 * seed, o);
    return true;
  } catch (const NumericalError& e) {
    if (!no_static_solution(e)) throw;
    return false;
  }
}

// Every remnant branch for the seed (remnant_branches.hpp), each from a static solve kept for
// reuse; the lowest B wins. No branch: the fallback, flagged as the remnant-free regime when a
// heavier seed has a static solution.
ActionPoint entropy_drop(const TunnellingSetup& s, double seed, const ActionEffort& effort) {
  const StaticOptions o = static_options(s, effort, true);
  std::map<double, StaticSolution> solved;
  std::optional<NumericalError> unresolved, absent;
  bool bracket_open = false;  // some solve ended with its bracket unclosed (at_resolution_limit)
  const MassShiftFn shift = [&](double m) -> std::optional<double> {
    try {
      auto it = solved.find(m);
      if (it == solved.end()) it = solved.emplace(m, solve_static(*s.potential, m, o)).first;
      const StaticSolution& sol = it->second;
      // A bracket that did not close is not a solution to root-find on.
      if (sol.at_resolution_limit) {
        bracket_open = true;
        return std::nullopt;
      }
      return sol.mass_shift.value;
    } catch (const NumericalError& e) {
      if (!no_static_solution(e)) throw;
      (wall_beyond_resolution(e) ? unresolved : absent) = e;
      return std::nullopt;
    }
  };
  const RemnantSearch search = find_remnants(seed, shift);
  if (search.roots.empty()) {
    const std::string why = unresolved     ? unresolved->what()
                            : bracket_open ? "a static solve ended with its bracket unclosed (resolution limit)"
                            : absent       ? absent->what()
                                           : "no remnant M_- with M_- + DeltaM(M_-) = M_+ (static bubbles exist, but "
                                             "none fits this seed)";
    ActionPoint f = fallback_point(s, seed, why);
    f.flags.resolution_limit = unresolved.has_value() || bracket_open;
    // A wall too thin to resolve says nothing about the critical seed mass.
    f.flags.remnant_free_regime = !f.flags.resolution_limit && static_solution_heavier(s, o, seed);
    if (f.flags.remnant_free_regime)
      f.note += "; below the critical seed mass (a static solution exists at 10x the seed)";
    return f;
  }
  ActionPoint a;
  a.seed_mass = seed;
  const RemnantRoot* best = nullptr;
  for (const RemnantRoot& r : search.roots) {
    // B = 4 pi G (M_+ + M_-) DeltaM with DeltaM itself: M_+ - M_- can be below double precision.
    const double b = 4 * pi * s.newton_G * (2 * r.remnant_mass + r.mass_shift) * r.mass_shift;
    if (!best || b < a.action.value) {
      best = &r;
      a.action.value = b;
    }
  }
  const StaticSolution& sol = solved.at(best->remnant_mass);
  const double k = 4 * pi * s.newton_G * (2 * sol.remnant_mass + sol.mass_shift.value);
  // The root's own mismatch M_- + DeltaM - M_+ adds to the error (B moves by about 8 pi G M_+ per
  // unit of M_+).
  const double mismatch = std::abs(sol.remnant_mass + sol.mass_shift.value - seed);
  a.action.error = k * sol.mass_shift.error + 8 * pi * s.newton_G * seed * mismatch;
  a.remnant_mass = sol.remnant_mass;
  a.phi_horizon = sol.phi_horizon;
  a.flags.several_branches = search.roots.size() > 1;
  a.flags.near_branch_point = best->near_branch_point;
  // Roots come only from closed brackets, so the resolution limit is never set here.
  a.flags.unconverged = sol.summary.status != SolveStatus::converged;
  a.note = sol.summary.message;
  if (search.roots.size() > 1) a.note += fmt::format("; lowest B of {} remnant branches", search.roots.size());
  return a;
}

ActionPoint probe_field(const TunnellingSetup& s, double seed, const ActionEffort& effort) {
  const StaticOptions o = static_options(s, effort, false);
  ActionPoint a;
  a.seed_mass = a.remnant_mass = seed;
  try {
    const StaticSolution sol = solve_static(*s.potential, seed, o);
    a.action = sol.action;
    a.phi_horizon = sol.phi_horizon;
    a.flags.resolution_limit = sol.at_resolution_limit;
    a.flags.unconverged = sol.summary.status != SolveStatus::converged && !sol.at_resolution_limit;
    a.note = sol.summary.message;
  } catch (const NumericalError& e) {
    if (!no_static_solution(e)) throw;
    ActionPoint f = fallback_point(s, seed, e.what());
    f.flags.resolution_limit = wall_beyond_resolution(e);
    return f;
  }
  return a;
}

ActionPoint no_decay(double seed, const std::string& why) {
  ActionPoint a;
  a.seed_mass = a.remnant_mass = seed;
  a.action = {INFINITY, 0.0};
  a.flags.no_decay = true;
  a.note = why;
  return a;
}

ActionPoint hot_bubble(const TunnellingSetup& s, double seed) {
  if (!s.standard_model)
    throw InputError(
        "hot_bubble: needs the Standard Model potential (its thermal mass); expected the standard_model "
        "potential form");
  const double t = 1 / (8 * pi * s.newton_G * seed);  // T_H
  const higgs::Running& run = s.standard_model->running();
  const bool outside_running = t > run.mu_max() || t < run.mu_min();
  ThermalPotential thermal(*s.potential, thermal_mass_squared(*s.standard_model, t));
  FlatBounceOptions o;
  o.dimensions = 3;
  FlatBounce b;
  try {
    b = solve_flat_bounce(thermal, o);
  } catch (const InputError&) {
    // "No bubble" is as uncertain as the couplings behind the thermal mass: flagged the same way.
    ActionPoint none =
        no_decay(seed, fmt::format("thermal mass at T_H = {:.3g} GeV lifts the potential everywhere: no bubble", t));
    none.flags.outside_running = outside_running;
    return none;
  }
  ActionPoint a;
  a.seed_mass = a.remnant_mass = seed;
  a.action = {b.action.value / t, b.action.error / t};
  a.own_prefactor =
      s.hot_bubble_volume * horizon_volume(s, seed) * std::pow(t, 4) * std::pow(a.action.value / (2 * pi), 1.5);
  a.flags.outside_running = outside_running;
  a.flags.unconverged = b.summary.status != SolveStatus::converged;
  a.note = fmt::format("T_H = {:.4g} GeV; {}", t, b.summary.message);
  return a;
}

ActionPoint no_seed(const TunnellingSetup& s, double seed) {
  ActionPoint a;
  a.seed_mass = a.remnant_mass = seed;
  if (s.standard_model) {
    // The unseeded estimate of the higgs module, operators on the bounce (unseeded.hpp): S at the
    // scale mu that maximises mu^4 e^{-S}, and that rate per volume.
    const higgs::StabilityReport r = analyse_unseeded(*s.standard_model);
    if (!r.log10_expected_decays) return no_decay(seed, "no flat-space bounce: " + r.prescription);
    a.action = {r.bounce_action, r.bounce_action_error};
    a.own_prefactor = horizon_volume(s, seed) * std::pow(r.bounce_scale, 4);
    a.flags.unconverged = r.bounce_action_error > 1e-4 * r.bounce_action;
    a.note = fmt::format("{} at mu = {:.4g} GeV", higgs::name_of(r.unseeded_method), r.bounce_scale);
    return a;
  }
  FlatBounce b;
  try {
    b = solve_flat_bounce(*s.potential, {});
  } catch (const InputError& e) {
    return no_decay(seed, e.what());
  }
  a.action = b.action;
  a.own_prefactor = horizon_volume(s, seed) / std::pow(b.wall_radius, 4);
  a.flags.unconverged = b.summary.status != SolveStatus::converged;
  a.note = b.summary.message;
  return a;
}

ActionPoint thin_wall(const TunnellingSetup& s, double seed) {
  if (!s.thin_wall)
    throw InputError(
        "thin_wall: needs the wall tension and energy gap; expected tunnelling.thin_wall.tension and "
        "energy_gap (or --tension and --energy-gap)");
  const std::vector<SeededWall> walls = seeded_thin_walls(*s.thin_wall, seed, s.newton_G);
  ActionPoint a;
  a.seed_mass = seed;
  if (!walls.empty()) {
    a.action = {walls.front().action, 1e-12 * walls.front().action};
    a.remnant_mass = walls.front().remnant_mass;
    a.flags.several_branches = walls.size() > 1;
    a.note = fmt::format("static wall at R = {:.4g} GeV^-1 ({} branch{})", walls.front().radius, walls.size(),
                         walls.size() > 1 ? "es" : "");
    return a;
  }
  const auto cdl = coleman_de_luccia(*s.thin_wall, s.newton_G);
  if (!cdl) return no_decay(seed, "no static wall, and gravity forbids the no-seed decay (Coleman-De Luccia)");
  a.remnant_mass = seed;
  a.action = {cdl->action, 1e-12 * cdl->action};
  a.flags.fallback = true;
  a.note = "no static wall around the hole: the no-seed Coleman-De Luccia action";
  return a;
}

}  // namespace

StaticOptions static_options(const TunnellingSetup& s, const ActionEffort& effort, bool back_reaction) {
  StaticOptions o;
  o.newton_G = s.newton_G;
  o.back_reaction = back_reaction;
  o.residual_check = effort.residual_check;
  if (effort.rough) o.relative_tolerance = o.shooting_tolerance = rough_tolerance;
  return o;
}

PrescriptionNeeds needs(Prescription p) {
  PrescriptionNeeds n;
  n.potential = p != Prescription::thin_wall;
  n.standard_model = p == Prescription::hot_bubble;
  n.wall = p == Prescription::thin_wall;
  return n;
}

double relative_node_cost(Prescription p) {
  switch (p) {
    case Prescription::entropy_drop:
    case Prescription::probe_field:
    case Prescription::hot_bubble: return 1.0;
    case Prescription::no_seed:
    case Prescription::thin_wall: return 0.07;
  }
  return 1.0;
}

ActionPoint action_at(Prescription p, const TunnellingSetup& s, double seed, const ActionEffort& effort) {
  if (!s.potential) throw InputError("tunnelling: no potential given");
  if (!(seed > 0) || !std::isfinite(seed))
    throw InputError(fmt::format("tunnelling: seed mass {} GeV; expected a finite mass > 0", seed));
  ActionPoint a;
  switch (p) {
    case Prescription::entropy_drop: a = entropy_drop(s, seed, effort); break;
    case Prescription::probe_field: a = probe_field(s, seed, effort); break;
    case Prescription::hot_bubble: a = hot_bubble(s, seed); break;
    case Prescription::no_seed: a = no_seed(s, seed); break;
    case Prescription::thin_wall: a = thin_wall(s, seed); break;
  }
  a.flags.below_floor = seed < s.semiclassical_floor;
  a.flags.below_minimum_action = !a.flags.no_decay && a.action.value < s.minimum_action;
  // Module boundary (no NaN leaves a module): B and the remnant leave the tunnelling module finite.
  const auto inputs = [&] {
    return fmt::format("{} at seed mass {:.6e} M_Pl ({})", name_of(p), seed / units::planck_mass,
                       s.potential->description());
  };
  if (!a.flags.no_decay)
    require_finite(a.action.value, "tunnelling: bounce action", "B", inputs,
                   "a seed mass above the semiclassical floor, or another prescription");
  require_finite(a.remnant_mass, "tunnelling: bounce action", "remnant mass", inputs,
                 "a seed mass above the semiclassical floor, or another prescription");
  return a;
}

}  // namespace ember::tunnelling
