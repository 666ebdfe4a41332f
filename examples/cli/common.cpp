// spinwright command-line program — pieces shared by the subcommands.
#include "commands.hpp"
#include "loaded_model.hpp"
#include "text.hpp"

#include <cstdio>  // std::fputs

namespace spinwright_cli {

int fail(const Failure& f) {
  print_failure(f);
  return f.code;
}

int parse_or_exit(int argc, const char* const* argv, const std::vector<OptionSpec>& specs, const std::string& command,
                  const char* synopsis, const char* description, Args& args) {
  const Failure f = parse_args(argc, argv, 2, specs, command, args);
  if (args.has("help")) {
    std::string text = std::string("usage: spinwright ") + command + " " + synopsis + "\n\n" + description + "\n";
    text += "\noptions:\n" + format_options(specs);
    std::fputs(text.c_str(), stdout);
    return exit_ok;
  }
  if (f.failed()) return fail(f);
  return -1;
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
