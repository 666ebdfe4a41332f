// spinwright command-line program — `inspect FILE`: what is in a model file.
#include "commands.hpp"
#include "json.hpp"
#include "loaded_model.hpp"
#include "runner.hpp"
#include "text.hpp"

#include <cstdio>  // std::snprintf

namespace spinwright_cli {

namespace {

const std::vector<OptionSpec>& inspect_options() {
  static const std::vector<OptionSpec> specs = {
      {"format", "edges|mtx", "input format (default: detected from the content)"},
      {"report", "text|json", "report for people (text, default) or for programs (json)"},
      {"help", nullptr, "show this help"},
  };
  return specs;
}

std::string range_text(double lo, double hi) {
  if (lo == hi) return number_text(lo);
  return number_text(lo) + " .. " + number_text(hi);
}

}  // namespace

int run_inspect(int argc, const char* const* argv) {
  Args args;
  const int early = parse_or_exit(argc, argv, inspect_options(), "inspect", "FILE [options]",
                                  "Describes the model in FILE: sizes, degrees, coefficient ranges, components, "
                                  "memory.",
                                  args);
  if (early >= 0) return early;
  Failure f = expect_positional(args, 1, "inspect", "FILE");
  if (f.failed()) return fail(f);
  std::string format;
  if ((f = check_format_option(args, "format", "inspect", format)).failed()) return fail(f);
  bool json = false;
  if ((f = report_option(args, "inspect", json)).failed()) return fail(f);

  LoadedModel m;
  if ((f = load_model(args.positional[0], format, m)).failed()) return fail(f);
  const ModelFigures g = figures_of(m);
  const bool ising = m.form == spinwright::Form::ising;
  const char* linear_name = ising ? "fields" : "unary";
  // Count and value range get different labels; nodes only for graphs, spins or variables otherwise.
  const char* count_name = m.graph ? "edges" : (ising ? "couplings" : "pairs");
  const char* range_name = ising ? "coupling values" : "pair values";
  const char* unit = m.graph ? "node" : (ising ? "spin" : "variable");
  const AutoPick chosen = auto_choice(m);
  std::string report;
  if (json) {
    JsonWriter j;
    j.begin_object();
    j.member("command", "inspect");
    j.member("file", m.path);
    j.member("format", m.format);
    j.member("form", m.form_name());
    j.member("graph", m.graph);
    j.member("value_type", value_type_name(m.value_type));
    j.member("nodes", static_cast<std::uint64_t>(g.nodes));
    j.member("pairs", static_cast<std::uint64_t>(g.pairs));
    j.member("min_degree", static_cast<std::uint64_t>(g.min_degree));
    j.member("max_degree", static_cast<std::uint64_t>(g.max_degree));
    j.member("mean_degree", g.mean_degree);
    j.member("density", g.density);
    j.member("site_terms_nonzero", static_cast<std::uint64_t>(g.site_terms_nonzero));
    j.member("site_term_min", g.site_term_min);
    j.member("site_term_max", g.site_term_max);
    j.member("pair_min", g.pair_min);
    j.member("pair_max", g.pair_max);
    j.member("offset", g.offset);
    j.member("components", static_cast<std::uint64_t>(g.components));
    j.member("largest_component", static_cast<std::uint64_t>(g.largest_component));
    j.member("model_bytes", g.model_bytes);
    j.member("state_bytes", g.state_bytes);
    j.member("auto_kernel", kernel_name(chosen.kernel));
    j.member("auto_sweeps", chosen.sweeps);
    j.end_object();
    report = j.str();
  } else {
    TextReport t;
    char buf[64];
    t.line("file", m.path);
    t.line("format", m.description);
    t.line("form", ising ? "Ising (spins +1/-1)" : "QUBO (bits 0/1)");
    t.line("values", value_type_name(m.value_type));
    t.line(std::string(unit) + "s", std::to_string(g.nodes));
    std::snprintf(buf, sizeof buf, " (density %.3g%%)", 100 * g.density);
    t.line(count_name, std::to_string(g.pairs) + buf);
    std::snprintf(buf, sizeof buf, ", mean %.3g", g.mean_degree);
    t.line("degree", std::to_string(g.min_degree) + " .. " + std::to_string(g.max_degree) + buf);
    if (m.graph) {
      t.line("weights", g.pairs == 0 ? "none" : range_text(g.pair_min, g.pair_max));
    } else {
      t.line(linear_name,
             std::to_string(g.site_terms_nonzero) + " non-zero, " + range_text(g.site_term_min, g.site_term_max));
      t.line(range_name, g.pairs == 0 ? "none" : range_text(g.pair_min, g.pair_max));
    }
    t.line("offset", number_text(g.offset));
    t.line("components", std::to_string(g.components) + " (largest " + std::to_string(g.largest_component) + " " +
                             unit + (g.largest_component == 1 ? ")" : "s)"));
    t.line("memory", bytes_text(g.model_bytes) + " model + " + bytes_text(g.state_bytes) + " per restart");
    t.line("auto kernel", std::string(kernel_name(chosen.kernel)) +
                              (chosen.sweeps > 0 ? ", " + std::to_string(chosen.sweeps) + " sweeps per restart" : "") +
                              " (" + chosen.reason + ")");
    report = t.str();
  }
  if (!write_stdout(report)) return fail(input_failure("spinwright: cannot write the report to standard output"));
  return exit_ok;
}

}  // namespace spinwright_cli
