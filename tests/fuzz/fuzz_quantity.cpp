// Fuzz target: the quantity-with-units parser (units/quantity.hpp). The first byte picks the
// kind and sign; the rest is the text. Properties: a parsed value is finite and keeps the sign
// asked for, and the formatted quantity reads back to the same value.
#include <cmath>

#include "ember/units/quantity.hpp"
#include "fuzz_support.hpp"

using namespace ember;

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  if (size == 0) return 0;
  static const units::Kind kinds[] = {units::mass,
                                      units::energy,
                                      units::time,
                                      units::length,
                                      units::temperature,
                                      units::Kind{units::Dimension::energy, 4},
                                      units::Kind{units::Dimension::mass, -1}};
  const units::Kind kind = kinds[data[0] % std::size(kinds)];
  const units::Sign sign = static_cast<units::Sign>((data[0] / 8) % 3);
  const std::string_view text = fuzz::as_text(data + 1, size - 1);
  units::Quantity q;
  try {
    q = units::parse_quantity(text, kind, sign);
  } catch (const units::QuantityError&) {
    return 0;  // refused with a message: what bad text should get
  }
  fuzz::require(std::isfinite(q.value), "a parsed quantity is finite");
  if (sign == units::Sign::positive) fuzz::require(q.value > 0, "a positive quantity is > 0");
  if (sign == units::Sign::non_negative) fuzz::require(q.value >= 0, "a non-negative quantity is >= 0");
  const std::string written = units::format_quantity(q.number, q.unit);
  const units::Quantity again = units::parse_quantity(written, kind, units::Sign::any);
  fuzz::require(again.value == q.value, "format_quantity reads back to the same value");
  fuzz::require(std::isfinite(units::in_unit(q.value, q.unit, kind)), "in_unit of a parsed value is finite");
  return 0;
}
