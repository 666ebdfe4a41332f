// spinwright command-line program — the subcommands. Each takes the whole argv (argv[1] is
// the subcommand) and returns the process exit code; it writes its report to stdout in one
// piece at the end, and errors to stderr.
#ifndef SPINWRIGHT_CLI_COMMANDS_HPP
#define SPINWRIGHT_CLI_COMMANDS_HPP

#include "args.hpp"

#include <cstdint>  // std::uint64_t
#include <string>   // std::string
#include <vector>   // std::vector

namespace spinwright_cli {

struct ScheduleOptions;  // runner.hpp

// The whole program: subcommand dispatch (main.cpp); main() of spinwright and of spinwright-mpi.
int run_command_line(int argc, char** argv);

int run_solve(int argc, const char* const* argv);
int run_exact(int argc, const char* const* argv);
int run_inspect(int argc, const char* const* argv);
int run_convert(int argc, const char* const* argv);
int run_verify(int argc, const char* const* argv);
int run_bench(int argc, const char* const* argv);

// Shared by the commands: parses argv against `specs`, prints help (exit 0) or a usage
// error (exit 2). Returns -1 when the command should go on.
int parse_or_exit(int argc, const char* const* argv, const std::vector<OptionSpec>& specs, const std::string& command,
                  const char* synopsis, const char* description, Args& args, const char* epilogue = nullptr);
// --plot: at most this many restarts keep a trace; writes an SVG text to PATH (input error
// naming PATH when it cannot).
inline constexpr std::uint64_t max_plot_restarts = 100000;
Failure write_plot(const std::string& path, const std::string& svg);
// The state-file format, for --help texts (io/state_file.hpp).
extern const char* const state_file_help;
// The schedule options --beta-start, --beta-end, --accept-start, --accept-end (usage errors).
Failure schedule_options(const Args& args, const std::string& command, ScheduleOptions& out);
// Prints a failure and returns its exit code.
int fail(const Failure& f);
// --report text|json; usage error otherwise.
Failure report_option(const Args& args, const std::string& command, bool& json);

}  // namespace spinwright_cli

#endif  // SPINWRIGHT_CLI_COMMANDS_HPP
