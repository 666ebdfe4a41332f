// spinwright command-line program — `bench FILE...` or `bench --list LISTFILE`: success
// probability, residual energy and time to solution (TTS99) over R restarts, one table row per
// kernel, for one instance or a whole benchmark set (one combined report).
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
#include "spread.hpp"
#include "text.hpp"

#include <algorithm>  // std::max, std::min
#include <cmath>      // std::isfinite, std::log
#include <cstdio>     // std::snprintf
#include <cstdlib>    // std::strtod
#include <fstream>    // std::ifstream
#include <limits>     // std::numeric_limits
#include <sstream>    // std::istringstream
#include <string>     // std::string
#include <vector>     // std::vector

namespace spinwright_cli {

namespace {

const std::vector<OptionSpec>& bench_options() {
  static const std::vector<OptionSpec> specs = {
      {"format", "edges|mtx", "input format (default: detected from the content)"},
      {"target", "ENERGY", "success means reaching this energy (default: the best energy found); one FILE only"},
      {"list", "LISTFILE", "a benchmark set: one 'PATH [TARGET]' per line ('#' comments; paths relative to the list)"},
      {"restarts", "R", "restarts per kernel (default 32)"},
      {"kernel", "LIST", "comma-separated kernels, 'auto' or 'all' (anneal,temper,tabu,descent) (default auto)"},
      {"sweeps", "N", "sweeps per restart (default: each kernel's own)"},
      {"threads", "T", "threads; 0 = one per hardware thread (default 0)"},
      {"seed", "N", "seed; restart r uses the stream (seed, r) (default 1)"},
      {"time-limit", "SECONDS", "wall-clock limit per kernel (default: none)"},
      {"value-type", "TYPE", "auto, int32, int64 or double: the values the model is held with (default auto)"},
      {"report", "text|json", "table for people (text, default) or for programs (json)"},
      {"plot", "FILE.svg", "write an SVG: success probability and TTS99 against sweeps, per kernel (one FILE only)"},
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
                           "kernels are: auto, all, anneal, temper, tabu, descent, exact, sqa, population");
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

// What every instance of a bench shares: options and the report form.
struct BenchSetup {
  RunOptions base;
  std::string format;
  std::string kernel_text;
  bool json = false;
  bool quiet = false;
  ValueChoice values;
  std::string plot;  // --plot FILE.svg (one instance)
};

// One instance: its rows, its target and its report (a JSON object or a text block).
struct Instance {
  std::string path;
  bool has_target = false;
  double target = 0;
  std::vector<Row> rows;
  bool interrupted = false;
  double tol = 0;
  std::string report;
  std::size_t nodes = 0;
};

// "PATH [TARGET]" per line; '#' starts a comment; paths relative to the list's folder.
Failure read_instance_list(const std::string& list, std::vector<Instance>& out) {
  std::ifstream in(list);
  if (!in) return input_failure(list + ": cannot open the instance list");
  const std::string dir = list.find('/') == std::string::npos ? "" : list.substr(0, list.rfind('/') + 1);
  std::string line;
  std::size_t number = 0;
  while (std::getline(in, line)) {
    ++number;
    const std::size_t hash = line.find('#');
    if (hash != std::string::npos) line.resize(hash);
    std::istringstream words(line);
    std::string path, target, extra;
    if (!(words >> path)) continue;
    Instance inst;
    inst.path = path.front() == '/' || dir.empty() ? path : dir + path;
    if (words >> target) {
      char* end = nullptr;
      inst.target = std::strtod(target.c_str(), &end);
      if (end == target.c_str() || *end != '\0' || !std::isfinite(inst.target)) {
        return input_failure(list + ":" + std::to_string(number) + ": target '" + target + "' is not a number");
      }
      inst.has_target = true;
    }
    if (words >> extra) {
      return input_failure(list + ":" + std::to_string(number) + ": unexpected '" + extra +
                           "' (a line is: PATH [TARGET])");
    }
    out.push_back(std::move(inst));
  }
  if (out.empty()) return input_failure(list + ": the instance list names no file");
  return {};
}

Failure bench_instance(const BenchSetup& setup, Instance& inst) {
  LoadedModel m;
  Failure f;
  if ((f = load_model(inst.path, setup.format, m, setup.values)).failed()) return f;
  if ((f = check_restarts(m, setup.base.restarts, "bench")).failed()) return f;
  std::vector<Entry> kernels;
  if ((f = parse_kernels(setup.kernel_text, m, kernels)).failed()) return f;
  for (const Entry& e : kernels) {
    if (e.kernel == Kernel::exact && m.num_spins() > exact_limit()) {
      return input_failure(m.path + ": the exact kernel is limited to " + std::to_string(exact_limit()) +
                           " spins and this model has " + std::to_string(m.num_spins()));
    }
  }
  inst.nodes = m.num_spins();
  for (const Entry& e : kernels) {
    if (interrupted()) break;
    const Kernel k = e.kernel;
    RunOptions o = setup.base;
    o.kernel = k;
    if (o.sweeps == 0) o.sweeps = e.sweeps;
    // The target is not given to the kernels: every restart runs its whole budget, so the
    // restart time in TTS99 is that of a full run.
    ProgressCounters counters;
    counters.restarts_total = k == Kernel::exact ? 1 : o.restarts;
    counters.time_limit = o.time_limit < std::numeric_limits<double>::infinity() ? o.time_limit : 0;
    o.progress = &counters;
    Row row{k, {}, {}};
    if (!setup.plot.empty()) {
      row.traces.resize(static_cast<std::size_t>(std::min<std::uint64_t>(o.restarts, max_plot_restarts)));
      o.traces = &row.traces;
    }
    {
      ProgressLine line(counters, !setup.quiet);
      f = run_kernel(m, o, row.result);
      line.finish();
    }
    if (f.failed()) return f;
    inst.interrupted = inst.interrupted || row.result.interrupted;
    inst.rows.push_back(std::move(row));
  }
  double best = std::numeric_limits<double>::infinity();
  for (const auto& r : inst.rows) best = std::min(best, r.result.tally.best().energy);
  if (!inst.has_target) inst.target = best;
  const double target = inst.target;
  const double scale = m.energy_bound();
  const double tol = 1e-9 * (scale > 1 ? scale : 1.0);
  inst.tol = tol;
  if (!setup.plot.empty()) {
    if ((f = write_plot(setup.plot, bench_figure(m, inst.rows, target, tol))).failed()) return f;
  }

  if (setup.json) {
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
    j.member("target_given", inst.has_target);
    j.member("seed", setup.base.seed);
    j.member("ranks", static_cast<std::uint64_t>(job_ranks()));
    j.member("interrupted", inst.interrupted);
    j.key("kernels").begin_array();
    for (const auto& r : inst.rows) {
      const auto& t = r.result.tally;
      j.begin_object();
      j.member("kernel", kernel_name(r.kernel));
      j.member("restarts", static_cast<std::uint64_t>(t.restarts()));
      j.member("threads", r.result.threads);
      j.member("bit_sliced", r.result.bit_sliced);
      j.member("shared_draws", r.result.shared_draws);
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
    inst.report = j.str();
  } else {
    TextReport head;
    head.line("file", m.path + " (" + std::to_string(m.num_spins()) + (m.graph ? " nodes, " : " variables, ") +
                          std::to_string(m.num_pairs()) + (m.graph ? " edges)" : " pairs)"));
    head.line("values", value_type_name(m.value_type));
    head.line("target", number_text(target) + (inst.has_target ? "" : " (best energy found in this bench)"));
    head.line("seed", std::to_string(setup.base.seed));
    if (job_ranks() > 1) head.line("ranks", std::to_string(job_ranks()));
    if (inst.interrupted) head.line("stopped", "interrupted (Ctrl-C); figures cover the restarts run so far");
    TextTable table({"kernel", "restarts", "sweeps/restart", "best", "P(success)", "residual", "median time", "TTS99"});
    for (const auto& r : inst.rows) {
      const auto& t = r.result.tally;
      const double per =
          t.restarts() == 0 ? 0 : static_cast<double>(t.total_sweeps()) / static_cast<double>(t.restarts());
      table.row({kernel_name(r.kernel), std::to_string(t.restarts()), short_number(per),
                 energy_text(t.best().energy, scale), probability_text(t.success_probability(target, tol)),
                 energy_text(t.residual_energy(target), scale), seconds_text(t.median_seconds()),
                 seconds_text(t.tts99(target, tol))});
    }
    inst.report = head.str() + "\n" + table.str();
  }
  return {};
}

// Several instances: one report. JSON: {"command": "bench", "instances": [<the one-file report
// of each>]}; text: each instance's block, then one summary table (a row per instance and kernel).
std::string set_report(const BenchSetup& setup, const std::vector<Instance>& set) {
  if (setup.json) {
    std::string out = "{\"command\":\"bench\",\"ranks\":" + std::to_string(job_ranks()) + ",\"instances\":[";
    for (std::size_t k = 0; k < set.size(); ++k) {
      std::string one = set[k].report;
      while (!one.empty() && (one.back() == '\n' || one.back() == ' ')) one.pop_back();
      out += (k ? "," : "") + one;
    }
    return out + "]}\n";
  }
  std::string out;
  for (const auto& inst : set) out += inst.report + "\n";
  TextTable summary({"instance", "nodes", "target", "kernel", "best", "P(success)", "TTS99"});
  for (const auto& inst : set) {
    for (const auto& r : inst.rows) {
      const auto& t = r.result.tally;
      const std::string name = inst.path.substr(inst.path.find_last_of('/') + 1);
      summary.row({name, std::to_string(inst.nodes), number_text(inst.target) + (inst.has_target ? "" : " (best)"),
                   kernel_name(r.kernel), number_text(t.best().energy),
                   probability_text(t.success_probability(inst.target, inst.tol)),
                   seconds_text(t.tts99(inst.target, inst.tol))});
    }
  }
  return out + "summary of " + std::to_string(set.size()) + " instances\n" + summary.str();
}

}  // namespace

int run_bench(int argc, const char* const* argv) {
  Args args;
  const int early = parse_or_exit(
      argc, argv, bench_options(), "bench",
      "FILE [FILE...] | --list LISTFILE [--target ENERGY] [--restarts R] [options]",
      "Success probability, residual energy and TTS99 of each kernel over R restarts, for one instance or a set.",
      args);
  if (early >= 0) return early;
  const std::string cmd = "bench";
  Failure f;
  std::vector<Instance> set;
  if (args.value("list") != nullptr) {
    if (!args.positional.empty()) {
      return fail(usage_failure("'bench' takes FILE arguments or --list, not both",
                                "put every file in the list (one 'PATH [TARGET]' per line)"));
    }
    if ((f = read_instance_list(*args.value("list"), set)).failed()) return fail(f);
  } else {
    if (args.positional.empty()) {
      return fail(usage_failure("'bench' needs FILE", "usage: spinwright bench FILE [FILE...] | --list LISTFILE"));
    }
    for (const auto& p : args.positional) {
      Instance inst;
      inst.path = p;
      set.push_back(std::move(inst));
    }
  }
  BenchSetup setup;
  if ((f = check_format_option(args, "format", cmd, setup.format)).failed()) return fail(f);
  RunOptions& base = setup.base;
  base.restarts = 32;
  base.seed = 1;
  base.independent_restarts = true;  // success probability and TTS99 count restarts as independent trials
  std::uint64_t threads = 0;
  if ((f = parse_count(args, "restarts", 1, 100000000, cmd, base.restarts)).failed()) return fail(f);
  if ((f = parse_count(args, "sweeps", 1, std::uint64_t{1} << 50, cmd, base.sweeps)).failed()) return fail(f);
  if ((f = parse_count(args, "threads", 0, 1024, cmd, threads)).failed()) return fail(f);
  base.threads = static_cast<unsigned>(threads);
  if ((f = parse_count(args, "seed", 0, ~std::uint64_t{0}, cmd, base.seed)).failed()) return fail(f);
  if (args.has("time-limit") && (f = parse_real(args, "time-limit", true, cmd, base.time_limit)).failed())
    return fail(f);
  if (args.has("target")) {
    if (set.size() > 1 || args.value("list") != nullptr) {
      return fail(usage_failure("--target is for one FILE; a set gives each instance its own target",
                                "write 'PATH TARGET' lines in a --list file"));
    }
    double target = 0;
    if ((f = parse_real(args, "target", false, cmd, target)).failed()) return fail(f);
    set[0].has_target = true;
    set[0].target = target;
  }
  if ((f = report_option(args, cmd, setup.json)).failed()) return fail(f);
  setup.kernel_text = args.value("kernel") != nullptr ? *args.value("kernel") : "auto";
  setup.quiet = args.has("quiet");
  if ((f = value_type_option(args, cmd, setup.values)).failed()) return fail(f);
  if (const std::string* plot = args.value("plot")) {
    if (set.size() > 1 || args.value("list") != nullptr) {
      return fail(
          usage_failure("--plot draws one FILE; a set has several", "run 'spinwright bench FILE --plot F.svg'"));
    }
    setup.plot = *plot;
  }

  bool interrupted_run = false;
  std::size_t done = 0;
  for (auto& inst : set) {
    if (interrupted()) break;
    if ((f = bench_instance(setup, inst)).failed()) return fail(f);
    interrupted_run = interrupted_run || inst.interrupted;
    ++done;
  }
  set.resize(done);
  const bool one = set.size() == 1 && args.value("list") == nullptr;
  const std::string report = one ? set[0].report : set_report(setup, set);
  if (!write_stdout(report)) return fail(input_failure("spinwright: cannot write the report to standard output"));
  return interrupted_run ? exit_interrupted : exit_ok;
}

}  // namespace spinwright_cli
