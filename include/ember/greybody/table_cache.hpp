// Greybody tables built on demand and kept on disk between runs (core/cache.hpp), for scenarios
// that ask for a table computed by this binary instead of the one that ships.
//
// The key covers every BuildOptions field that changes the table (the grid, the cuts, the solver
// tolerances; not `quiet`) and the greybody fingerprint of the sources this binary was built from
// (core, units, greybody; see CMakeLists.txt), so a changed option or solver misses the cache.
// The entry is the table in its file format (format_table), with a checksum line; the table
// returned on a miss is read back from that same text, so a hit and a miss give the same table
// bit for bit.
//
// Units: as Table (G = c = hbar = M = 1; x = G M omega / c^3).
#pragma once

#include <filesystem>
#include <optional>
#include <string>

#include "ember/greybody/table.hpp"

namespace ember::greybody {

std::string table_key(const BuildOptions& options);

struct CachedGreybody {
  Table table;
  bool hit = false;
  std::optional<std::string> store_failure;  // built, but the cache could not keep it: why
};

// With no directory nothing is read or stored. A damaged entry is rebuilt and overwritten.
// Throws NumericalError (from build_table) when a solve does not converge.
CachedGreybody cached_table(const BuildOptions& options, const std::optional<std::filesystem::path>& directory);

}  // namespace ember::greybody
