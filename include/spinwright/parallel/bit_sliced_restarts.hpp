// spinwright — bit-sliced annealing over many restarts on threads (opt-in header; uses <thread>):
// the restarts are packed 64 to a word, the words are split among the threads in blocks of up
// to four, and every restart's result depends on (seed, r) only, whatever the thread count.
// The kernel: kernels/bit_sliced.hpp; the method: docs/kernels.md ("Bit-sliced").
#ifndef SPINWRIGHT_PARALLEL_BIT_SLICED_RESTARTS_HPP
#define SPINWRIGHT_PARALLEL_BIT_SLICED_RESTARTS_HPP

#include "../config.hpp"
#include "../kernels/bit_sliced.hpp"
#include "../stats/tally.hpp"
#include "../status.hpp"

#include <atomic>   // std::atomic
#include <cstddef>  // std::size_t
#include <cstdint>  // std::uint64_t
#include <memory>   // std::unique_ptr
#include <thread>   // std::thread
#include <utility>  // std::move
#include <vector>   // std::vector

namespace spinwright {

/// A BitSlicedTeam on threads: parts - 1 helper threads, started with the team and joined
/// when it is destroyed, that wait for each half-sweep (spinning with yields) and take one
/// part of it each while the caller takes part 0.
class BitSlicedThreadTeam final : public BitSlicedTeam {
 public:
  explicit BitSlicedThreadTeam(unsigned parts) : parts_(parts < 1 ? 1 : parts) {
    helpers_.reserve(parts_ - 1);
    for (unsigned p = 1; p < parts_; ++p) helpers_.emplace_back([this, p] { serve(p); });
  }
  BitSlicedThreadTeam(const BitSlicedThreadTeam&) = delete;
  BitSlicedThreadTeam& operator=(const BitSlicedThreadTeam&) = delete;
  ~BitSlicedThreadTeam() override {
    quit_.store(true, std::memory_order_relaxed);
    generation_.fetch_add(1, std::memory_order_release);
    for (auto& t : helpers_) t.join();
  }
  unsigned parts() const noexcept override { return parts_; }
  void run(void (*work)(void*, unsigned), void* context) noexcept override {
    work_ = work;
    context_ = context;
    done_.store(0, std::memory_order_relaxed);
    generation_.fetch_add(1, std::memory_order_release);
    work(context, 0);
    while (done_.load(std::memory_order_acquire) != parts_ - 1) std::this_thread::yield();
  }

 private:
  void serve(unsigned p) {
    std::uint64_t seen = 0;
    for (;;) {
      std::uint64_t g = generation_.load(std::memory_order_acquire);
      while (g == seen) {
        std::this_thread::yield();
        g = generation_.load(std::memory_order_acquire);
      }
      seen = g;
      if (quit_.load(std::memory_order_relaxed)) return;
      work_(context_, p);
      done_.fetch_add(1, std::memory_order_release);
    }
  }

