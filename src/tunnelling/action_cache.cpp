#include "ember/tunnelling/action_cache.hpp"

#include <fmt/format.h>

#include <stdexcept>

#include "ember/core/cache.hpp"
#include "ember/core/embedded.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/hash.hpp"
#include "ember/version.hpp"

namespace ember::tunnelling {

std::string action_table_key(Prescription p, const TunnellingSetup& s, const ActionTableOptions& o) {
  std::string text = fmt::format(
      "ember {} numerics {}\nprescription {}\npoints {} stop {:a} max_seed {:a} stride {}\nG {:a} floor {:a} "
      "hot_volume {:a} minimum_action {:a} standard_model {}\npotential {}\n",
      version, embedded::numerics_fingerprint(), name_of(p), o.points, o.stop_action, o.max_seed, o.midpoint_stride,
      s.newton_G, s.semiclassical_floor, s.hot_bubble_volume, s.minimum_action, s.standard_model ? 1 : 0,
      s.potential ? s.potential->identity() : std::string("none"));
  if (s.thin_wall) text += fmt::format("thin_wall {:a} {:a}\n", s.thin_wall->sigma, s.thin_wall->epsilon);
  return fmt::format("btable-{}-{}.txt", name_of(p), fingerprint(text));
}

CachedTable cached_action_table(Prescription p, const TunnellingSetup& setup, const ActionTableOptions& options,
                                const std::optional<std::filesystem::path>& directory) {
  options.validate();
  const std::string key = action_table_key(p, setup, options);
  if (directory) {
    if (const auto body = cache_read_checked(*directory, key)) {
      try {
        ActionTable t = ActionTable::from_text(*body);
        if (t.prescription() == p) return {std::move(t), true, key, std::nullopt};
      } catch (const InputError&) {  // a damaged entry: rebuild it below
      } catch (const std::logic_error&) {
      }
    }
  }
  ActionTable built(p, setup, options);
  std::optional<std::string> failure;
  if (directory) failure = cache_write_checked(*directory, key, built.to_text());
  return {std::move(built), false, key, failure};
}

}  // namespace ember::tunnelling
