// Expected decays for a population, and the largest abundance still allowed.
//
// Units: internal natural units; counts are plain numbers.
//
// For each formation mass a Response holds the decays per unit beta, from the holes formed in our
// past light cone (lightcone_count_per_beta, formation.hpp).
// A monochromatic population of abundance beta gives N = beta K(M). An extended one spreads
// f_PBH over mass with psi (int psi dM = 1): beta(M) dM = f psi(M) / (f/beta)(M) dM, so
//   N = f int psi(M) K(M) / (f/beta)(M) dM,
// integrated by the trapezoidal rule in ln M on the response grid. Counts are linear in the
// abundance, so the largest allowed abundance is threshold / (N per unit abundance).
#pragma once

#include <functional>
#include <optional>
#include <vector>

#include "ember/population/decay.hpp"
#include "ember/population/mass_function.hpp"

namespace ember::population {

struct Response {
  double mass = 0;  // formation mass, GeV
  Formation formation;
  Decay decay;
  double lightcone_per_beta = 0;  // expected decays in our past light cone per unit beta
  double hubble_per_beta = 0;     // per Hubble volume at the decay, per unit beta
  double f_per_beta = 0;
  double count_per_beta = 0;  // holes formed inside our past light cone per unit beta
  // lightcone_per_beta under each treatment of the hot era (decay.hpp), and (chosen treatment)
  // from the points with B >= minimum_action only (at the chosen decay time's light cone).
  double lightcone_per_beta_counted = 0, lightcone_per_beta_postponed = 0, lightcone_per_beta_semiclassical = 0;
  // Spinning populations: the part of lightcone_per_beta from spins whose crossover comes while a*
  // is above the spin limit (Decay::spinning_crossover), and their share of the holes.
  double lightcone_per_beta_spinning = 0;
  double spinning_crossover_share = 0;
};

struct ResponseContext {
  const cosmology::Background* background = nullptr;
  const evaporation::MassLoss* mass_loss = nullptr;
  evaporation::TrajectoryOptions trajectory;
  DecayOptions decay;
  double collapse_fraction = 0.2;
  // The Standard Model potential, when it is the one in use: the plasma's thermal mass
  // (plasma.hpp, rule (b)); null otherwise.
  const higgs::StandardModelPotential* standard_model = nullptr;
  // The spins the holes are born with; with any a* > 0, `spinning.kerr` must be set. Each response
  // then sums over the spin nodes: the counts per beta exactly; in its `decay`, P_decay, the
  // hazards and their shares are weighted means over the nodes, the decay time the
  // probability-weighted mean, the rest that of the median node.
  SpinDistribution hole_spin;
  SpinningRates spinning;
};

Response response_at(double mass, const tunnelling::ActionTable& table, const ResponseContext& c);

// The log grid covering [low, high] with `per_decade` points per decade (just low when high <= low).
std::vector<double> response_masses(double low, double high, int per_decade);
// Responses on that grid.
std::vector<Response> response_grid(double low, double high, int per_decade, const tunnelling::ActionTable& table,
                                    const ResponseContext& c);

enum class AbundanceMeasure { beta, f_pbh, lightcone_count };

struct Counts {
  double lightcone = 0;        // N in our past light cone
  double hubble = 0;           // per Hubble volume at the decay (mass-weighted for extended spectra)
  double f_pbh = 0;            // the abundance as f_PBH
  double beta = 0;             // the abundance as beta (at the characteristic mass for extended spectra)
  double from_evaporated = 0;  // the part of N from holes that are gone by today
  // N under each treatment of the hot era, and (chosen treatment) from points with B >= minimum_action.
  double lightcone_counted = 0, lightcone_postponed = 0, lightcone_semiclassical = 0;
  // Spinning populations: the part of N from holes whose crossover comes while a* is above the
  // spin limit (Response::lightcone_per_beta_spinning).
  double lightcone_spinning = 0;
};

// Counts for a spectrum with its abundance; the responses must cover the spectrum's support
// (monochromatic: responses[0] at its mass).
Counts counts_for(const MassFunction& spectrum, AbundanceMeasure measure, double value,
                  const std::vector<Response>& responses);

// Where the decays come from: dN/d ln M = f_PBH M psi(M) (N/beta)(M) / (f/beta)(M), per response
// (extended spectra; the integrand of counts_for, so it integrates to N over ln M).
std::vector<double> contributions(const MassFunction& spectrum, double f_pbh, const std::vector<Response>& responses);

// The masses between which the given share of N lies, centred (`share` = 0.9: from the 5% point
// of the cumulative count to the 95% point), and the median; linear interpolation in ln M of the
// trapezoidal cumulative. None when N is zero.
struct ContributionRange {
  double low = 0, median = 0, high = 0;  // GeV
};
std::optional<ContributionRange> contribution_range(const std::vector<Response>& responses,
                                                    const std::vector<double>& dn_dlnm, double share);

// N per unit of the amplitude (beta for a monochromatic spectrum, f_PBH otherwise).
double lightcone_per_amplitude(const MassFunction& spectrum, const std::vector<Response>& responses);

}  // namespace ember::population
