// spinwright command-line program — `verify FILE STATEFILE`: recomputes the energy (and the
// cut, for graphs) of a given assignment from the model, from scratch.
#include "commands.hpp"
#include "json.hpp"
#include "loaded_model.hpp"
#include "text.hpp"

#include <spinwright/problems/max_cut.hpp>

namespace spinwright_cli {

namespace {

const std::vector<OptionSpec>& verify_options() {
  static const std::vector<OptionSpec> specs = {
      {"format", "edges|mtx", "input format (default: detected from the content)"},
      {"report", "text|json", "report for people (text, default) or for programs (json)"},
      {"help", nullptr, "show this help"},
  };
  return specs;
}

}  // namespace

int run_verify(int argc, const char* const* argv) {
  Args args;
  const int early = parse_or_exit(argc, argv, verify_options(), "verify", "FILE STATEFILE [options]",
                                  "Recomputes the energy (and the cut, for graphs) of the assignment in STATEFILE.",
                                  args, state_file_help);
  if (early >= 0) return early;
  Failure f = expect_positional(args, 2, "verify", "FILE STATEFILE");
  if (f.failed()) return fail(f);
  std::string format;
  if ((f = check_format_option(args, "format", "verify", format)).failed()) return fail(f);
  bool json = false;
  if ((f = report_option(args, "verify", json)).failed()) return fail(f);

  LoadedModel m;
  if ((f = load_model(args.positional[0], format, m)).failed()) return fail(f);
  std::vector<std::int8_t> spins;
  if ((f = load_state(args.positional[1], m.num_spins(), spins)).failed()) return fail(f);
  const double energy = m.energy(spins);
  double cut = 0, weight = 0;
  if (m.graph) {
    cut = m.cut(spins);
    weight = m.total_weight();
  }
  std::size_t minus = 0;
  for (const auto s : spins) minus += s < 0;
  std::string report;
  if (json) {
    JsonWriter j;
    j.begin_object();
    j.member("command", "verify");
    j.member("file", m.path);
    j.member("state_file", args.positional[1]);
    j.member("format", m.format);
    j.member("form", m.form_name());
    j.member("graph", m.graph);
    j.member("nodes", static_cast<std::uint64_t>(m.num_spins()));
    j.member("energy", energy);
    if (m.graph) {
      j.member("cut", cut);
      j.member("total_weight", weight);
    }
    j.member("minus_spins", static_cast<std::uint64_t>(minus));
    j.end_object();
    report = j.str();
  } else {
    TextReport t;
    t.line("file", m.path);
    t.line("state", args.positional[1] + " (" + std::to_string(spins.size()) + " values, " + std::to_string(minus) +
                        (m.form == spinwright::Form::qubo ? " ones)" : " spins -1)"));
    t.line("energy", energy_text(energy, m.energy_bound()));
    if (m.graph)
      t.line("cut",
             energy_text(cut, m.energy_bound()) + " (total weight " + energy_text(weight, m.energy_bound()) + ")");
    report = t.str();
  }
  if (!write_stdout(report)) return fail(input_failure("spinwright: cannot write the report to standard output"));
  return exit_ok;
}

}  // namespace spinwright_cli
