// spinwright command-line program — `exact FILE`: exhaustive enumeration of a small model.
// The enumeration does not poll the stop token, so during it Ctrl-C keeps its default action
// (the program ends at once; the shell reports status 130). There is no partial answer to print.
#include "commands.hpp"
#include "json.hpp"
#include "loaded_model.hpp"
#include "runner.hpp"
#include "text.hpp"

#include <spinwright/control/steady_clock.hpp>

#include <algorithm>  // std::max
#include <thread>     // std::thread::hardware_concurrency

namespace spinwright_cli {

namespace {

const std::vector<OptionSpec>& exact_options() {
  static const std::vector<OptionSpec> specs = {
      {"format", "edges|mtx", "input format (default: detected from the content)"},
      {"threads", "T", "threads; 0 = one per hardware thread (default 0); the answer does not depend on it"},
      {"value-type", "TYPE", "auto, int32, int64 or double: the values the model is held with (default auto)"},
      {"levels", "K", "also list the K lowest distinct energies with their counts (default 1)"},
      {"report", "text|json", "report for people (text, default) or for programs (json)"},
      {"help", nullptr, "show this help"},
  };
  return specs;
}

std::string exact_report(const LoadedModel& m, const spinwright::ExactResult<double>& r, double seconds,
                         unsigned threads, bool json) {
  const bool qubo = m.form == spinwright::Form::qubo;
  double cut = 0, weight = 0;
  if (m.graph) {
    cut = m.cut(r.spins);
    weight = m.total_weight();
  }
  if (json) {
    JsonWriter j;
    j.begin_object();
    j.member("command", "exact");
    j.member("file", m.path);
    j.member("format", m.format);
    j.member("form", m.form_name());
    j.member("graph", m.graph);
    j.member("nodes", static_cast<std::uint64_t>(m.num_spins()));
    j.member("pairs", static_cast<std::uint64_t>(m.num_pairs()));
    j.member("kernel", "exact");
    j.member("value_type", value_type_name(m.value_type));
    j.member("threads", threads);
    j.member("seconds", seconds);
    j.member("energy", r.energy);
    if (m.graph) {
      j.member("cut", cut);
      j.member("total_weight", weight);
    }
    j.member("ground_states", r.ground_states);
    j.member("states_visited", r.states);
    j.member("used_flip_symmetry", r.used_flip_symmetry);
    j.key("spins").begin_array();
    for (const auto v : r.spins) j.value(static_cast<int>(v));
    j.end_array();
    if (qubo) {
      j.key("bits").begin_array();
      for (const auto v : r.spins) j.value(v < 0 ? 1 : 0);
      j.end_array();
    }
    j.key("levels").begin_array();
    for (const auto& l : r.levels) {
      j.begin_object();
      j.member("energy", l.energy);
      j.member("count", l.count);
      j.end_object();
    }
    j.end_array();
    j.end_object();
    return j.str();
  }
  TextReport t;
  t.line("file", m.path);
  t.line("model", m.description + ", " + std::to_string(m.num_spins()) + (m.graph ? " nodes, " : " variables, ") +
                      std::to_string(m.num_pairs()) + (m.graph ? " edges" : " pairs"));
  t.line("values", value_type_name(m.value_type));
  t.line("states", std::to_string(r.states) + " visited" +
                       (r.used_flip_symmetry ? " (half of them: E(s) = E(-s) without fields)" : ""));
  t.line("time", seconds_text(seconds) + " on " + std::to_string(threads) + (threads == 1 ? " thread" : " threads"));
  t.line("ground energy", energy_text(r.energy, m.energy_bound()));
  if (m.graph)
    t.line("maximum cut",
           energy_text(cut, m.energy_bound()) + " (total weight " + energy_text(weight, m.energy_bound()) + ")");
  t.line("ground states", std::to_string(r.ground_states));
  if (r.levels.size() > 1) {
    for (std::size_t k = 1; k < r.levels.size(); ++k) {
      t.line("level " + std::to_string(k + 1),
             number_text(r.levels[k].energy) + " (" + std::to_string(r.levels[k].count) + " states)");
    }
  }
  t.line(qubo ? "bits" : "spins", spins_text(r.spins, qubo) + "  (lowest-index ground state)");
  return t.str();
}

}  // namespace

int run_exact(int argc, const char* const* argv) {
  Args args;
  const int early = parse_or_exit(
      argc, argv, exact_options(), "exact", "FILE [options]",
      "Enumerates every state of a small model: ground energy, a ground state, number of ground states.", args);
  if (early >= 0) return early;
  Failure f = expect_positional(args, 1, "exact", "FILE");
  if (f.failed()) return fail(f);
  std::string format;
  if ((f = check_format_option(args, "format", "exact", format)).failed()) return fail(f);
  std::uint64_t threads = 0, levels = 1;
  if ((f = parse_count(args, "threads", 0, 1024, "exact", threads)).failed()) return fail(f);
  if ((f = parse_count(args, "levels", 1, 1000, "exact", levels)).failed()) return fail(f);
  bool json = false;
  if ((f = report_option(args, "exact", json)).failed()) return fail(f);

  ValueChoice values;
  if ((f = value_type_option(args, "exact", values)).failed()) return fail(f);
  LoadedModel m;
  if ((f = load_model(args.positional[0], format, m, values)).failed()) return fail(f);
  if (m.num_spins() > exact_limit()) {
    return fail(input_failure(m.path + ": exact enumeration is limited to " + std::to_string(exact_limit()) +
                              " spins and this model has " + std::to_string(m.num_spins()) +
                              "; use 'spinwright solve' instead"));
  }
  spinwright::ExactParams params;
  params.levels = static_cast<std::size_t>(levels);
  params.stop = &interrupt_token();  // polled every 2^16 states: Ctrl-C ends it without an answer
  unsigned used = threads == 0 ? std::max(1u, std::thread::hardware_concurrency()) : static_cast<unsigned>(threads);
  const double start = spinwright::steady_seconds(nullptr);
  spinwright::ExactResult<double> r;
  if ((f = enumerate_exact(m, params, used, r)).failed()) return fail(f);
  const double seconds = spinwright::steady_seconds(nullptr) - start;
  const std::string report = exact_report(m, r, seconds, used, json);
  if (!write_stdout(report)) return fail(input_failure("spinwright: cannot write the report to standard output"));
  return exit_ok;
}

}  // namespace spinwright_cli
