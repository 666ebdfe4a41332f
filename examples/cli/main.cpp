// spinwright command-line program — entry point: subcommand dispatch, help and version.
// Exit codes: 0 success, 1 input error, 2 usage error, 130 interrupted (Ctrl-C).
#include "args.hpp"
#include "commands.hpp"
#include "progress.hpp"
#include "spread.hpp"
#include "text.hpp"

#include <spinwright/version.hpp>

#include <cstdio>  // std::fputs
#include <string>  // std::string
#include <vector>  // std::vector

namespace {

const char* const overview =
    "spinwright - low-energy states of Ising and QUBO models\n"
    "\n"
    "usage: spinwright COMMAND [ARGS] [OPTIONS]\n"
    "\n"
    "commands:\n"
    "  solve FILE             find a low-energy state (heuristic kernels, restarts, threads)\n"
    "  exact FILE             enumerate every state of a small model: ground energy, state, count\n"
    "  inspect FILE           sizes, degrees, coefficient ranges, components, memory\n"
    "  convert IN OUT --to F  exact conversion between forms (ising, qubo) and formats\n"
    "  verify FILE STATEFILE  energy (and cut, for graphs) of a given assignment\n"
    "  bench FILE             success probability, residual energy and TTS99 over restarts\n"
    "\n"
    "FILE is a weighted edge list (a max-cut graph) or a Matrix Market coordinate file;\n"
    "the format is detected from the content. 'spinwright COMMAND --help' lists the options.\n";

}  // namespace

namespace spinwright_cli {

int run_command_line(int argc, char** argv) {
  if (argc < 2) {
    print_failure(usage_failure("no command given", "run 'spinwright --help' for the list of commands"));
    return exit_usage;
  }
  const std::string command = argv[1];
  if (command == "--help" || command == "-h" || command == "help") {
    std::fputs(overview, stdout);
    return exit_ok;
  }
  if (command == "--version") {
    std::fputs((std::string("spinwright ") + spinwright::version_string + "\n").c_str(), stdout);
    return exit_ok;
  }
  const std::vector<std::string> names = {"solve", "exact", "inspect", "convert", "verify", "bench"};
  install_interrupt_handler();
  const char* const* args = argv;
  if (command == "solve") return run_solve(argc, args);
  if (command == "exact") return run_exact(argc, args);
  if (command == "inspect") return run_inspect(argc, args);
  if (command == "convert") return run_convert(argc, args);
  if (command == "verify") return run_verify(argc, args);
  if (command == "bench") return run_bench(argc, args);
  const std::string near = closest(command, names);
  print_failure(usage_failure(
      "unknown command '" + command + "'",
      near.empty() ? "commands are: solve, exact, inspect, convert, verify, bench" : "did you mean '" + near + "'?"));
  return exit_usage;
}

}  // namespace spinwright_cli

#if !SPINWRIGHT_CLI_MPI
int main(int argc, char** argv) { return spinwright_cli::run_command_line(argc, argv); }
#endif
