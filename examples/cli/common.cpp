// spinwright command-line program — pieces shared by the subcommands.
#include "commands.hpp"
#include "loaded_model.hpp"
#include "runner.hpp"
#include "text.hpp"

#include <spinwright/io/text_input.hpp>

#include <cstdio>  // std::fputs

namespace spinwright_cli {

int fail(const Failure& f) {
  print_failure(f);
  return f.code;
}

int parse_or_exit(int argc, const char* const* argv, const std::vector<OptionSpec>& specs, const std::string& command,
                  const char* synopsis, const char* description, Args& args, const char* epilogue) {
  const Failure f = parse_args(argc, argv, 2, specs, command, args);
  if (args.has("help")) {
    std::string text = std::string("usage: spinwright ") + command + " " + synopsis + "\n\n" + description + "\n";
    text += "\noptions:\n" + format_options(specs);
    if (epilogue != nullptr) text += std::string("\n") + epilogue;
    std::fputs(text.c_str(), stdout);
    return exit_ok;
  }
  if (f.failed()) return fail(f);
  return -1;
}

Failure write_plot(const std::string& path, const std::string& svg) {
  const auto st = spinwright::io::write_file_text(path, svg);
  if (!st.ok()) return input_failure(st.line == 0 ? st.file + ": " + st.reason : st.message);
  return {};
}

const char* const state_file_help =
    "State files (--warm-start, --state-out, verify): one value per line, in variable order (the\n"
    "first line is node 1): '+' or '-' for spins, or '0' / '1' for bits (bit 1 = spin -1, since\n"
    "x = (1 - s) / 2); exactly N values. Blank lines and lines starting with '#' or '%' are skipped.\n"
    "--state-out writes spins for Ising input and bits for QUBO input.\n";

Failure schedule_options(const Args& args, const std::string& command, ScheduleOptions& out) {
  out = ScheduleOptions{};
  const std::string hint = "run 'spinwright " + command + " --help' for the options";
  if (args.has("beta-start") && args.has("accept-start")) {
    return usage_failure("--beta-start and --accept-start both set the start of the schedule; give one", hint);
  }
  if (args.has("beta-end") && args.has("accept-end")) {
    return usage_failure("--beta-end and --accept-end both set the end of the schedule; give one", hint);
  }
  Failure f;
  if (args.has("beta-start") && (f = parse_real(args, "beta-start", true, command, out.beta_start)).failed()) return f;
  if (args.has("beta-end") && (f = parse_real(args, "beta-end", true, command, out.beta_end)).failed()) return f;
  for (const char* name : {"accept-start", "accept-end"}) {
    if (!args.has(name)) continue;
    double p = 0;
    if ((f = parse_real(args, name, true, command, p)).failed()) return f;
    if (!(p > 0 && p < 1)) {
      return usage_failure(std::string("option '--") + name +
                               "' expects a probability between 0 and 1 (both excluded), got '" + *args.value(name) +
                               "'",
                           hint);
    }
    (std::string(name) == "accept-start" ? out.accept_start : out.accept_end) = p;
  }
  return {};
}

Failure report_option(const Args& args, const std::string& command, bool& json) {
  json = false;
  const std::string* r = args.value("report");
  if (r == nullptr || *r == "text") return {};
  if (*r == "json") {
    json = true;
    return {};
  }
  return usage_failure("option '--report' expects 'text' or 'json', got '" + *r + "'",
                       "run 'spinwright " + command + " --help' for the options");
}

Failure check_format_option(const Args& args, const std::string& name, const std::string& command, std::string& out) {
  out.clear();
  const std::string* v = args.value(name);
  if (v == nullptr) return {};
  if (*v == "edges" || *v == "mtx") {
    out = *v;
    return {};
  }
  return usage_failure("option '--" + name + "' expects 'edges' or 'mtx', got '" + *v + "'",
                       "run 'spinwright " + command + " --help' for the options");
}

}  // namespace spinwright_cli
