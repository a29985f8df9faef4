// The species a black hole emits (data/particles.yaml), in internal units (masses in GeV).
#pragma once

#include <filesystem>
#include <string>
#include <vector>

namespace ember::evaporation {

// Which Hawking temperatures a species is emitted at (at every energy E >= mass); the weights are
// in mass_loss.hpp.
enum class Window {
  all,      // at every temperature
  partons,  // free quarks and gluons: weight parton_weight(T), 1 well above the QCD scale
  hadrons,  // light hadrons: weight hadron_weight(T), 1 well below the QCD scale
};

struct Species {
  std::string name;
  double mass = 0;  // GeV
  int twice_spin = 0;
  double charge = 0;  // units of e
  int colour = 1;
  int dof = 0;  // particle + antiparticle, times helicities, times colour
  Window window = Window::all;
};

struct ParticleSet {
  std::vector<Species> species;
  std::string source;  // the file it was read from

  // The named subset, in this set's order; throws InputError naming an unknown species.
  ParticleSet only(const std::vector<std::string>& names) const;
  std::vector<std::string> names() const;
};

// Reads and validates a particle file; errors name FILE:LINE:COL, the key and what was expected.
ParticleSet load_particles(const std::filesystem::path& file);
ParticleSet load_default_particles();  // data/particles.yaml

}  // namespace ember::evaporation
