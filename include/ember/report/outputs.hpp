// Writing the results of `ember run`: summary.json, constraint.csv, decay.csv, the plot data
// (rates.csv, potential.csv) and resolved.yaml, each written atomically. The figures are the
// caller's (the command line runs scripts/plot): the library starts no processes. CSV files open
// with commented lines giving the units and the scenario hash. No NaN or inf is ever written:
// missing values are empty cells in CSV and null in JSON.
// Units: masses in g, times in s, energies in GeV in every file.
#pragma once

#include <filesystem>
#include <functional>
#include <string>
#include <vector>

#include "ember/core/output_set.hpp"
#include "ember/pipeline/job.hpp"
#include "ember/scenario/load.hpp"

namespace ember::report {

// The cautions every summary states.
std::vector<std::string> cautions(const scenario::Scenario& s);

struct Written {
  std::vector<std::string> files;
  std::string plots_note;  // why plots were or were not made
};

// Draws figures from the plot data in `staging` (the set's staging folder, holding every data
// file) in the given image formats, before the set is committed: what it writes there becomes
// part of the set. Returns the note for the summary (what was drawn, or why not).
using Figures =
    std::function<std::string(const std::filesystem::path& staging, const std::vector<std::string>& formats)>;

// With no `figures`, the plot data is written and no figure drawn.
Written write_outputs(const scenario::LoadedScenario& loaded, const pipeline::JobResults& results,
                      const std::filesystem::path& directory, const Figures& figures = {},
                      ForeignFolder foreign = ForeignFolder::refuse);

nlohmann::ordered_json summary_json(const scenario::LoadedScenario& loaded, const pipeline::JobResults& results);

// The short human summary for the terminal.
std::string summary_text(const scenario::LoadedScenario& loaded, const pipeline::JobResults& results);

}  // namespace ember::report
