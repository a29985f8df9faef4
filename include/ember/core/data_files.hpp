// Where Ember finds its data tables: the folder named by the EMBER_DATA_DIR environment
// variable, else the data/ folder of the source tree this binary was built from.
#pragma once

#include <filesystem>
#include <string_view>

namespace ember {

std::filesystem::path data_directory();
std::filesystem::path data_file(std::string_view name);

}  // namespace ember
