// Computes through the installed library what `ember higgs --json` and `ember bounce --json` print
// for the same inputs, and prints it as JSON: the Higgs verdict, the unseeded decay estimate, the
// critical top mass, and B with the rates for one seed mass under entropy_drop.
#include <ember/evaporation/mass_loss.hpp>
#include <ember/higgs/stability.hpp>
#include <ember/tunnelling/rate.hpp>
#include <ember/tunnelling/unseeded.hpp>
#include <ember/units/constants.hpp>
#include <iostream>
#include <nlohmann/json.hpp>

int main() {
  namespace u = ember::units;
  const ember::higgs::Inputs inputs = ember::higgs::default_inputs();
  auto running = std::make_shared<const ember::higgs::Running>(inputs);
  const ember::higgs::StandardModelPotential potential(running);
  const ember::higgs::StabilityReport report = ember::tunnelling::analyse_unseeded(potential);

  ember::tunnelling::TunnellingSetup setup;
  setup.potential = &potential;
  setup.standard_model = &potential;
  const double seed = 1e5 * u::planck_mass;
  const ember::tunnelling::ActionPoint b =
      ember::tunnelling::action_at(ember::tunnelling::Prescription::entropy_drop, setup, seed);
  const ember::evaporation::MassLoss mass_loss(ember::greybody::load_default_table(),
                                               ember::evaporation::load_default_particles());
  const ember::tunnelling::Rates rates =
      ember::tunnelling::rates_at(b, mass_loss, ember::tunnelling::Prefactor::root_action);

  const nlohmann::json out = {{"verdict", ember::higgs::name_of(report.verdict)},
                              {"log10_expected_decays", report.log10_expected_decays.value_or(0)},
                              {"critical_top_mass_GeV", ember::higgs::critical_top_mass(inputs)},
                              {"B", b.action.value},
                              {"decay_rate_per_s", rates.decay_rate * u::second},
                              {"evaporation_rate_per_s", rates.evaporation_rate * u::second}};
  std::cout << out.dump() << "\n";
}
