// The figures of `ember run`: scripts/plot (installed as libexec/ember/plot, linked there in a
// build tree; core/data_files.hpp) run over a results folder's plot data. The library writes the
// data; starting the plotting process is the command line's job.
#pragma once

#include <filesystem>
#include <string>
#include <vector>

namespace ember::cli {

// Runs the plotting script on `folder` with the image formats; returns the note for the summary:
// what was drawn, or the script's own message when it failed (matplotlib missing, say).
std::string draw_plots(const std::filesystem::path& folder, const std::vector<std::string>& formats);

}  // namespace ember::cli
