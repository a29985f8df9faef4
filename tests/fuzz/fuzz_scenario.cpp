// Fuzz target: the scenario loader (scenario/load.hpp) on arbitrary text. Every input either
// loads or is refused with an InputError; a loaded scenario's resolved form loads again to the
// same resolved form.
#include "ember/core/errors.hpp"
#include "ember/scenario/load.hpp"
#include "fuzz_support.hpp"

using namespace ember;

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view text = fuzz::as_text(data, size);
  scenario::LoadedScenario loaded;
  try {
    loaded = scenario::load_scenario_text(text, "fuzz.yaml", ".");
  } catch (const InputError&) {
    return 0;
  }
  const std::string resolved = scenario::resolved_yaml(loaded);
  (void)scenario::resolved_json(loaded.resolved).dump();  // throws on invalid UTF-8: a crash here is a bug
  try {
    const auto again = scenario::load_scenario_text(resolved, "fuzz.yaml", ".");
    fuzz::require(scenario::resolved_yaml(again) == resolved, "the resolved scenario resolves to itself");
  } catch (const InputError& e) {
    std::fprintf(stderr, "%s\n", e.what());
    fuzz::require(false, "the resolved scenario loads again");
  }
  return 0;
}
