// B(M) tables kept on disk between runs. A table is keyed by a fingerprint of everything it
// depends on: the prescription, the table options, the tunnelling setup (G, the semiclassical
// floor, the hot-bubble volume, the thin wall), the potential's identity() and the fingerprint of
// the numerics sources this binary was built from. A changed input, option or solver therefore
// misses and rebuilds; a hit gives the same table bit for bit (hex floats).
//
// Units: as ActionTable (seed masses in GeV; B dimensionless).
#pragma once

#include <filesystem>
#include <optional>
#include <string>

#include "ember/tunnelling/action_table.hpp"

namespace ember::tunnelling {

struct CachedTable {
  ActionTable table;
  bool hit = false;                          // read from the cache rather than built
  std::string key;                           // the entry's file name
  std::optional<std::string> store_failure;  // built, but the cache could not keep it: why
};

std::string action_table_key(Prescription p, const TunnellingSetup& setup, const ActionTableOptions& options);

// With no directory the table is built and nothing is stored. An unreadable or malformed entry is
// rebuilt and overwritten; a failure to write is not an error (the cache is only an optimisation).
CachedTable cached_action_table(Prescription p, const TunnellingSetup& setup, const ActionTableOptions& options,
                                const std::optional<std::filesystem::path>& directory);

}  // namespace ember::tunnelling
