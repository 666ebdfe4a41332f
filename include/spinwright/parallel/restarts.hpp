// spinwright — independent restarts on threads (opt-in header; uses <thread>).
// Restart r is run by run_one(r) and must depend on (seed, r) only; the tally is assembled in
// restart order, so the answer is the same for any thread count.
#ifndef SPINWRIGHT_PARALLEL_RESTARTS_HPP
#define SPINWRIGHT_PARALLEL_RESTARTS_HPP

#include "../config.hpp"
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

}  // namespace spinwright

#endif  // SPINWRIGHT_PARALLEL_RESTARTS_HPP
