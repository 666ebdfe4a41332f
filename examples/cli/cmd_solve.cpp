// spinwright command-line program — `solve FILE`: low-energy states by a heuristic kernel
// over independent restarts (or by exact enumeration for small models).
#include "commands.hpp"
#include "json.hpp"
#include "loaded_model.hpp"
#include "progress.hpp"
#include "runner.hpp"
#include "spread.hpp"
#include "text.hpp"

#include <spinwright/problems/max_cut.hpp>

#include <algorithm>  // std::max
#include <limits>     // std::numeric_limits
#include <thread>     // std::thread::hardware_concurrency

namespace spinwright_cli {

namespace {

const std::vector<OptionSpec>& solve_options() {
  static const std::vector<OptionSpec> specs = {
      {"format", "edges|mtx", "input format (default: detected from the content)"},
      {"kernel", "NAME", "auto, anneal, temper, tabu, descent, exact, sqa or population (default auto)"},
      {"time-limit", "SECONDS", "wall-clock limit for the whole run; auto without --sweeps fills it (default: none)"},
      {"sweeps", "N",
       "sweeps per restart (default: with auto, the rule's 4000 / 2000 / 1000 by size, see 'inspect'; "
       "otherwise 1000 for anneal, temper and tabu; with --time-limit, as many as fit)"},
      {"restarts", "R", "independent restarts (default 8; one per thread when auto fills a time limit)"},
      {"threads", "T", "threads; 0 = one per hardware thread (default 0)"},
      {"seed", "N", "seed; restart r uses the stream (seed, r) (default 1)"},
      {"value-type", "TYPE", "auto, int32, int64 or double: the values the model is held with (default auto)"},
      {"target", "ENERGY", "stop a restart once it reaches this energy; report the success rate"},
      {"warm-start", "STATEFILE", "start every restart from this state (state file: see below)"},
      {"beta-start", "BETA", "anneal/temper: inverse temperature at the start (hot end) of the schedule"},
      {"beta-end", "BETA", "anneal/temper: inverse temperature at the end (cold end)"},
      {"accept-start", "P",
       "instead of --beta-start: a typical uphill flip is accepted with probability P at the start"},
      {"accept-end", "P", "instead of --beta-end: the smallest uphill step is accepted with probability P at the end"},
      {"state-out", "FILE", "write the best state to FILE"},
      {"plot", "FILE.svg", "write an SVG: energy histogram over restarts, best energy against sweeps and time"},
      {"report", "text|json", "report for people (text, default) or for programs (json)"},
      {"quiet", nullptr, "no progress line"},
      {"help", nullptr, "show this help"},
  };
  return specs;
}

struct SolveSettings {
  std::string format;
  std::string kernel_text = "auto";
  bool kernel_auto = true;
  Kernel kernel = Kernel::anneal;
  RunOptions run;
  bool json = false;
  bool quiet = false;
  std::string warm_path;
  std::string state_out;
  std::string plot;
  ValueChoice values;
};

Failure read_settings(const Args& args, SolveSettings& s) {
  const std::string cmd = "solve";
  Failure f = check_format_option(args, "format", cmd, s.format);
  if (f.failed()) return f;
  if (const std::string* k = args.value("kernel")) {
    s.kernel_text = *k;
    if (!kernel_from_name(*k, s.kernel_auto, s.kernel)) {
      return usage_failure("unknown kernel '" + *k + "'",
                           "kernels are: auto, anneal, temper, tabu, descent, exact, sqa, population");
    }
  }
  std::uint64_t v = 0;
  if ((f = parse_count(args, "sweeps", 1, std::uint64_t{1} << 50, cmd, s.run.sweeps)).failed()) return f;
  s.run.restarts = 8;
  if ((f = parse_count(args, "restarts", 1, 100000000, cmd, s.run.restarts)).failed()) return f;
  v = 0;
  if ((f = parse_count(args, "threads", 0, 1024, cmd, v)).failed()) return f;
  s.run.threads = static_cast<unsigned>(v);
  s.run.seed = 1;
  if ((f = parse_count(args, "seed", 0, ~std::uint64_t{0}, cmd, s.run.seed)).failed()) return f;
  if (args.has("time-limit")) {
    if ((f = parse_real(args, "time-limit", true, cmd, s.run.time_limit)).failed()) return f;
  }
  if (args.has("target")) {
    s.run.has_target = true;
    if ((f = parse_real(args, "target", false, cmd, s.run.target)).failed()) return f;
  }
  if ((f = report_option(args, cmd, s.json)).failed()) return f;
  if ((f = value_type_option(args, cmd, s.values)).failed()) return f;
  if ((f = schedule_options(args, cmd, s.run.schedule)).failed()) return f;
  s.quiet = args.has("quiet");
  if (const std::string* w = args.value("warm-start")) s.warm_path = *w;
  if (const std::string* o = args.value("state-out")) s.state_out = *o;
  if (const std::string* p = args.value("plot")) s.plot = *p;
  return {};
}

std::string solve_json(const LoadedModel& m, const SolveSettings& s, const RunResult& r) {
  const auto& best = r.tally.best();
  JsonWriter j;
  j.begin_object();
  j.member("command", "solve");
  j.member("file", m.path);
  j.member("format", m.format);
  j.member("form", m.form_name());
  j.member("graph", m.graph);
  j.member("nodes", static_cast<std::uint64_t>(m.num_spins()));
  j.member("pairs", static_cast<std::uint64_t>(m.num_pairs()));
  j.member("value_type", value_type_name(r.value_type));
  j.member("kernel", kernel_name(s.run.kernel));
  j.member("kernel_requested", s.kernel_text);
  j.member("time_filling", s.run.fill_time);
  j.member("time_driven", s.run.time_driven);
  j.member("seed", s.run.seed);
  j.member("restarts", static_cast<std::uint64_t>(r.tally.restarts()));
  j.member("threads", r.threads);
  j.member("ranks", static_cast<std::uint64_t>(job_ranks()));
  j.member("lanes", static_cast<std::uint64_t>(r.lane_width));
  j.member("bit_sliced", r.bit_sliced);
  j.member("fill_group", r.fill_group);
  j.member("shared_draws", r.shared_draws);
  j.member("sweeps", r.tally.total_sweeps());
  j.member("seconds", r.seconds);
  j.member("interrupted", r.interrupted);
  j.member("cut_short", r.cut_short);
  if (r.beta_end > 0) {
    j.member("beta_start", r.beta_start);
    j.member("beta_end", r.beta_end);
  }
  j.member("energy", best.energy);
  if (m.graph) {
    j.member("cut", m.cut(best.spins));
    j.member("total_weight", m.total_weight());
  }
  if (r.exact) {
    j.member("exact", true);
    j.member("ground_states", r.ground_count);
  }
  j.key("spins").begin_array();
  for (const auto v : best.spins) j.value(static_cast<int>(v));
  j.end_array();
  if (m.form == spinwright::Form::qubo) {
    j.key("bits").begin_array();
    for (const auto v : best.spins) j.value(v < 0 ? 1 : 0);
    j.end_array();
  }
  j.key("tally").begin_object();
  j.member("best", best.energy);
  j.member("best_restart", best.restart);
  const auto& es = r.tally.energies();
  double mean = 0, worst = es.empty() ? 0 : es.front();
  for (const double e : es) {
    mean += e;
    worst = e > worst ? e : worst;
  }
  mean = es.empty() ? 0 : mean / static_cast<double>(es.size());
  j.member("mean", mean);
  j.member("worst", worst);
  const double scale = m.energy_bound();
  j.member("restarts_at_best", count_at(r.tally, best.energy, scale));
  j.member("median_restart_seconds", r.tally.median_seconds());
  if (s.run.has_target) {
    j.member("target", s.run.target);
    const double tol = 1e-9 * (scale > 1 ? scale : 1.0);
    j.member("success_probability", r.tally.success_probability(s.run.target, tol));
    j.member("residual_energy", r.tally.residual_energy(s.run.target));
    j.member("tts99_seconds", r.tally.tts99(s.run.target, tol));
  } else {
    j.key("target").null();
  }
  j.end_object();
  j.end_object();
  return j.str();
}

std::string solve_text(const LoadedModel& m, const SolveSettings& s, const RunResult& r) {
  const auto& best = r.tally.best();
  TextReport t;
  t.line("file", m.path);
  t.line("model", m.description + ", " + std::to_string(m.num_spins()) + (m.graph ? " nodes, " : " variables, ") +
                      std::to_string(m.num_pairs()) + (m.graph ? " edges" : " pairs"));
  t.line("kernel",
         std::string(kernel_name(s.run.kernel)) + (s.run.fill_time ? " (chosen automatically, filling the time limit)"
                                                   : s.kernel_auto ? " (chosen automatically)"
                                                   : s.run.time_driven ? " (filling the time limit)"
                                                                       : ""));
  t.line("values", value_type_name(r.value_type));
  if (r.exact) {
    t.line("threads", std::to_string(r.threads));
  } else {
    t.line("restarts", std::to_string(r.tally.restarts()) + " on " + std::to_string(r.threads) +
                           (r.threads == 1 ? " thread" : " threads") +
                           (job_ranks() > 1 ? " on each of " + std::to_string(job_ranks()) + " ranks" : "") +
                           ", seed " + std::to_string(s.run.seed));
    t.line("sweeps", std::to_string(r.tally.total_sweeps()) + " in total");
    if (*r.fill_group != '\0') {
      const std::string g = r.fill_group;
      t.line("groups", g == "single" ? std::string("one annealing run at a time, each longer than the last")
                                     : std::string("each restart anneals groups of ") +
                                           (g == "bit-sliced" ? "64 (bit-sliced)" : std::to_string(r.lane_width) + " (lanes)") +
                                           " in lockstep, each group longer than the last");
    }
    if (r.bit_sliced) {
      t.line("bit-sliced", std::string("64 restarts to a word") +
                               (r.shared_draws ? ", one random number per word and site (restarts of a word correlated)"
                                               : ", independent random bits per restart"));
    }
    if (r.lane_width > 0) {
      t.line("lanes", std::to_string(r.lane_width) + " restarts at a time in lockstep (" + r.lane_unit + ")");
    }
  }
  t.line("time", seconds_text(r.seconds));
  if (r.interrupted) {
    t.line("stopped", "interrupted (Ctrl-C); best state found so far");
  } else if (r.cut_short > 0 && s.run.time_limit < std::numeric_limits<double>::infinity()) {
    t.line("stopped", std::to_string(r.cut_short) + " restarts cut short by the time limit");
  }
  t.line("energy", energy_text(best.energy, m.energy_bound()) +
                       (r.exact ? " (ground state, " + std::to_string(r.ground_count) +
                                      (r.ground_count == 1 ? " ground state)" : " ground states)")
                                : ""));
  if (m.graph) {
    t.line("cut", energy_text(m.cut(best.spins), m.energy_bound()) + " (total weight " +
                      energy_text(m.total_weight(), m.energy_bound()) + ")");
  }
  const double scale = m.energy_bound();
  if (!r.exact) {
    t.line("best found by", std::to_string(count_at(r.tally, best.energy, scale)) + " of " +
                                std::to_string(r.tally.restarts()) + " restarts");
  }
  if (s.run.has_target) {
    const double tol = 1e-9 * (scale > 1 ? scale : 1.0);
    const double p = r.tally.success_probability(s.run.target, tol);
    const auto hits = static_cast<std::uint64_t>(p * static_cast<double>(r.tally.restarts()) + 0.5);
    t.line("target", number_text(s.run.target) + " reached in " + std::to_string(hits) + " of " +
                         std::to_string(r.tally.restarts()) + " restarts (p = " + probability_text(p) + "), TTS99 " +
                         seconds_text(r.tally.tts99(s.run.target, tol)));
  }
  if (r.beta_end > 0)
    t.line("schedule", "beta " + energy_text(r.beta_start, 1e8) + " .. " + energy_text(r.beta_end, 1e8));
  if (!s.state_out.empty()) t.line("state written to", s.state_out);
  const char* label = m.form == spinwright::Form::qubo ? "bits" : "spins";
  if (best.spins.size() <= max_text_spins) {
    t.line(label, spins_text(best.spins, m.form == spinwright::Form::qubo));
  } else {
    t.line(label, std::string("not shown for more than ") + std::to_string(max_text_spins) + " " + label +
                      (s.state_out.empty() ? " (use --state-out FILE or --report json)" : " (see the state file)"));
  }
  return t.str();
}

// The --plot figure: the histogram of the restarts' best energies, and the best energy over
// all restarts against sweeps (within a restart) and against time (since a restart began).
std::string solve_figure(const LoadedModel& m, const SolveSettings& s, const RunResult& r,
                         const std::vector<Trace>& traces) {
  Histogram h;
  h.title = "Best energy of each restart (" + std::to_string(r.tally.restarts()) + " restarts)";
  h.x_label = "energy";
  h.values = r.tally.energies();
  Panel sweeps;
  sweeps.title = "Best energy against sweeps";
  sweeps.x_label = "sweeps into a restart (log scale)";
  sweeps.y_label = "best energy";
  sweeps.log_x = true;
  sweeps.series.push_back(best_against_sweeps(traces, "all restarts"));
  if (!traces.empty()) sweeps.series.push_back(best_against_sweeps({traces.front()}, "restart 0"));
  Panel time;
  time.title = "Best energy against time";
  time.x_label = "seconds into a restart";
  time.y_label = "best energy";
  time.series.push_back(best_against_seconds(traces, "all restarts"));
  const std::string heading = "spinwright solve " + m.path + ": " + kernel_name(s.run.kernel) + ", " +
                              value_type_name(r.value_type) + ", seed " + std::to_string(s.run.seed) + ", best " +
                              energy_text(r.tally.best().energy, m.energy_bound());
  return svg_figure(heading, &h, {sweeps, time});
}

}  // namespace

int run_solve(int argc, const char* const* argv) {
  Args args;
  const int early =
      parse_or_exit(argc, argv, solve_options(), "solve", "FILE [options]",
                    "Finds a low-energy state of the model in FILE (edge list: max-cut graph).", args, state_file_help);
  if (early >= 0) return early;
  Failure f = expect_positional(args, 1, "solve", "FILE");
  if (f.failed()) return fail(f);
  SolveSettings s;
  if ((f = read_settings(args, s)).failed()) return fail(f);

  LoadedModel m;
  if ((f = load_model(args.positional[0], s.format, m, s.values)).failed()) return fail(f);
  if ((f = check_restarts(m, s.run.restarts, "solve")).failed()) return fail(f);
  std::vector<std::int8_t> warm;
  if (!s.warm_path.empty()) {
    if ((f = load_state(s.warm_path, m.num_spins(), warm)).failed()) return fail(f);
    s.run.warm = &warm;
  }
  s.run.kernel = s.kernel;
  if (s.kernel_auto) {
    const AutoPick pick = auto_choice(m);
    s.run.kernel = pick.kernel;
    if (!args.has("sweeps")) s.run.sweeps = pick.sweeps;
    // A time limit without a sweep count (and without a warm start, which the time-filling mode
    // does not take): every restart fills its share of the limit; by default one restart per
    // thread, so each gets the whole limit.
    if (pick.kernel != Kernel::exact && s.run.time_limit < std::numeric_limits<double>::infinity() &&
        !args.has("sweeps") && s.warm_path.empty()) {
      s.run.fill_time = true;
      s.run.sweeps = 0;
      if (!args.has("restarts")) {
        s.run.restarts = s.run.threads != 0 ? s.run.threads : std::max(1u, std::thread::hardware_concurrency());
      }
      s.run.kernel = auto_fill_choice(m, fill_share(s.run));
    }
  }
  // A kernel named on the command line with a time limit and no sweep count fills the limit:
  // annealing then follows the elapsed fraction of the limit along its schedule (ends cold).
  if (!s.kernel_auto && !args.has("sweeps") && s.run.time_limit < std::numeric_limits<double>::infinity() &&
      (s.run.kernel == Kernel::anneal || s.run.kernel == Kernel::temper || s.run.kernel == Kernel::tabu)) {
    s.run.time_driven = true;
  }
  if (s.run.schedule.given() && s.run.kernel != Kernel::anneal && s.run.kernel != Kernel::temper) {
    return fail(usage_failure(std::string("the schedule options apply to anneal and temper, not to ") +
                                  kernel_name(s.run.kernel) + (s.kernel_auto ? " (chosen by auto)" : ""),
                              "add --kernel anneal or --kernel temper"));
  }
  if (s.run.kernel == Kernel::exact && m.num_spins() > exact_limit()) {
    return fail(input_failure(m.path + ": the exact kernel is limited to " + std::to_string(exact_limit()) +
                              " spins and this model has " + std::to_string(m.num_spins())));
  }

  ProgressCounters counters;
  counters.restarts_total = s.run.kernel == Kernel::exact ? 1 : s.run.restarts;
  counters.time_limit = s.run.time_limit < std::numeric_limits<double>::infinity() ? s.run.time_limit : 0;
  s.run.progress = &counters;
  std::vector<Trace> traces;
  if (!s.plot.empty()) {
    traces.resize(static_cast<std::size_t>(std::min<std::uint64_t>(s.run.restarts, max_plot_restarts)));
    s.run.traces = &traces;
  }
  RunResult r;
  {
    ProgressLine line(counters, !s.quiet);
    f = run_kernel(m, s.run, r);
    line.finish();
  }
  if (f.failed()) return fail(f);
  if (!s.state_out.empty()) {
    if ((f = save_state(s.state_out, r.tally.best().spins, m.form == spinwright::Form::qubo)).failed()) return fail(f);
  }
  if (!s.plot.empty()) {
    if ((f = write_plot(s.plot, solve_figure(m, s, r, traces))).failed()) return fail(f);
  }
  const std::string report = s.json ? solve_json(m, s, r) : solve_text(m, s, r);
  if (!write_stdout(report)) return fail(input_failure("spinwright: cannot write the report to standard output"));
  return r.interrupted ? exit_interrupted : exit_ok;
}

}  // namespace spinwright_cli
