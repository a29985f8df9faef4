// Fuzz target: the greybody table reader (greybody/table.hpp). A table that loads gives finite
// transmissions in [0, 1] (within the error it states) for each tabulated mode.
#include <cmath>

#include "ember/core/errors.hpp"
#include "ember/greybody/table.hpp"
#include "fuzz_support.hpp"

using namespace ember;

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  std::unique_ptr<greybody::Table> table;
  try {
    table = std::make_unique<greybody::Table>(greybody::parse_table(fuzz::as_text(data, size), "fuzz.tsv"));
  } catch (const InputError&) {
    return 0;
  }
  for (int twice_spin : {0, 1, 2, 4})
    for (int twice_l : table->twice_ls(twice_spin))
      for (double x : {1e-6, 1e-2, 0.3, 1.0, 3.0, 1e3}) {
        const Estimate g = table->transmission(twice_spin, twice_l, x);
        fuzz::require(std::isfinite(g.value) && std::isfinite(g.error), "a transmission is finite");
        fuzz::require(g.value >= 0 && g.value <= 1 + 1e-6 + g.error, "a transmission lies in [0, 1]");
      }
  return 0;
}
