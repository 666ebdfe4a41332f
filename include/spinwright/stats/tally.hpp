// spinwright — Tally: statistics over restarts (best, energies, histogram, success
// probability, residual energy, time to solution).
#ifndef SPINWRIGHT_STATS_TALLY_HPP
#define SPINWRIGHT_STATS_TALLY_HPP

#include "../config.hpp"
#include "../kernels/solution.hpp"

#include <algorithm>  // std::sort
#include <cmath>      // std::log
#include <cstddef>    // std::size_t
#include <cstdint>    // std::uint64_t
#include <limits>     // std::numeric_limits
#include <utility>    // std::pair
#include <vector>     // std::vector

namespace spinwright {

// Time to reach a target with probability p_target by repeating independent runs of length
// t_run, each succeeding with probability p_success:
//   TTS = t_run * ln(1 - p_target) / ln(1 - p_success)
// (Roennow, Wang, Job, Boixo, Isakov, Wecker, Martinis, Lidar, Troyer, "Defining and
// detecting quantum speedup", Science 345, 420-424, 2014). We use the continuous form, no
// ceiling; when p_success >= p_target one run suffices (TTS = t_run); when p_success = 0 the
// result is +infinity.
inline double time_to_solution(double t_run, double p_success, double p_target = 0.99) noexcept {
  if (!(p_success > 0)) return std::numeric_limits<double>::infinity();
  if (p_success >= p_target) return t_run;
  return t_run * std::log(1.0 - p_target) / std::log(1.0 - p_success);
}

template <class Energy>
class Tally {
 public:
  using energy_type = Energy;

  // Adds one restart's result. The best is the lowest energy; ties go to the lowest restart
  // index, so the answer does not depend on the order restarts finish in.
  void add(Solution<Energy> s) {
    energies_.push_back(s.energy);
    seconds_.push_back(s.seconds);
    sweeps_ += s.sweeps;
    if (!has_best_ || s.energy < best_.energy || (s.energy == best_.energy && s.restart < best_.restart)) {
      best_ = std::move(s);
      has_best_ = true;
    }
  }

  bool empty() const noexcept { return energies_.empty(); }
  std::size_t restarts() const noexcept { return energies_.size(); }
  const Solution<Energy>& best() const noexcept { return best_; }
  const std::vector<Energy>& energies() const noexcept { return energies_; }
  const std::vector<double>& seconds() const noexcept { return seconds_; }
  std::uint64_t total_sweeps() const noexcept { return sweeps_; }

  // (energy, count) in increasing energy.
  std::vector<std::pair<Energy, std::size_t>> histogram() const {
    std::vector<Energy> sorted = energies_;
    std::sort(sorted.begin(), sorted.end());
    std::vector<std::pair<Energy, std::size_t>> h;
    for (const Energy e : sorted) {
      if (h.empty() || h.back().first != e) {
        h.push_back({e, 1});
      } else {
        ++h.back().second;
      }
    }
    return h;
  }

  // Fraction of restarts whose energy is <= target (+ tolerance for floating models).
  double success_probability(double target, double tolerance = 0) const noexcept {
    if (energies_.empty()) return 0;
    std::size_t hits = 0;
    for (const Energy e : energies_) hits += static_cast<double>(e) <= target + tolerance;
    return static_cast<double>(hits) / static_cast<double>(energies_.size());
  }

  // Mean energy over restarts minus a reference (e.g. the ground energy).
  double residual_energy(double reference) const noexcept {
    if (energies_.empty()) return 0;
    double sum = 0;
    for (const Energy e : energies_) sum += static_cast<double>(e);
    return sum / static_cast<double>(energies_.size()) - reference;
  }

  // Median seconds per restart.
  double median_seconds() const {
    if (seconds_.empty()) return 0;
    std::vector<double> s = seconds_;
    std::sort(s.begin(), s.end());
    const std::size_t n = s.size();
    return n % 2 ? s[n / 2] : 0.5 * (s[n / 2 - 1] + s[n / 2]);
  }

  // TTS99 with the median restart time as t_run.
  double tts99(double target, double tolerance = 0) const {
    return time_to_solution(median_seconds(), success_probability(target, tolerance), 0.99);
  }

 private:
  Solution<Energy> best_{};
  bool has_best_ = false;
  std::vector<Energy> energies_;
  std::vector<double> seconds_;
  std::uint64_t sweeps_ = 0;
};

}  // namespace spinwright

#endif  // SPINWRIGHT_STATS_TALLY_HPP
