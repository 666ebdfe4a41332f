// spinwright command-line program — argument parsing.
#include "args.hpp"

#include <algorithm>  // std::find, std::min
#include <cerrno>     // errno
#include <cmath>      // std::isfinite
#include <cstdlib>    // std::strtoull, std::strtod
#include <cstring>    // std::strncmp
#include <utility>    // std::move

namespace spinwright_cli {

Failure usage_failure(std::string message, std::string hint) {
  return Failure{exit_usage, std::move(message), std::move(hint)};
}

Failure input_failure(std::string message) { return Failure{exit_input, std::move(message), {}}; }
Failure interrupted_failure(std::string message) { return Failure{exit_interrupted, std::move(message), {}}; }

bool Args::has(const std::string& name) const {
  return values.count(name) != 0 || std::find(flags.begin(), flags.end(), name) != flags.end();
}

const std::string* Args::value(const std::string& name) const {
  const auto it = values.find(name);
  return it == values.end() ? nullptr : &it->second;
}

namespace {

std::size_t edit_distance(const std::string& a, const std::string& b) {
  std::vector<std::size_t> prev(b.size() + 1), cur(b.size() + 1);
  for (std::size_t j = 0; j <= b.size(); ++j) prev[j] = j;
  for (std::size_t i = 1; i <= a.size(); ++i) {
    cur[0] = i;
    for (std::size_t j = 1; j <= b.size(); ++j) {
      const std::size_t sub = prev[j - 1] + (a[i - 1] == b[j - 1] ? 0 : 1);
      cur[j] = std::min(std::min(prev[j] + 1, cur[j - 1] + 1), sub);
    }
    prev.swap(cur);
  }
  return prev[b.size()];
}

std::string help_hint(const std::string& command) { return "run 'spinwright " + command + " --help' for the options"; }

}  // namespace

std::string closest(const std::string& word, const std::vector<std::string>& names) {
  std::string best;
  std::size_t best_distance = 3;
  for (const auto& n : names) {
    const std::size_t d = edit_distance(word, n);
    if (d < best_distance) {
      best_distance = d;
      best = n;
    }
  }
  return best;
}

Failure parse_args(int argc, const char* const* argv, int first, const std::vector<OptionSpec>& specs,
                   const std::string& command, Args& out) {
  bool options_done = false;
  for (int k = first; k < argc; ++k) {
    const std::string arg = argv[k];
    if (options_done || arg.size() < 2 || arg[0] != '-') {
      out.positional.push_back(arg);
      continue;
    }
    if (arg == "--") {
      options_done = true;
      continue;
    }
    if (arg == "-h") {
      out.flags.push_back("help");
      continue;
    }
    if (arg.compare(0, 2, "--") != 0) {
      return usage_failure("unknown option '" + arg + "' (options are spelled out in full, e.g. --seed)",
                           help_hint(command));
    }
    std::string name = arg.substr(2);
    std::string inline_value;
    bool has_inline = false;
    const std::size_t eq = name.find('=');
    if (eq != std::string::npos) {
      inline_value = name.substr(eq + 1);
      name = name.substr(0, eq);
      has_inline = true;
    }
    const OptionSpec* spec = nullptr;
    for (const auto& s : specs) {
      if (name == s.name) spec = &s;
    }
    if (spec == nullptr) {
      std::vector<std::string> names;
      for (const auto& s : specs) names.emplace_back(s.name);
      const std::string near = closest(name, names);
      return usage_failure("unknown option '--" + name + "' for '" + command + "'",
                           near.empty() ? help_hint(command) : "did you mean '--" + near + "'? " + help_hint(command));
    }
    if (out.has(name)) {
      return usage_failure("option '--" + name + "' given twice", help_hint(command));
    }
    if (spec->metavar == nullptr) {
      if (has_inline) return usage_failure("option '--" + name + "' takes no value", help_hint(command));
      out.flags.push_back(name);
      continue;
    }
    if (!has_inline) {
      if (k + 1 >= argc) {
        return usage_failure("option '--" + name + "' needs a value (" + spec->metavar + ")", help_hint(command));
      }
      inline_value = argv[++k];
    }
    out.values[name] = inline_value;
  }
  return {};
}

bool parse_u64_text(const std::string& text, std::uint64_t& out) {
  if (text.empty() || text.size() > 20) return false;
  for (const char c : text) {
    if (c < '0' || c > '9') return false;
  }
  errno = 0;
  char* end = nullptr;
  const unsigned long long v = std::strtoull(text.c_str(), &end, 10);
  if (errno == ERANGE || end != text.c_str() + text.size()) return false;
  out = static_cast<std::uint64_t>(v);
  return true;
}

bool parse_double_text(const std::string& text, double& out) {
  if (text.empty()) return false;
  // Plain decimal notation only: no hexadecimal floats, "inf" or "nan".
  for (const char c : text) {
    const bool ok = (c >= '0' && c <= '9') || c == '+' || c == '-' || c == '.' || c == 'e' || c == 'E';
    if (!ok) return false;
  }
  errno = 0;
  char* end = nullptr;
  const double v = std::strtod(text.c_str(), &end);
  if (end != text.c_str() + text.size() || !std::isfinite(v) || errno == ERANGE) return false;
  out = v;
  return true;
}

Failure parse_count(const Args& args, const std::string& name, std::uint64_t min, std::uint64_t max,
                    const std::string& command, std::uint64_t& out) {
  const std::string* text = args.value(name);
  if (text == nullptr) return {};
  std::uint64_t v = 0;
  if (!parse_u64_text(*text, v)) {
    return usage_failure("option '--" + name + "' expects a whole number, got '" + *text + "'", help_hint(command));
  }
  if (v < min || v > max) {
    return usage_failure("option '--" + name + "' must be between " + std::to_string(min) + " and " +
                             std::to_string(max) + ", got " + *text,
                         help_hint(command));
  }
  out = v;
  return {};
}

Failure parse_real(const Args& args, const std::string& name, bool positive, const std::string& command, double& out) {
  const std::string* text = args.value(name);
  if (text == nullptr) return {};
  double v = 0;
  if (!parse_double_text(*text, v)) {
    return usage_failure("option '--" + name + "' expects a finite number, got '" + *text + "'", help_hint(command));
  }
  if (positive && !(v > 0)) {
    return usage_failure("option '--" + name + "' must be greater than 0, got " + *text, help_hint(command));
  }
  out = v;
  return {};
}

Failure expect_positional(const Args& args, std::size_t count, const std::string& command, const char* what) {
  if (args.positional.size() < count) {
    return usage_failure("'" + command + "' needs " + what, "usage: spinwright " + command + " " + what);
  }
  if (args.positional.size() > count) {
    return usage_failure("unexpected argument '" + args.positional[count] + "' for '" + command + "'",
                         "usage: spinwright " + command + " " + what);
  }
  return {};
}

std::string format_options(const std::vector<OptionSpec>& specs) {
  std::vector<std::string> heads;
  std::size_t width = 0;
  for (const auto& s : specs) {
    std::string head = std::string("  --") + s.name;
    if (s.metavar != nullptr) head += std::string(" ") + s.metavar;
    width = std::max(width, head.size());
    heads.push_back(head);
  }
  std::string text;
  for (std::size_t k = 0; k < specs.size(); ++k) {
    text += heads[k] + std::string(width + 2 - heads[k].size(), ' ') + specs[k].help + "\n";
  }
  return text;
}

}  // namespace spinwright_cli
