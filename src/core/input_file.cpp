#include "ember/core/input_file.hpp"

#include <fmt/format.h>

#include <fstream>

#include "ember/core/errors.hpp"

namespace ember {

std::string read_input_file(const std::filesystem::path& file, std::string_view expected, std::uintmax_t max_bytes) {
  const auto fail = [&](const std::string& problem) {
    throw InputError(fmt::format("{}: {}; expected {}", file.string(), problem, expected));
  };
  std::error_code ec;
  const auto status = std::filesystem::status(file, ec);
  if (ec || !std::filesystem::exists(status)) fail("no such file");
  if (std::filesystem::is_directory(status)) fail("is a directory");
  std::ifstream in(file, std::ios::binary);
  if (!in) fail("cannot be read");
  std::string text;
  char buffer[1 << 16];
  while (in.read(buffer, sizeof buffer) || in.gcount() > 0) {
    text.append(buffer, static_cast<std::size_t>(in.gcount()));
    if (text.size() > max_bytes) fail(fmt::format("more than {} bytes", max_bytes));
  }
  if (in.bad()) fail("a read error part-way through");
  return text;
}

}  // namespace ember
