// The command line: each command file adds one subcommand and returns the action to run when
// it is chosen. The action returns the exit code; errors are thrown and mapped in app.cpp.
#pragma once

#include <CLI/CLI.hpp>
#include <functional>
#include <memory>
#include <nlohmann/json.hpp>
#include <string>

#include "ember/pipeline/executor.hpp"
#include "ember/units/quantity.hpp"

namespace ember::cli {

struct Command {
  CLI::App* app;
  std::function<int()> run;
};

Command add_check(CLI::App& parent);
Command add_schema(CLI::App& parent);
Command add_convert(CLI::App& parent);
Command add_greybody(CLI::App& parent);
Command add_evaporate(CLI::App& parent);
Command add_higgs(CLI::App& parent);
Command add_bounce(CLI::App& parent);
// Makes the executor `ember run` computes its units with, from the thread count; empty: threads
// on this machine. ember-mpi passes one for MPI ranks.
using ExecutorFactory = std::function<std::unique_ptr<pipeline::Executor>(int threads)>;
Command add_run(CLI::App& parent, ExecutorFactory factory);

// A quantity given on the command line, in internal units; errors name the option.
double quantity_option(const std::string& option, const std::string& text, units::Kind kind,
                       units::Sign sign = units::Sign::positive);

// Prints one JSON object on stdout (the --json contract).
void print_json(const nlohmann::ordered_json& object);

int run(int argc, char** argv, ExecutorFactory factory = {});

}  // namespace ember::cli
