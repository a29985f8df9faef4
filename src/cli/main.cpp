// ember: the command-line entry point. The commands live in src/cli/command_*.cpp.
#include "command.hpp"

int main(int argc, char** argv) {
  return ember::cli::run(argc, argv);
}