  unsigned parts_;
  std::vector<std::thread> helpers_;
  std::atomic<std::uint64_t> generation_{0};
  std::atomic<unsigned> done_{0};
  std::atomic<bool> quit_{false};
  void (*work_)(void*, unsigned) = nullptr;
  void* context_ = nullptr;
};

namespace detail {

// Runs words [first, first + Words) and stores the restarts below `restarts` in `out`; a
// checkerboard kernel shares its half-sweeps with `helpers` threads (0: none).
template <std::size_t Words, class Model>
void run_bit_sliced_block(const Model& model, const BitSlicedParams& params, std::uint64_t seed, std::uint64_t first,
                          std::uint64_t restarts, const Budget& budget,
                          std::vector<Solution<typename Model::energy_type>>& out, unsigned helpers = 0) {
  BitSlicedAnnealer<Model, Words> kernel(model, params, seed, first);
  std::unique_ptr<BitSlicedThreadTeam> team;
  if (helpers > 0 && kernel.checkerboard()) {
    team = std::make_unique<BitSlicedThreadTeam>(helpers + 1);
    kernel.set_team(team.get());
  }
  double seconds = 0;
  const StopReason why = kernel.advance(budget, &seconds);
  kernel.set_team(nullptr);
  team.reset();
  for (std::size_t k = 0; k < kernel.restarts(); ++k) {
    const std::uint64_t r = kernel.first_restart() + k;
    if (r >= restarts) break;
    Solution<typename Model::energy_type> s = kernel.solution_of(k);
    s.seconds = seconds;
    s.reason = why;
    out[static_cast<std::size_t>(r)] = std::move(s);
  }
}

}  // namespace detail

/// `restarts` restarts of bit-sliced annealing (seed, r), as run_restarts returns them: a Tally
/// of every restart's best energy and the best restart's Solution (ties to the lowest r). The
/// words of 64 restarts are dealt to `threads` threads (0: one per hardware thread) in blocks of
/// up to four words (fewer when there are few words per thread), each block run in lockstep; `budget` applies to each
/// block. One word (64 restarts or fewer) on several threads: a checkerboard kernel shares each
/// half-sweep among them (BitSlicedThreadTeam). The answer is the same for any thread count. A
/// model bit_sliced_fits refuses returns its Status.
template <class Model>
Result<Tally<typename Model::energy_type>> anneal_bit_sliced(const Model& model, const BitSlicedParams& params,
                                                             std::uint64_t seed, std::uint64_t restarts,
                                                             unsigned threads = 1, const Budget& budget = Budget{}) {
  using energy_type = typename Model::energy_type;
  const Status fits = bit_sliced_fits(model);
  if (!fits.ok()) return fits;
  const std::uint64_t words = (restarts + 63) / 64;
  if (threads == 0) threads = std::thread::hardware_concurrency() == 0 ? 1 : std::thread::hardware_concurrency();
  // Blocks of four words, fewer when that leaves a thread without one; the rest of the words
  // as blocks of two and one.
  const std::uint64_t share = (words + threads - 1) / threads;
  const unsigned widest = share >= 4 ? 4 : share >= 2 ? 2 : 1;
  std::vector<std::uint64_t> block_first;
  std::vector<unsigned> block_words;
  for (std::uint64_t v = 0; v < words;) {
    const std::uint64_t left = words - v;
    const unsigned w = left >= widest ? widest : left >= 2 ? 2 : 1;
    block_first.push_back(v);
    block_words.push_back(w);
    v += w;
  }
  // One word and more threads: the word's half-sweeps are shared by all of them (checkerboard).
  if (words == 1 && threads > 1) {
    std::vector<Solution<energy_type>> one(static_cast<std::size_t>(restarts));
    detail::run_bit_sliced_block<1>(model, params, seed, 0, restarts, budget, one, threads - 1);
    Tally<energy_type> tally;
    for (auto& s : one) tally.add(std::move(s));
    return tally;
  }
  if (threads > block_first.size()) threads = static_cast<unsigned>(block_first.empty() ? 1 : block_first.size());
  std::vector<Solution<energy_type>> results(static_cast<std::size_t>(restarts));
  std::atomic<std::size_t> next{0};
  auto worker = [&]() {
    for (std::size_t b = next.fetch_add(1); b < block_first.size(); b = next.fetch_add(1)) {
      if (block_words[b] == 4) {
        detail::run_bit_sliced_block<4>(model, params, seed, block_first[b], restarts, budget, results);
      } else if (block_words[b] == 2) {
        detail::run_bit_sliced_block<2>(model, params, seed, block_first[b], restarts, budget, results);
      } else {
        detail::run_bit_sliced_block<1>(model, params, seed, block_first[b], restarts, budget, results);
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
  Tally<energy_type> tally;
  for (auto& s : results) tally.add(std::move(s));
  return tally;
}

}  // namespace spinwright

#endif  // SPINWRIGHT_PARALLEL_BIT_SLICED_RESTARTS_HPP
