#include "ember/evaporation/mass_loss_cache.hpp"

#include <fmt/format.h>

#include "ember/core/cache.hpp"
#include "ember/core/embedded.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/hash.hpp"
#include "ember/version.hpp"

namespace ember::evaporation {

std::string mass_loss_key(const greybody::Table& g, const ParticleSet& p, const MassLossOptions& o) {
  std::string text =
      fmt::format("ember {} numerics {}\ngreybody {}\nqcd {:a} width {:a} argument {} nodes {}\n", version,
                  embedded::numerics_fingerprint(), fingerprint(greybody::format_table(g, {})), o.qcd_scale,
                  o.qcd_width, o.argument == GreybodyArgument::momentum ? "momentum" : "energy", o.nodes_per_decade);
  for (const auto& s : p.species)
    text += fmt::format("{} {:a} {} {:a} {} {} {}\n", s.name, s.mass, s.twice_spin, s.charge, s.colour, s.dof,
                        static_cast<int>(s.window));
  return fmt::format("alpha-{}.txt", fingerprint(text));
}

CachedMassLoss cached_mass_loss(const greybody::Table& g, const ParticleSet& p, const MassLossOptions& o,
                                const std::optional<std::filesystem::path>& directory) {
  const std::string key = mass_loss_key(g, p, o);
  if (directory)
    if (const auto body = cache_read_checked(*directory, key)) {
      try {
        return {MassLoss::from_nodes(g, p, o, *body), true, std::nullopt};
      } catch (const InputError&) {  // damaged: rebuild below
      }
    }
  MassLoss built(g, p, o);
  std::optional<std::string> failure;
  if (directory) failure = cache_write_checked(*directory, key, built.nodes_text());
  return {std::move(built), false, failure};
}

}  // namespace ember::evaporation
