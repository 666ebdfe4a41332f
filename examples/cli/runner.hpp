// spinwright command-line program — runs a heuristic kernel over independent restarts.
// Restart r is seeded from (seed, r) only and the tally is assembled in restart order
// (parallel/restarts.hpp), so the same seed gives the same answer for any thread count, as long
// as no time limit or Ctrl-C cuts a restart short.
#ifndef SPINWRIGHT_CLI_RUNNER_HPP
#define SPINWRIGHT_CLI_RUNNER_HPP

#include "loaded_model.hpp"
#include "plot.hpp"
#include "progress.hpp"

#include <spinwright/kernels/auto.hpp>
#include <spinwright/kernels/exact.hpp>
#include <spinwright/stats/tally.hpp>

#include <atomic>  // std::atomic

#include <cstdint>  // std::uint64_t
#include <limits>   // std::numeric_limits
#include <string>   // std::string
#include <vector>   // std::vector

namespace spinwright_cli {

// The library's KernelKind (kernels/auto.hpp), with the same values, and after them the
// kernels that the automatic choice never picks (quantum annealing, population annealing).
enum class Kernel : std::uint8_t {
  anneal = static_cast<std::uint8_t>(spinwright::KernelKind::anneal),
  temper = static_cast<std::uint8_t>(spinwright::KernelKind::temper),
  tabu = static_cast<std::uint8_t>(spinwright::KernelKind::tabu),
  descent = static_cast<std::uint8_t>(spinwright::KernelKind::descent),
  exact = static_cast<std::uint8_t>(spinwright::KernelKind::exact),
  breakout = static_cast<std::uint8_t>(spinwright::KernelKind::breakout),
  sqa = 64,
  population,
};
inline Kernel kernel_of(spinwright::KernelKind k) { return static_cast<Kernel>(k); }
// spinwright::to_string for the library's kinds.
const char* kernel_name(Kernel k);
// "auto" is resolved by choose_kernel; false for an unknown name.
bool kernel_from_name(const std::string& name, bool& is_auto, Kernel& out);

// The automatic choice: spinwright::choose_kernel of kernels/auto.hpp (exact for N <= 20,
// breakout with 1000 sweeps at pair density >= 0.1, annealing otherwise with 4000 / 2000 / 1000
// sweeps by size), documented in docs/cli.md.
struct AutoPick {
  Kernel kernel = Kernel::anneal;
  std::uint64_t sweeps = 0;  // the rule's sweeps per restart (0 for exact)
  std::string reason;
};
AutoPick auto_choice(const LoadedModel& m);

// The kernel that fills a time limit of `seconds` per restart under `auto`
// (spinwright::auto_fill_kernel: annealing, tempering for square-lattice-like graphs when the
// time holds its ladder, breakout for dense models, exact for N <= 20).
Kernel auto_fill_choice(const LoadedModel& m, double seconds);

// Largest N the exact kernel takes from the command line.
std::size_t exact_limit();

// Schedule options of annealing and tempering (0: not given). Each end is given as an inverse
// temperature or as an acceptance probability: at the start, of a typical uphill flip (the
// beta span's hot delta), at the end, of the smallest uphill step (its cold delta), so
// beta = -ln(p) / delta. An end not given keeps the automatic beta span (kernels/beta_span.hpp).
struct ScheduleOptions {
  double beta_start = 0;
  double beta_end = 0;
  double accept_start = 0;
  double accept_end = 0;
  bool given() const { return beta_start > 0 || beta_end > 0 || accept_start > 0 || accept_end > 0; }
};

struct RunOptions {
  Kernel kernel = Kernel::anneal;
  std::uint64_t sweeps = 0;  // per restart; 0: the kernel's default
  // A time limit without a sweep count for a kernel named on the command line: the restarts
  // run until their share of the limit (sweeps unlimited); annealing follows the elapsed
  // fraction of the limit along its schedule, so it ends cold at the deadline.
  bool time_driven = false;
  // Restart statistics must come from independent restarts (bench): bit-sliced annealing then
  // draws independent random bits per restart instead of sharing one number per word.
  bool independent_restarts = false;
  ScheduleOptions schedule;
  std::uint64_t restarts = 1;
  unsigned threads = 1;
  std::uint64_t seed = 1;
  double time_limit = std::numeric_limits<double>::infinity();  // seconds for the whole run
  bool has_target = false;
  double target = 0;
  const std::vector<std::int8_t>* warm = nullptr;  // start state of every restart
  // `auto` with a time limit and no sweep count: every restart is spinwright::solve_auto in its
  // time-filling mode over its share of the limit (kernels/auto.hpp); `kernel` is then only
  // what the report names. Ending at the deadline is that mode's normal end, not a cut.
  bool fill_time = false;
  ProgressCounters* progress = nullptr;
  // When set (sized by the caller), restart r < traces->size() records its trace: every new
  // best the kernel reports, and the final (polished) state (`--plot`).
  std::vector<Trace>* traces = nullptr;
};

struct RunResult {
  spinwright::Tally<double> tally;
  ValueType value_type = ValueType::real;  // the value type the kernels ran on
  double beta_start = 0;                   // the schedule's ends (annealing, tempering; 0 otherwise)
  double beta_end = 0;
  double seconds = 0;              // wall time of the whole run (file reading excluded)
  unsigned threads = 1;            // threads actually used
  bool interrupted = false;        // Ctrl-C
  std::uint64_t cut_short = 0;     // restarts ended by the time limit or Ctrl-C
  bool exact = false;              // the exact kernel ran: the best state is a ground state
  std::uint64_t ground_count = 0;  // exact kernel: number of ground states
  std::size_t lane_width = 0;      // restarts annealed W at a time in lockstep lanes (0: one at a time)
  const char* lane_unit = "";      // the vector unit the lanes ran on
  bool bit_sliced = false;         // restarts ran 64 to a word in bit-sliced annealing
  const char* fill_group = "";     // time-filling anneals: each restart's groups (auto_fill_group_for), "" otherwise
  bool shared_draws = false;       // ... with one random number per word and site (restarts of a word correlated)
};

// How many restarts ended at or below `energy` (within 1e-9 of the model's energy range `scale`).
std::uint64_t count_at(const spinwright::Tally<double>& tally, double energy, double scale);

// Refuses (usage error) a restart count whose results would not fit in memory.
inline constexpr std::uint64_t max_restart_bytes = std::uint64_t{1} << 30;
Failure check_restarts(const LoadedModel& m, std::uint64_t restarts, const std::string& command);

// The exact enumeration of cmd_exact, on the model's own value type, energies as double.
Failure enumerate_exact(const LoadedModel& m, const spinwright::ExactParams& params, unsigned threads,
                        spinwright::ExactResult<double>& out);

// Each restart's share of the time limit: the restarts run `threads` at a time on each rank
// (threads 0: one per hardware thread), so the limit is split over the waves.
double fill_share(const RunOptions& o);

// Runs `options.kernel` on the model. Fails (input error) only when the kernel refuses the
// model (e.g. exact beyond its limit).
Failure run_kernel(const LoadedModel& m, const RunOptions& options, RunResult& out);

namespace detail {
// One value type's kernels (runner_kernels.hpp, instantiated in runner_<type>.cpp).
template <class Model>
Failure run_restarts_on(const LoadedModel& m, const Model& model, const RunOptions& o, double start, RunResult& out);
template <class Model>
Failure exact_on(const LoadedModel& m, const Model& model, const spinwright::ExactParams& params, unsigned threads,
                 spinwright::ExactResult<double>& out);
}  // namespace detail

}  // namespace spinwright_cli

#endif  // SPINWRIGHT_CLI_RUNNER_HPP
