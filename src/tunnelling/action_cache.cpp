#include "ember/tunnelling/action_cache.hpp"

#include <fmt/format.h>

#include <stdexcept>

#include "ember/core/cache.hpp"
#include "ember/core/embedded.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/hash.hpp"
#include "ember/version.hpp"

namespace ember::tunnelling {

namespace {
// Each entry ends with a fingerprint of its own text, so a damaged file is caught even where it
// still parses.
constexpr std::string_view checksum_tag = "checksum ";

std::optional<std::string> verified_body(const std::string& entry) {
  const std::size_t at = entry.rfind(checksum_tag);
  if (at == std::string::npos) return std::nullopt;
  const std::string body = entry.substr(0, at), sum = entry.substr(at + checksum_tag.size());
  if (sum != fingerprint(body) + "\n") return std::nullopt;
  return body;
}
}  // namespace

std::string action_table_key(Prescription p, const TunnellingSetup& s, const ActionTableOptions& o) {
  std::string text = fmt::format(
      "ember {} numerics {}\nprescription {}\npoints {} stop {:a} max_seed {:a} stride {}\nG {:a} floor {:a} "
      "hot_volume {:a} standard_model {}\npotential {}\n",
      version, embedded::numerics_fingerprint(), name_of(p), o.points, o.stop_action, o.max_seed, o.midpoint_stride,
      s.newton_G, s.semiclassical_floor, s.hot_bubble_volume, s.standard_model ? 1 : 0,
      s.potential ? s.potential->identity() : std::string("none"));
  if (s.thin_wall) text += fmt::format("thin_wall {:a} {:a}\n", s.thin_wall->sigma, s.thin_wall->epsilon);
  return fmt::format("btable-{}-{}.txt", name_of(p), fingerprint(text));
}

CachedTable cached_action_table(Prescription p, const TunnellingSetup& setup, const ActionTableOptions& options,
                                const std::optional<std::filesystem::path>& directory) {
  options.validate();
  const std::string key = action_table_key(p, setup, options);
  if (directory) {
    if (const auto entry = cache_read(*directory, key); entry && verified_body(*entry)) {
      try {
        ActionTable t = ActionTable::from_text(*verified_body(*entry));
        if (t.prescription() == p) return {std::move(t), true, key};
      } catch (const InputError&) {  // a damaged entry: rebuild it below
      } catch (const std::logic_error&) {
      }
    }
  }
  ActionTable built(p, setup, options);
  if (directory) {
    const std::string body = built.to_text();
    cache_write(*directory, key, body + std::string(checksum_tag) + fingerprint(body) + "\n");
  }
  return {std::move(built), false, key};
}

}  // namespace ember::tunnelling
