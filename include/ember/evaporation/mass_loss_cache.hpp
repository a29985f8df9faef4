// alpha(M) tables kept on disk between runs (core/cache.hpp). The key covers the greybody table's
// content, every species' fields, the mass-loss options and the numerics fingerprint of the
// sources this binary was built from. The energy option builds in ~15 ms, the momentum option in
// about a second; a hit rebuilds only the spin kernels.
//
// Units: as MassLoss (GeV; alpha in GeV^4).
#pragma once

#include <filesystem>
#include <optional>
#include <string>

#include "ember/evaporation/mass_loss.hpp"

namespace ember::evaporation {

std::string mass_loss_key(const greybody::Table& greybody, const ParticleSet& particles,
                          const MassLossOptions& options);

struct CachedMassLoss {
  MassLoss mass_loss;
  bool hit = false;
  std::optional<std::string> store_failure;  // built, but the cache could not keep it: why
};

// With no directory nothing is read or stored. A damaged entry is rebuilt and overwritten.
CachedMassLoss cached_mass_loss(const greybody::Table& greybody, const ParticleSet& particles,
                                const MassLossOptions& options, const std::optional<std::filesystem::path>& directory);

}  // namespace ember::evaporation
