#include <fmt/format.h>

#include <cstdio>
#include <iostream>
#include <vector>

#include "command.hpp"
#include "ember/cli/guarded.hpp"
#include "ember/core/errors.hpp"
#include "ember/core/finite.hpp"
#include "ember/core/gsl_status.hpp"
#include "ember/version.hpp"

namespace ember::cli {

void print_json(const nlohmann::ordered_json& object) {
  require_finite_json(object, "the JSON on stdout");
  std::cout << object.dump(2, ' ', false, nlohmann::json::error_handler_t::replace) << "\n";
}

double quantity_option(const std::string& option, const std::string& text, units::Kind kind, units::Sign sign) {
  try {
    return units::parse_quantity(text, kind, sign).value;
  } catch (const units::QuantityError& e) {
    throw InputError(option + " " + e.what());
  }
}

namespace {

int report(const std::string& kind, const std::string& message, int code) {
  std::cout.flush();
  fmt::print(stderr, "ember: {}{}\n", kind, message);
  return code;
}

}  // namespace

int run(int argc, char** argv, ExecutorFactory factory) {
  use_gsl_status_codes();
  CLI::App app{
      "Ember: is a population of primordial black holes excluded because, while evaporating, the holes "
      "would have seeded decay of the metastable Higgs vacuum?",
      "ember"};
  app.set_version_flag("--version", std::string("ember ") + version);
  app.require_subcommand(1);
  app.footer(
      "Exit codes: 0 success, 1 internal error, 2 bad input, 3 numerical failure, 4 results could not be "
      "written (disk full, no permission).\n"
      "Every command that prints results takes --json for one JSON object on stdout.");

  const std::vector<Command> commands{
      add_check(app),     add_schema(app), add_convert(app), add_greybody(app),
      add_evaporate(app), add_higgs(app),  add_bounce(app),  add_run(app, std::move(factory))};

  try {
    app.parse(argc, argv);
  } catch (const CLI::CallForHelp& e) {
    return app.exit(e);
  } catch (const CLI::CallForAllHelp& e) {
    return app.exit(e);
  } catch (const CLI::CallForVersion& e) {
    return app.exit(e);
  } catch (const CLI::ParseError& e) {
    app.exit(e);
    return exit_bad_input;
  }

  return run_guarded([&] {
    for (const auto& command : commands)
      if (command.app->parsed()) return command.run();
    return report("internal error: ", "no command ran", exit_internal);
  });
}

int run_guarded(const std::function<int()>& body) {
  try {
    return body();
  } catch (const InputError& e) {
    return report("", e.what(), exit_bad_input);
  } catch (const NumericalError& e) {
    return report("numerical failure in ", e.what(), exit_numerical);
  } catch (const OutputError& e) {
    return report("", e.what(), exit_output);
  } catch (const std::exception& e) {
    return report("internal error: ", e.what(), exit_internal);
  }
}

}  // namespace ember::cli
