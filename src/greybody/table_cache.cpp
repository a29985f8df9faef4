#include "ember/greybody/table_cache.hpp"

#include <fmt/format.h>

#include "ember/core/cache.hpp"
#include "ember/core/embedded.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/hash.hpp"

namespace ember::greybody {

std::string table_key(const BuildOptions& o) {
  const SolverOptions& v = o.solver;
  const std::string text = fmt::format(
      "greybody {}\nx {:a} {:a} points {} power_cut {:a} unit {:a}\node {:a} check {:a} horizon {:a} series {:a}\n",
      embedded::greybody_fingerprint(), o.x_min, o.x_max, o.points_per_mode, o.power_fraction_cut, o.unit_transmission,
      v.ode_relative, v.check_factor, v.horizon_correction, v.series_truncation);
  return fmt::format("greybody-{}.tsv", fingerprint(text));
}

CachedGreybody cached_table(const BuildOptions& o, const std::optional<std::filesystem::path>& directory) {
  o.validate();
  const std::string key = table_key(o);
  if (directory)
    if (const auto body = cache_read_checked(*directory, key)) {
      try {
        return {parse_table(*body, (*directory / key).string()), true, std::nullopt};
      } catch (const InputError&) {  // damaged: rebuilt below
      }
    }
  // No notes: two processes building one key write the same bytes (no timings in the text).
  const std::string text = format_table(build_table(o), {});
  std::optional<std::string> failure;
  if (directory) failure = cache_write_checked(*directory, key, text);
  return {parse_table(text, "the greybody table just built"), false, failure};
}

}  // namespace ember::greybody
