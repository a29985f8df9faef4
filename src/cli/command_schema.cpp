// `ember schema`: the documented reference of every scenario key (configs/reference.yaml).
#include <iostream>

#include "command.hpp"
#include "ember/core/errors.hpp"
#include "ember/scenario/reference.hpp"

namespace ember::cli {

Command add_schema(CLI::App& parent) {
  auto json = std::make_shared<bool>(false);
  CLI::App* app =
      parent.add_subcommand("schema", "Print every scenario key with its unit, default, allowed range and meaning.");
  app->add_flag("--json", *json, "print one JSON object on stdout");
  return {app, [json] {
            const auto schema = scenario::scenario_schema();
            if (*json)
              print_json(scenario::reference_json(schema));
            else
              std::cout << scenario::reference_yaml(schema);
            return exit_ok;
          }};
}

}  // namespace ember::cli
