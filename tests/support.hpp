// Helpers shared by the doctest suites.
#pragma once

#include <cmath>
#include <filesystem>

#include "ember/cosmology/background.hpp"
#include "ember/evaporation/mass_loss.hpp"
#include "ember/higgs/potential.hpp"
#include "ember/scenario/scenario.hpp"
#include "ember/tunnelling/action_table.hpp"

namespace ember::testing {

// The source tree (tests read its data/, configs/ and tests/data/); its path is compiled into
// support.cpp only. An inline variable, so namespace-scope paths built from it in a suite are
// initialised after it.
std::filesystem::path source_root();
inline const std::filesystem::path source_dir = source_root();

// The Planck 2018 background over the shipped g_* table, built once.
const cosmology::Background& planck_background();

// The full Standard Model mass loss over the shipped greybody table and particle list, built once.
const evaporation::MassLoss& shipped_mass_loss();

// The Standard Model potential at the default inputs, built once.
const higgs::StandardModelPotential& standard_model();

// A coarse probe-field action table on the Standard Model (30 points, midpoint check every 6th),
// built once: enough for counts that check something other than the table.
const tunnelling::ActionTable& coarse_probe_table();

// |a - b| <= rel |b|
inline bool close(double a, double b, double rel = 1e-14) {
  return std::abs(a - b) <= rel * std::abs(b);
}

// The scenario without its threshold searches (scan.thresholds), for tests that check something
// else: each search evaluates the scenario at a dozen or more other Higgs inputs.
inline scenario::Scenario no_thresholds(scenario::Scenario s) {
  s.scan.thresholds.inputs.clear();
  return s;
}

}  // namespace ember::testing
