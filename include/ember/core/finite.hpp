// The numerical guard at module boundaries: a value leaving a module must be finite. A value that
// is not becomes a NumericalError (exit 3) naming the module, the inputs that produced it, and
// what the user can try; so a NaN never travels on into a result file.
#pragma once

#include <cmath>
#include <nlohmann/json.hpp>
#include <string>
#include <string_view>
#include <type_traits>

namespace ember {

// Throws NumericalError(module, "<what> = <value> for <inputs>; try <hint>").
[[noreturn]] void throw_non_finite(double value, std::string_view module, std::string_view what,
                                   std::string_view inputs, std::string_view hint);

// Returns `value` when finite. Otherwise throws as above; `inputs` is the text, or a callable
// making it, so a hot path formats nothing unless it fails.
template <class Inputs>
double require_finite(double value, std::string_view module, std::string_view what, Inputs&& inputs,
                      std::string_view hint) {
  if (std::isfinite(value)) [[likely]]
    return value;
  if constexpr (std::is_invocable_v<Inputs>)
    throw_non_finite(value, module, what, std::string(inputs()), hint);
  else
    throw_non_finite(value, module, what, std::string_view(inputs), hint);
}

// Throws NumericalError("output", ...) naming the JSON path of the first non-finite number
// (nlohmann would otherwise write it as null).
void require_finite_json(const nlohmann::ordered_json& j, std::string_view document);

// Throws NumericalError("output", ...) naming the line of the first "nan" or "inf" token in a
// text output (a CSV or a report) before it is written.
void require_finite_text(std::string_view text, std::string_view document);

}  // namespace ember
