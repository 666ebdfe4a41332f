// spinwright — breakout searches on several threads that share an elite pool (opt-in header;
// uses <thread>). The run goes in rounds: every thread advances its own BreakoutSearch
// (kernels/breakout.hpp) by the same number of sweeps, then, on the calling thread, the pool
// takes the best states, and a search whose own best did not improve for `patience` rounds
// restarts from a pool state (drawn at random) with a random fraction of its spins flipped.
// Rule and determinism: docs/quality.md.
#ifndef SPINWRIGHT_PARALLEL_BREAKOUT_THREADS_HPP
#define SPINWRIGHT_PARALLEL_BREAKOUT_THREADS_HPP

#include "../config.hpp"
#include "../control.hpp"
#include "../kernels/breakout.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::uint64_t, std::int8_t
#include <limits>   // std::numeric_limits
#include <memory>   // std::unique_ptr
#include <thread>   // std::thread
#include <vector>   // std::vector

namespace spinwright {

struct CooperationParams {
  BreakoutParams search;           // every thread's search (its `initial` is ignored)
  std::uint64_t round_sweeps = 0;  // sweeps per round and thread; 0: automatic (about 2.5e7 tree steps)
  std::uint64_t patience = 3;      // rounds without a new best of its own before a search restarts
  double kick = 0.05;              // fraction of spins flipped in the pool state it restarts from
};

namespace detail {

template <class Model>
std::uint64_t cooperation_round_sweeps(const Model& model, const CooperationParams& p) noexcept {
  if (p.round_sweeps != 0) return p.round_sweeps;
  const std::size_t n = model.num_spins();
  if (n == 0) return 1;
  const double degree = 2.0 * static_cast<double>(model.num_pairs()) / static_cast<double>(n);
  double log_n = 1;
  for (std::size_t l = n; l > 1; l /= 2) log_n += 1;
  const double per_sweep = static_cast<double>(n) * (degree + 1.0) * log_n;
  const double s = 2.5e7 / per_sweep;
  return s < 1 ? 1 : static_cast<std::uint64_t>(s);
}

}  // namespace detail

/// `threads` breakout searches (0: one per hardware thread) cooperating through an elite pool
/// of `threads` states, until the budget ends: its sweeps (per thread; the search's default when
/// 0 and there is no time limit, none when there is one), deadline, stop token or target, checked
/// by every search at every sweep. Search t starts from (seed, t). Deterministic for (seed,
/// threads) when the run ends by its sweeps or target; a deadline or a stop token ends the last
/// round at clock readings (the clock is read from every thread).
template <class Model>
Solution<typename Model::energy_type> breakout_threads(const Model& model, const CooperationParams& params,
                                                       unsigned threads, std::uint64_t seed,
                                                       const Budget& budget = Budget{}) {
  using energy_type = typename Model::energy_type;
  using Search = BreakoutSearch<Model>;
  if (threads == 0) threads = std::thread::hardware_concurrency() == 0 ? 1 : std::thread::hardware_concurrency();
  const std::size_t n = model.num_spins();
  BreakoutParams sp = params.search;
  sp.initial = nullptr;
  std::vector<std::unique_ptr<Search>> search;
  for (unsigned t = 0; t < threads; ++t) search.emplace_back(new Search(model, sp, seed, t));

  const bool timed = budget.clock.valid() && budget.seconds < std::numeric_limits<double>::infinity();
  const std::uint64_t total = budget.sweeps != 0 ? budget.sweeps : (timed ? unlimited_sweeps : sp.sweeps);
  const std::uint64_t round = detail::cooperation_round_sweeps(model, params);
  const double start = budget.clock.valid() ? budget.clock.read() : 0.0;

  // The pool: up to `threads` states of distinct energies, best first.
  struct Entry {
    std::vector<std::int8_t> spins;
    energy_type energy;
  };
  std::vector<Entry> pool;
  std::vector<energy_type> own(threads, std::numeric_limits<energy_type>::max());
  std::vector<std::uint64_t> stale(threads, 0);
  std::vector<StopReason> why(threads, StopReason::budget_exhausted);
  std::vector<std::int8_t> kicked(n);
  Xoshiro256 rng = Xoshiro256::for_restart(seed, threads);
  std::uint64_t restarts = threads;  // restart indices handed out so far
  std::uint64_t done = 0;
  std::uint64_t moves = 0;  // flips of searches since restarted
  StopReason reason = StopReason::budget_exhausted;
  for (;;) {
    const std::uint64_t this_round = total - done < round ? total - done : round;
    Budget b = budget;
    b.sweeps = this_round;
    if (timed) b.seconds = budget.seconds - (budget.clock.read() - start);
    auto work = [&](unsigned t) { why[t] = search[t]->advance(b); };
    std::vector<std::thread> pool_threads;
    for (unsigned t = 1; t < threads; ++t) pool_threads.emplace_back(work, t);
    work(0);
    for (auto& th : pool_threads) th.join();
    done += this_round;
    // Merge in thread order.
    for (unsigned t = 0; t < threads; ++t) {
      const auto bv = search[t]->best();
      bool seen = false;
      for (const auto& e : pool) seen = seen || e.energy == bv.energy;
      if (!seen && (pool.size() < threads || bv.energy < pool.back().energy)) {
        if (pool.size() == threads) pool.pop_back();
        std::size_t at = pool.size();
        while (at > 0 && bv.energy < pool[at - 1].energy) --at;
        pool.insert(pool.begin() + static_cast<std::ptrdiff_t>(at),
                    Entry{std::vector<std::int8_t>(bv.spins, bv.spins + bv.size), bv.energy});
      }
      if (bv.energy < own[t]) {
        own[t] = bv.energy;
        stale[t] = 0;
      } else {
        ++stale[t];
      }
    }
    reason = StopReason::budget_exhausted;
    for (unsigned t = 0; t < threads; ++t)
      if (why[t] != StopReason::budget_exhausted) reason = why[t];
    if (budget.has_target && static_cast<double>(pool.front().energy) <= budget.target) {
      reason = StopReason::target_reached;
    }
    if (reason != StopReason::budget_exhausted || done >= total) break;
    // Restarts from the pool.
    for (unsigned t = 0; t < threads; ++t) {
      if (stale[t] < params.patience || n == 0) continue;
      const Entry& e = pool[rng.below(static_cast<std::uint32_t>(pool.size()))];
      kicked = e.spins;
      std::size_t flips = static_cast<std::size_t>(params.kick * static_cast<double>(n));
      if (flips < 1) flips = 1;
      for (std::size_t k = 0; k < flips; ++k) {
        const std::uint32_t i = rng.below(static_cast<std::uint32_t>(n));
        kicked[i] = static_cast<std::int8_t>(-kicked[i]);
      }
      moves += search[t]->moves_done();
      search[t]->warm_start(kicked.data(), seed, restarts++);
      own[t] = search[t]->best().energy;
      stale[t] = 0;
    }
  }
  Solution<energy_type> s;
  s.spins = pool.front().spins;
  s.energy = model.energy(s.spins.data());
  s.attempted = moves;
  for (const auto& x : search) s.attempted += x->moves_done();
  s.accepted = s.attempted;
  s.sweeps = done;
  s.reason = reason;
  s.seconds = budget.clock.valid() ? budget.clock.read() - start : 0.0;
  s.restart = 0;
  return s;
}

}  // namespace spinwright

#endif  // SPINWRIGHT_PARALLEL_BREAKOUT_THREADS_HPP
