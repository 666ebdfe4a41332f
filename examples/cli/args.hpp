// spinwright command-line program — argument parsing (own code, no library).
// Options are spelled out in full: `--name VALUE` or `--name=VALUE`; `--` ends the options.
// Every mistake becomes a Failure with exit code 2 (usage error), a one-line message and a hint.
#ifndef SPINWRIGHT_CLI_ARGS_HPP
#define SPINWRIGHT_CLI_ARGS_HPP

#include <cstdint>  // std::uint64_t
#include <map>      // std::map
#include <string>   // std::string
#include <vector>   // std::vector

namespace spinwright_cli {

// Process exit codes (documented in docs/cli.md).
enum ExitCode : int {
  exit_ok = 0,
  exit_input = 1,          // unreadable or malformed input, a refused model, an unwritable output
  exit_usage = 2,          // bad command line
  exit_interrupted = 130,  // Ctrl-C (128 + SIGINT)
};

// Why a command could not go on. `message` is one line; `hint` (usage errors) a second one.
struct Failure {
  int code = exit_ok;
  std::string message;
  std::string hint;
  bool failed() const noexcept { return code != exit_ok; }
};

Failure usage_failure(std::string message, std::string hint);
Failure input_failure(std::string message);
// Ctrl-C ended an operation that has no partial answer (exact enumeration): exit 130.
Failure interrupted_failure(std::string message);

struct OptionSpec {
  const char* name;     // without the leading "--"
  const char* metavar;  // nullptr for a flag without a value
  const char* help;
};

struct Args {
  std::vector<std::string> positional;
  std::map<std::string, std::string> values;  // options with a value
  std::vector<std::string> flags;             // options without a value that were given

  bool has(const std::string& name) const;
  const std::string* value(const std::string& name) const;
};

// Parses argv[first..argc). `command` names the subcommand for hints.
Failure parse_args(int argc, const char* const* argv, int first, const std::vector<OptionSpec>& specs,
                   const std::string& command, Args& out);

// Strict number parsing: the whole text must be the number.
Failure parse_count(const Args& args, const std::string& name, std::uint64_t min, std::uint64_t max,
                    const std::string& command, std::uint64_t& out);
Failure parse_real(const Args& args, const std::string& name, bool positive, const std::string& command, double& out);
bool parse_u64_text(const std::string& text, std::uint64_t& out);
bool parse_double_text(const std::string& text, double& out);

// Checks the number of positional arguments.
Failure expect_positional(const Args& args, std::size_t count, const std::string& command, const char* what);

// The closest name among `names` to `word` (edit distance <= 2), or "".
std::string closest(const std::string& word, const std::vector<std::string>& names);

// Help text for a subcommand's options, aligned.
std::string format_options(const std::vector<OptionSpec>& specs);

}  // namespace spinwright_cli

#endif  // SPINWRIGHT_CLI_ARGS_HPP
