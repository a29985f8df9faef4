// The Standard Model potential as the Python module holds it: built once, its stability report
// and the mass-loss model for rates computed on first use.
#pragma once

#include <memory>
#include <optional>

#include "ember/evaporation/mass_loss.hpp"
#include "ember/higgs/potential.hpp"
#include "ember/higgs/stability.hpp"

namespace ember::python {

class StandardModel {
 public:
  StandardModel(const higgs::Inputs& inputs, const higgs::StandardModelOptions& options);
  const higgs::Inputs& inputs() const { return inputs_; }
  const higgs::StandardModelOptions& options() const { return options_; }
  const higgs::Running& running() const { return *running_; }
  const higgs::StandardModelPotential& potential() const { return *potential_; }
  const higgs::StabilityReport& report() const;
  // The shipped greybody table and particle set, for Gamma_H and the rate prefactor.
  const evaporation::MassLoss& mass_loss() const;

 private:
  higgs::Inputs inputs_;
  higgs::StandardModelOptions options_;
  std::shared_ptr<const higgs::Running> running_;
  std::shared_ptr<const higgs::StandardModelPotential> potential_;
  mutable std::optional<higgs::StabilityReport> report_;
  mutable std::shared_ptr<const evaporation::MassLoss> mass_loss_;
};

}  // namespace ember::python
