// spinwright command-line program — SVG figures for `solve --plot` and `bench --plot`, written
// by hand (no dependency): panels of step curves and a histogram, with axes and ticks. Every
// curve and bar carries data- attributes with its numbers, so tests can read them back.
#ifndef SPINWRIGHT_CLI_PLOT_HPP
#define SPINWRIGHT_CLI_PLOT_HPP

#include <cstdint>  // std::uint64_t
#include <string>   // std::string
#include <vector>   // std::vector

namespace spinwright_cli {

// One point of a restart's trace: its best energy after `sweep` sweeps, `seconds` into it.
struct TracePoint {
  std::uint64_t sweep = 0;
  double seconds = 0;
  double energy = 0;
};
using Trace = std::vector<TracePoint>;

struct Series {
  std::string name;
  std::vector<double> x, y;  // drawn as a step curve (y holds until the next x)
};

struct Panel {
  std::string title, x_label, y_label;
  bool log_x = false;
  bool unit_y = false;  // y axis 0 .. 1 (probabilities)
  std::vector<Series> series;
};

struct Histogram {
  std::string title, x_label;
  std::vector<double> values;  // one per restart
};

// An SVG document: the histogram (when it has values) above the panels, one column.
std::string svg_figure(const std::string& heading, const Histogram* histogram, const std::vector<Panel>& panels);

// Best energy over all restarts against the run's sweeps (per restart) and wall time: the
// running minimum of every trace point, ordered by sweep or by time.
Series best_against_sweeps(const std::vector<Trace>& traces, const std::string& name);
Series best_against_seconds(const std::vector<Trace>& traces, const std::string& name);

// Fraction of traces whose best reached `target` (within `tol`) by sweep k, at every sweep
// where that fraction changes (a prefix of each run, not a shorter schedule).
Series success_against_sweeps(const std::vector<Trace>& traces, double target, double tol, const std::string& name);

}  // namespace spinwright_cli

#endif  // SPINWRIGHT_CLI_PLOT_HPP
