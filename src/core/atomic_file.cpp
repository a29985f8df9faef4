#include "ember/core/atomic_file.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <string>
#include <system_error>

#include "ember/core/errors.hpp"

namespace ember {

WriteFailure write_failure_from_errno(int code) {
  // The path names the wrong kind of thing: the user's to fix. Anything else (ENOSPC, EDQUOT,
  // EROFS, EACCES, EPERM, EIO, ...) is the system refusing.
  const bool path = code == EISDIR || code == ENOTDIR || code == EEXIST || code == ENAMETOOLONG || code == ELOOP;
  return {path, std::strerror(code)};
}

[[noreturn]] void throw_write_failure(const WriteFailure& f, const std::string& message) {
  if (f.path_at_fault) throw InputError(message);
  throw OutputError(message);
}

namespace {

std::optional<WriteFailure> create_folder(const std::filesystem::path& folder) {
  std::error_code ec;
  std::filesystem::create_directories(folder, ec);
  if (!ec) return std::nullopt;
  WriteFailure f = write_failure_from_errno(ec.value());
  f.reason = fmt::format("cannot create folder {}: {}", folder.string(), ec.message());
  return f;
}

// Writes all of `content` to fd; the failure, if any.
std::optional<WriteFailure> write_all(int fd, std::string_view content) {
  const char* data = content.data();
  std::size_t left = content.size();
  while (left > 0) {
    const ssize_t n = ::write(fd, data, left);
    if (n < 0 && errno == EINTR) continue;
    if (n <= 0) return write_failure_from_errno(n < 0 ? errno : EIO);
    data += n;
    left -= static_cast<std::size_t>(n);
  }
  return std::nullopt;
}

}  // namespace

std::optional<WriteFailure> try_write_file_atomically(const std::filesystem::path& target, std::string_view content) {
  std::error_code ec;
  if (std::filesystem::is_directory(target, ec)) return WriteFailure{true, "it is a directory"};
  std::filesystem::path folder = target.parent_path();
  if (folder.empty()) folder = ".";
  if (auto f = create_folder(folder)) return f;

  std::string temp = (folder / ("." + target.filename().string() + ".tmp.XXXXXX")).string();
  const int fd = ::mkstemp(temp.data());
  if (fd < 0) return write_failure_from_errno(errno);
  std::optional<WriteFailure> failure = write_all(fd, content);
  // mkstemp creates 0600; results are ordinary files, readable as the umask allows.
  const mode_t mask = ::umask(0);
  ::umask(mask);
  ::fchmod(fd, 0666 & ~mask);
  if (!failure && ::fsync(fd) != 0) failure = write_failure_from_errno(errno);
  if (::close(fd) != 0 && !failure) failure = write_failure_from_errno(errno);
  if (!failure && std::rename(temp.c_str(), target.c_str()) != 0) failure = write_failure_from_errno(errno);
  if (failure) ::unlink(temp.c_str());
  return failure;
}

void check_writable_file(const std::filesystem::path& target) {
  const auto refuse = [&](const WriteFailure& f) {
    throw_write_failure(f,
                        fmt::format("{}: cannot write: {}; expected a writable file path", target.string(), f.reason));
  };
  std::error_code ec;
  if (std::filesystem::is_directory(target, ec)) refuse({true, "it is a directory"});
  std::filesystem::path existing = std::filesystem::absolute(target, ec).parent_path();
  while (!existing.empty() && !std::filesystem::exists(existing, ec)) existing = existing.parent_path();
  if (!std::filesystem::is_directory(existing, ec)) refuse({true, existing.string() + " is not a folder"});
  if (::access(existing.c_str(), W_OK | X_OK) != 0) refuse(write_failure_from_errno(errno));
}

void write_file_atomically(const std::filesystem::path& target, std::string_view content) {
  if (const auto f = try_write_file_atomically(target, content))
    throw_write_failure(*f,
                        fmt::format("{}: cannot write: {}; expected a writable file path", target.string(), f->reason));
}

}  // namespace ember
