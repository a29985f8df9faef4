// The species a black hole emits (data/particles.yaml), in internal units (masses in GeV).
#pragma once

#include <filesystem>
#include <string>
#include <vector>

namespace ember::evaporation {

enum class Window {
  all,      // E >= mass
  partons,  // E >= max(mass, qcd_scale): free quarks and gluons
  hadrons,  // mass <= E < qcd_scale: pions
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
