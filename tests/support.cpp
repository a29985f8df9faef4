#include "support.hpp"

namespace ember::testing {

const cosmology::Background& planck_background() {
  static const cosmology::Background b(cosmology::planck2018(),
                                       cosmology::DegreesOfFreedom::load(source_dir / "data/relativistic_dof.tsv"));
  return b;
}

const evaporation::MassLoss& shipped_mass_loss() {
  static const evaporation::MassLoss ml(greybody::load_table(source_dir / "data/greybody.tsv"),
                                        evaporation::load_particles(source_dir / "data/particles.yaml"));
  return ml;
}

const higgs::StandardModelPotential& standard_model() {
  static const higgs::StandardModelPotential sm(std::make_shared<const higgs::Running>(higgs::default_inputs()));
  return sm;
}

const tunnelling::ActionTable& coarse_probe_table() {
  static const tunnelling::ActionTable t = [] {
    tunnelling::TunnellingSetup s;
    s.potential = &standard_model();
    s.standard_model = &standard_model();
    tunnelling::ActionTableOptions o;
    o.points = 30;
    o.midpoint_stride = 6;
    return tunnelling::ActionTable(tunnelling::Prescription::probe_field, s, o);
  }();
  return t;
}

std::filesystem::path source_root() {
  return EMBER_SOURCE_DIR;  // set by tests/CMakeLists.txt
}

}  // namespace ember::testing
