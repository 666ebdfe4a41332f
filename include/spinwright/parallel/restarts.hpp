// spinwright — independent restarts on threads (opt-in header; uses <thread>).
// Restart r is run by run_one(r) and must depend on (seed, r) only; the tally is assembled in
// restart order, so the answer is the same for any thread count. The annealing overload runs
// blocks of restarts in lockstep lanes (kernels/lanes.hpp) when there are enough of them.
#ifndef SPINWRIGHT_PARALLEL_RESTARTS_HPP
#define SPINWRIGHT_PARALLEL_RESTARTS_HPP

#include "../config.hpp"
#include "../control.hpp"
#include "../kernels/anneal.hpp"
#include "../kernels/lanes.hpp"
#include "../stats/tally.hpp"

#include <atomic>   // std::atomic
#include <cstddef>  // std::size_t
#include <cstdint>  // std::uint64_t
#include <thread>   // std::thread
#include <utility>  // std::move
#include <vector>   // std::vector

namespace spinwright {

// run_one: std::uint64_t r -> Solution<Energy>. threads == 0 means one per hardware thread.
template <class Energy, class RunOne>
Tally<Energy> run_restarts(std::uint64_t restarts, unsigned threads, RunOne&& run_one) {
  if (threads == 0) threads = std::thread::hardware_concurrency() == 0 ? 1 : std::thread::hardware_concurrency();
  if (threads > restarts) threads = static_cast<unsigned>(restarts == 0 ? 1 : restarts);
  std::vector<Solution<Energy>> results(static_cast<std::size_t>(restarts));
  std::atomic<std::uint64_t> next{0};
  auto worker = [&]() {
    for (std::uint64_t r = next.fetch_add(1); r < restarts; r = next.fetch_add(1)) {
      results[static_cast<std::size_t>(r)] = run_one(r);
      results[static_cast<std::size_t>(r)].restart = r;
    }
  };
  if (threads <= 1) {
    worker();
  } else {
    std::vector<std::thread> pool;
    pool.reserve(threads);
    for (unsigned t = 0; t < threads; ++t) pool.emplace_back(worker);
    for (auto& th : pool) th.join();
  }
  Tally<Energy> tally;
  for (auto& s : results) tally.add(std::move(s));
  return tally;
}

/// A Tally of annealing restarts and how they ran.
template <class Energy>
struct AnnealTally : Tally<Energy> {
  std::size_t lane_width = 0;            // lanes advanced together; 0: one Annealer per restart
  LaneUnit lane_unit = LaneUnit::plain;  // the vector unit the lanes ran on (when lane_width > 0)
};

/// When run_restarts(model, params, ...) uses lanes.
enum class LaneUse : std::uint8_t {
  automatic,  // at least default_lane_width / 2 restarts, the model fits, and no target energy
  never,      // one Annealer per restart
};

/// Annealing restarts 0..restarts-1 of (seed, r) on `threads` threads (0: one per hardware
/// thread). With LaneUse::automatic and at least default_lane_width / 2 restarts, blocks of
/// default_lane_width restarts run in lockstep lanes (LaneAnnealer) when the model fits;
/// otherwise one Annealer per restart. A restart's result depends on (seed, r) and on which
/// of the two kernels ran (lane_width says which), never on the thread count. A Budget with
/// a target energy always takes the one-Annealer path: lanes stop together, so the target
/// would make a restart's result depend on its neighbours in the block.
template <class Model>
AnnealTally<typename Model::energy_type> run_restarts(const Model& model, const AnnealParams& params,
                                                      std::uint64_t seed, std::uint64_t restarts, unsigned threads,
                                                      const Budget& budget = Budget{},
                                                      LaneUse use = LaneUse::automatic) {
  using energy_type = typename Model::energy_type;
  constexpr std::size_t width = default_lane_width;
  using Lanes = LaneAnnealer<Model, width>;
  AnnealTally<energy_type> out;
  const bool lanes = use == LaneUse::automatic && restarts >= width / 2 && !budget.has_target && Lanes::fits(model);
  if (!lanes) {
    static_cast<Tally<energy_type>&>(out) = run_restarts<energy_type>(
        restarts, threads, [&](std::uint64_t r) { return anneal(model, params, seed, r, budget); });
    return out;
  }
  const std::uint64_t blocks = (restarts + width - 1) / width;
  if (threads == 0) threads = std::thread::hardware_concurrency() == 0 ? 1 : std::thread::hardware_concurrency();
  if (threads > blocks) threads = static_cast<unsigned>(blocks);
  std::vector<Solution<energy_type>> results(static_cast<std::size_t>(restarts));
  std::atomic<std::uint64_t> next{0};
  LaneUnit unit = LaneUnit::plain;
  auto worker = [&]() {
    for (std::uint64_t b = next.fetch_add(1); b < blocks; b = next.fetch_add(1)) {
      const std::uint64_t first = b * width;
      const auto count = static_cast<std::size_t>(restarts - first < width ? restarts - first : width);
      Lanes block(model, params, seed, first, count);
      if (b == 0) unit = block.unit();
      double seconds = 0;
      const StopReason why = block.advance(budget, &seconds);
      for (std::size_t l = 0; l < count; ++l) {
        auto& s = results[static_cast<std::size_t>(first + l)];
        s = block.solution(l);
        s.reason = why;
        s.seconds = seconds;
      }
    }
  };
  if (threads <= 1) {
    worker();
  } else {
    std::vector<std::thread> pool;
    pool.reserve(threads);
    for (unsigned t = 0; t < threads; ++t) pool.emplace_back(worker);
    for (auto& th : pool) th.join();
  }
  for (auto& s : results) out.add(std::move(s));
  out.lane_width = width;
  out.lane_unit = unit;
  return out;
}

}  // namespace spinwright

#endif  // SPINWRIGHT_PARALLEL_RESTARTS_HPP
