// spinwright — exact enumeration split over threads (opt-in header; uses <thread>).
// The chunks are those of solve_exact (their number depends only on N and the parameters);
// threads take chunks from a shared counter, each with its own state, and the per-chunk
// results are merged in chunk order afterwards. The result is therefore identical to
// solve_exact's for every thread count, floating models included.
#ifndef SPINWRIGHT_PARALLEL_EXACT_THREADS_HPP
#define SPINWRIGHT_PARALLEL_EXACT_THREADS_HPP

#include "../config.hpp"
#include "../kernels/exact.hpp"

#include <atomic>   // std::atomic
#include <cstddef>  // std::size_t
#include <cstdint>  // std::uint64_t
#include <thread>   // std::thread
#include <vector>   // std::vector

namespace spinwright {

/// solve_exact on `threads` threads (0: one per hardware thread). Same statuses as solve_exact.
template <class Model>
Result<ExactResult<typename Model::energy_type>> solve_exact_threads(const Model& model, const ExactParams& params,
                                                                     unsigned threads) {
  using energy_type = typename Model::energy_type;
  auto planned = detail::exact_plan(model, params);
  if (!planned) return planned.status();
  const detail::ExactPlan plan = planned.value();
  const energy_type tol = detail::exact_tolerance(model, params);
  if (threads == 0) threads = std::thread::hardware_concurrency() == 0 ? 1 : std::thread::hardware_concurrency();
  if (threads > plan.chunks) threads = static_cast<unsigned>(plan.chunks);

  // Built one by one (a copy would not keep the reserved capacity the keeper relies on).
  std::vector<detail::LevelKeeper<energy_type>> per_chunk;
  per_chunk.reserve(static_cast<std::size_t>(plan.chunks));
  for (std::uint64_t c = 0; c < plan.chunks; ++c) per_chunk.emplace_back(params.levels, tol);
  std::atomic<std::uint64_t> next{0};
  std::atomic<bool> stopped{false};
  auto worker = [&]() {
    SpinState<Model> state(model);
    std::vector<std::int8_t> buffer(plan.n, 1);
    for (std::uint64_t c = next.fetch_add(1); c < plan.chunks; c = next.fetch_add(1)) {
      if (!detail::exact_chunk(plan, c, state, buffer, per_chunk[static_cast<std::size_t>(c)], params.stop)) {
        stopped.store(true);
        return;
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
  if (stopped.load()) return detail::exact_stopped();
  detail::LevelKeeper<energy_type> total(params.levels, tol);
  for (const auto& k : per_chunk) total.merge(k);
  return detail::exact_finish(model, plan, total);
}

}  // namespace spinwright

#endif  // SPINWRIGHT_PARALLEL_EXACT_THREADS_HPP
