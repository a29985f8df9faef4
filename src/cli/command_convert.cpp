// `ember convert QUANTITY`: a quantity written with units, in every unit of its dimension.
#include <fmt/format.h>

#include <iostream>

#include "command.hpp"
#include "ember/core/errors.hpp"
#include "ember/units/quantity.hpp"

namespace ember::cli {

namespace {

struct ConvertOptions {
  std::string quantity;
  std::string to;
  bool json = false;
};

// The dimensions a unit may express, tried in this order. The eV family is a mass, an energy and
// a temperature at once; all three are shown.
const std::vector<units::Kind> kinds{units::mass,
                                     units::energy,
                                     units::temperature,
                                     units::time,
                                     units::length,
                                     {units::Dimension::energy, 2},
                                     {units::Dimension::energy, 3},
                                     {units::Dimension::energy, 4}};

int convert(const ConvertOptions& options) {
  std::optional<units::Quantity> parsed;
  std::vector<units::Kind> matching;
  std::optional<units::QuantityError> first_error;
  for (const auto& kind : kinds) {
    try {
      parsed = units::parse_quantity(options.quantity, kind, units::Sign::any);
      matching.push_back(kind);
    } catch (const units::QuantityError& e) {
      if (!first_error) first_error = e;
    }
  }
  if (matching.empty())
    throw InputError(fmt::format("convert: {}; expected a number and a unit, e.g. \"1e15 g\"", first_error->problem()));

  nlohmann::ordered_json values = nlohmann::ordered_json::object();
  std::string text;
  for (const auto& kind : matching) {
    for (const auto& unit : units::units_for(kind)) {
      if (!options.to.empty() && unit != options.to) continue;
      if (values.contains(unit)) continue;
      const double x = units::in_unit(parsed->value, unit, kind);
      values[unit] = x;
      text += fmt::format("  {:>24.10g} {:<8} ({})\n", x, unit, units::name_of(kind));
    }
  }
  if (!options.to.empty() && values.empty())
    throw InputError(
        fmt::format("convert: --to {}: not a unit of {}; expected one of its units", options.to, options.quantity));
  if (options.json) {
    print_json({{"input", options.quantity}, {"values", values}});
  } else {
    std::cout << options.quantity << " =\n" << text;
  }
  return exit_ok;
}

}  // namespace

Command add_convert(CLI::App& parent) {
  auto options = std::make_shared<ConvertOptions>();
  CLI::App* app = parent.add_subcommand(
      "convert", "Show a quantity written with units (\"1e15 g\", \"13.8 Gyr\") in every unit of its dimension.");
  app->add_option("quantity", options->quantity, "a number and a unit, e.g. \"1e15 g\"")->required();
  app->add_option("--to", options->to, "show only this unit");
  app->add_flag("--json", options->json, "print one JSON object on stdout");
  return {app, [options] { return convert(*options); }};
}

}  // namespace ember::cli
