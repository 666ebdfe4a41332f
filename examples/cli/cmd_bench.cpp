// spinwright command-line program — `bench FILE`: success probability, residual energy and
// time to solution (TTS99) over R restarts, one table row per kernel.
//
// Success: a restart's best energy is at or below the target (within 1e-9 of the model's
// energy range for rounding). Residual energy: the mean of the restarts' best energies minus
// the target. TTS99 = t * ln(0.01) / ln(1 - p), t the median restart time (stats/tally.hpp;
// Roennow et al., Science 345, 2014). Without --target the target is the lowest energy any
// kernel found in this bench, and the report says so.
#include "commands.hpp"
#include "json.hpp"
#include "loaded_model.hpp"
#include "progress.hpp"
#include "runner.hpp"
#include "text.hpp"

#include <algorithm>  // std::max, std::min
#include <cmath>      // std::log
#include <cstdio>     // std::snprintf
#include <limits>     // std::numeric_limits

namespace spinwright_cli {

namespace {

const std::vector<OptionSpec>& bench_options() {
  static const std::vector<OptionSpec> specs = {
      {"format", "edges|mtx", "input format (default: detected from the content)"},
      {"target", "ENERGY", "success means reaching this energy (default: the best energy found)"},
      {"restarts", "R", "restarts per kernel (default 32)"},
      {"kernel", "LIST", "comma-separated kernels, 'auto' or 'all' (anneal,temper,tabu,descent) (default auto)"},
      {"sweeps", "N", "sweeps per restart (default: each kernel's own)"},
      {"threads", "T", "threads; 0 = one per hardware thread (default 0)"},
      {"seed", "N", "seed; restart r uses the stream (seed, r) (default 1)"},
      {"time-limit", "SECONDS", "wall-clock limit per kernel (default: none)"},
      {"value-type", "TYPE", "auto, int32, int64 or double: the values the model is held with (default auto)"},
      {"report", "text|json", "table for people (text, default) or for programs (json)"},
      {"plot", "FILE.svg", "write an SVG: success probability and TTS99 against sweeps, per kernel"},
      {"quiet", nullptr, "no progress line"},
      {"help", nullptr, "show this help"},
  };
  return specs;
}

std::string short_number(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.4g", v);
  return buf;
}

struct Row {
  Kernel kernel;
  RunResult result;
  std::vector<Trace> traces;  // --plot
};

// TTS99 after k sweeps of a restart: k times the median seconds per sweep, times
// ln(0.01) / ln(1 - p(k)) (stats/tally.hpp's rule; Roennow et al., Science 345, 2014); one run
// when p = 1, none (no point) when p = 0.
Series tts_against_sweeps(const Series& success, double seconds_per_sweep, const std::string& name) {
  Series t;
  t.name = name;
  for (std::size_t k = 0; k < success.x.size(); ++k) {
    const double p = success.y[k];
    if (!(p > 0)) continue;
    const double runs = p >= 1 ? 1.0 : std::max(1.0, std::log(0.01) / std::log(1 - p));
    t.x.push_back(success.x[k]);
    t.y.push_back(success.x[k] * seconds_per_sweep * runs);
  }
  return t;
}

std::string bench_figure(const LoadedModel& m, const std::vector<Row>& rows, double target, double tol) {
  Panel success;
  success.title = "Success probability against sweeps (target " + energy_text(target, m.energy_bound()) + ")";
  success.x_label = "sweeps into a restart (log scale)";
  success.y_label = "P(best <= target)";
  success.log_x = true;
  success.unit_y = true;
  Panel tts;
  tts.title = "TTS99 against sweeps";
  tts.x_label = "sweeps per restart (log scale)";
  tts.y_label = "TTS99 (seconds)";
  tts.log_x = true;
  for (const Row& r : rows) {
    const Series p = success_against_sweeps(r.traces, target, tol, kernel_name(r.kernel));
    success.series.push_back(p);
    const auto& t = r.result.tally;
    const double per =
        t.restarts() == 0 || t.total_sweeps() == 0
            ? 0
            : t.median_seconds() / (static_cast<double>(t.total_sweeps()) / static_cast<double>(t.restarts()));
    tts.series.push_back(tts_against_sweeps(p, per, kernel_name(r.kernel)));
  }
  return svg_figure("spinwright bench " + m.path, nullptr, {success, tts});
}

struct Entry {
  Kernel kernel;
  std::uint64_t sweeps;  // 0: the kernel's own default
};

Failure parse_kernels(const std::string& text, const LoadedModel& m, std::vector<Entry>& out) {
  if (text == "all") {
    out = {{Kernel::anneal, 0}, {Kernel::temper, 0}, {Kernel::tabu, 0}, {Kernel::descent, 0}};
    return {};
  }
  std::size_t start = 0;
  while (start <= text.size()) {
    const std::size_t comma = text.find(',', start);
    const std::string name = text.substr(start, comma == std::string::npos ? std::string::npos : comma - start);
    bool is_auto = false;
    Kernel k = Kernel::anneal;
    if (!kernel_from_name(name, is_auto, k)) {
      return usage_failure("unknown kernel '" + name + "' in --kernel",
                           "kernels are: auto, all, anneal, temper, tabu, descent, exact");
    }
    std::uint64_t sweeps = 0;
    if (is_auto) {
      const AutoPick pick = auto_choice(m);
      k = pick.kernel;
      sweeps = pick.sweeps;
    }
    out.push_back({k, sweeps});
    if (comma == std::string::npos) break;
    start = comma + 1;
  }
  return {};
}

}  // namespace

int run_bench(int argc, const char* const* argv) {
  Args args;
  const int early =
      parse_or_exit(argc, argv, bench_options(), "bench", "FILE [--target ENERGY] [--restarts R] [options]",
                    "Success probability, residual energy and TTS99 of each kernel over R restarts.", args);
  if (early >= 0) return early;
  const std::string cmd = "bench";
  Failure f = expect_positional(args, 1, cmd, "FILE");
  if (f.failed()) return fail(f);
  std::string format;
  if ((f = check_format_option(args, "format", cmd, format)).failed()) return fail(f);
  RunOptions base;
  base.restarts = 32;
  base.seed = 1;
  std::uint64_t threads = 0;
  if ((f = parse_count(args, "restarts", 1, 100000000, cmd, base.restarts)).failed()) return fail(f);
  if ((f = parse_count(args, "sweeps", 1, std::uint64_t{1} << 50, cmd, base.sweeps)).failed()) return fail(f);
  if ((f = parse_count(args, "threads", 0, 1024, cmd, threads)).failed()) return fail(f);
  base.threads = static_cast<unsigned>(threads);
  if ((f = parse_count(args, "seed", 0, ~std::uint64_t{0}, cmd, base.seed)).failed()) return fail(f);
  if (args.has("time-limit") && (f = parse_real(args, "time-limit", true, cmd, base.time_limit)).failed())
    return fail(f);
  bool has_target = args.has("target");
  double target = 0;
  if (has_target && (f = parse_real(args, "target", false, cmd, target)).failed()) return fail(f);
  bool json = false;
  if ((f = report_option(args, cmd, json)).failed()) return fail(f);
  const std::string kernel_text = args.value("kernel") != nullptr ? *args.value("kernel") : "auto";

  ValueChoice values;
  if ((f = value_type_option(args, cmd, values)).failed()) return fail(f);
  LoadedModel m;
  if ((f = load_model(args.positional[0], format, m, values)).failed()) return fail(f);
  if ((f = check_restarts(m, base.restarts, "bench")).failed()) return fail(f);
  std::vector<Entry> kernels;
  if ((f = parse_kernels(kernel_text, m, kernels)).failed()) return fail(f);
  for (const Entry& e : kernels) {
    if (e.kernel == Kernel::exact && m.num_spins() > exact_limit()) {
      return fail(input_failure(m.path + ": the exact kernel is limited to " + std::to_string(exact_limit()) +
                                " spins and this model has " + std::to_string(m.num_spins())));
    }
  }

  std::vector<Row> rows;
  bool interrupted_run = false;
  for (const Entry& e : kernels) {
    if (interrupted()) break;
    const Kernel k = e.kernel;
    RunOptions o = base;
    o.kernel = k;
    if (o.sweeps == 0) o.sweeps = e.sweeps;
    // The target is not given to the kernels: every restart runs its whole budget, so the
    // restart time in TTS99 is that of a full run.
    ProgressCounters counters;
    counters.restarts_total = k == Kernel::exact ? 1 : o.restarts;
    counters.time_limit = o.time_limit < std::numeric_limits<double>::infinity() ? o.time_limit : 0;
    o.progress = &counters;
    Row row{k, {}, {}};
    if (args.has("plot")) {
      row.traces.resize(static_cast<std::size_t>(std::min<std::uint64_t>(o.restarts, max_plot_restarts)));
      o.traces = &row.traces;
    }
    {
      ProgressLine line(counters, !args.has("quiet"));
      f = run_kernel(m, o, row.result);
      line.finish();
    }
    if (f.failed()) return fail(f);
    interrupted_run = interrupted_run || row.result.interrupted;
    rows.push_back(std::move(row));
  }
  double best = std::numeric_limits<double>::infinity();
  for (const auto& r : rows) best = std::min(best, r.result.tally.best().energy);
  if (!has_target) target = best;
  const double scale = m.energy_bound();
  const double tol = 1e-9 * (scale > 1 ? scale : 1.0);

  if (const std::string* plot = args.value("plot")) {
    if ((f = write_plot(*plot, bench_figure(m, rows, target, tol))).failed()) return fail(f);
  }
  std::string report;
  if (json) {
    JsonWriter j;
    j.begin_object();
    j.member("command", "bench");
    j.member("file", m.path);
    j.member("format", m.format);
    j.member("form", m.form_name());
    j.member("nodes", static_cast<std::uint64_t>(m.num_spins()));
    j.member("pairs", static_cast<std::uint64_t>(m.num_pairs()));
    j.member("value_type", value_type_name(m.value_type));
    j.member("target", target);
    j.member("target_given", has_target);
    j.member("seed", base.seed);
    j.member("interrupted", interrupted_run);
    j.key("kernels").begin_array();
    for (const auto& r : rows) {
      const auto& t = r.result.tally;
      j.begin_object();
      j.member("kernel", kernel_name(r.kernel));
      j.member("restarts", static_cast<std::uint64_t>(t.restarts()));
      j.member("threads", r.result.threads);
      j.member("sweeps", t.total_sweeps());
      j.member("seconds", r.result.seconds);
      j.member("best", t.best().energy);
      j.member("success_probability", t.success_probability(target, tol));
      j.member("residual_energy", t.residual_energy(target));
      j.member("median_restart_seconds", t.median_seconds());
      j.member("tts99_seconds", t.tts99(target, tol));
      j.end_object();
    }
    j.end_array();
    j.end_object();
    report = j.str();
  } else {
    TextReport head;
    head.line("file", m.path + " (" + std::to_string(m.num_spins()) + (m.graph ? " nodes, " : " variables, ") +
                          std::to_string(m.num_pairs()) + (m.graph ? " edges)" : " pairs)"));
    head.line("values", value_type_name(m.value_type));
    head.line("target", number_text(target) + (has_target ? "" : " (best energy found in this bench)"));
    head.line("seed", std::to_string(base.seed));
    if (interrupted_run) head.line("stopped", "interrupted (Ctrl-C); figures cover the restarts run so far");
    TextTable table({"kernel", "restarts", "sweeps/restart", "best", "P(success)", "residual", "median time", "TTS99"});
    for (const auto& r : rows) {
      const auto& t = r.result.tally;
      const double per =
          t.restarts() == 0 ? 0 : static_cast<double>(t.total_sweeps()) / static_cast<double>(t.restarts());
      table.row({kernel_name(r.kernel), std::to_string(t.restarts()), short_number(per),
                 energy_text(t.best().energy, scale), probability_text(t.success_probability(target, tol)),
                 energy_text(t.residual_energy(target), scale), seconds_text(t.median_seconds()),
                 seconds_text(t.tts99(target, tol))});
    }
    report = head.str() + "\n" + table.str();
  }
  if (!write_stdout(report)) return fail(input_failure("spinwright: cannot write the report to standard output"));
  return interrupted_run ? exit_interrupted : exit_ok;
}

}  // namespace spinwright_cli
