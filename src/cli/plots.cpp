#include "plots.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <spawn.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>

#include "ember/core/data_files.hpp"
#include "ember/core/text.hpp"

extern char** environ;

namespace ember::cli {

namespace {

// Debian's python3 (where python3-matplotlib installs) before whatever python3 is first on PATH.
std::string python() {
  return std::filesystem::exists("/usr/bin/python3") ? "/usr/bin/python3" : "python3";
}

std::optional<std::filesystem::path> plot_script() {
  const auto root = installation_root();
  if (!root) return std::nullopt;
  std::filesystem::path p = *root / "libexec" / "ember" / "plot";
  std::error_code ec;
  if (!std::filesystem::is_regular_file(p, ec)) return std::nullopt;
  return p;
}

// The last non-empty line of what the script said on stderr: its reason for failing.
std::string last_line(const std::string& text) {
  std::string line, last;
  for (char c : text + "\n") {
    if (c != '\n') {
      line += c;
      continue;
    }
    if (!trim(line).empty()) last = trim(line);
    line.clear();
  }
  return last;
}

struct Finished {
  int status = -1;     // the exit status; -1 when it did not exit normally
  std::string errors;  // its stderr
};

// Runs argv[0] (searched on PATH) with stdout discarded and stderr captured. A proper argv: no
// shell, so no path needs quoting.
std::optional<Finished> run_process(const std::vector<std::string>& args, std::string& why) {
  int pipe_fds[2];
  if (pipe(pipe_fds) != 0) {
    why = std::strerror(errno);
    return std::nullopt;
  }
  posix_spawn_file_actions_t actions;
  posix_spawn_file_actions_init(&actions);
  posix_spawn_file_actions_addopen(&actions, STDOUT_FILENO, "/dev/null", O_WRONLY, 0);
  posix_spawn_file_actions_adddup2(&actions, pipe_fds[1], STDERR_FILENO);
  posix_spawn_file_actions_addclose(&actions, pipe_fds[0]);
  posix_spawn_file_actions_addclose(&actions, pipe_fds[1]);
  std::vector<char*> argv;
  for (const auto& a : args) argv.push_back(const_cast<char*>(a.c_str()));
  argv.push_back(nullptr);
  pid_t pid = 0;
  const int spawned = posix_spawnp(&pid, argv[0], &actions, nullptr, argv.data(), environ);
  posix_spawn_file_actions_destroy(&actions);
  close(pipe_fds[1]);
  if (spawned != 0) {
    close(pipe_fds[0]);
    why = std::strerror(spawned);
    return std::nullopt;
  }
  Finished f;
  char buffer[4096];
  for (ssize_t n; (n = read(pipe_fds[0], buffer, sizeof buffer)) != 0;) {
    if (n < 0 && errno == EINTR) continue;
    if (n < 0) break;
    f.errors.append(buffer, static_cast<std::size_t>(n));
  }
  close(pipe_fds[0]);
  int status = 0;
  while (waitpid(pid, &status, 0) < 0 && errno == EINTR) {
  }
  f.status = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  return f;
}

}  // namespace

std::string draw_plots(const std::filesystem::path& folder, const std::vector<std::string>& formats) {
  const auto script = plot_script();
  if (!script) return "plots skipped: the plotting script (libexec/ember/plot beside the library) is not installed";
  std::string joined;
  for (const auto& f : formats) joined += (joined.empty() ? "" : ",") + f;
  std::string why;
  const auto done = run_process({python(), script->string(), folder.string(), "--formats", joined}, why);
  if (!done) return fmt::format("plots skipped: {} could not be started ({})", python(), why);
  if (done->status == 0) return "plots written by scripts/plot";
  const std::string said = last_line(done->errors);
  return fmt::format("plots failed: scripts/plot exited with status {}{}", done->status,
                     said.empty() ? std::string() : ": " + said);
}

}  // namespace ember::cli
