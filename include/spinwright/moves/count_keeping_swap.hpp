// spinwright — CountKeepingSwap: flip one +1 spin and one -1 spin together, so the number of +1
// spins (a cardinality: QUBO bits set = n - that number) never changes. Start from a state
// with the wanted cardinality (a warm start); the move keeps it for the whole run.
// Two index lists (+1 sites, -1 sites) make every proposal valid in O(1).
#ifndef SPINWRIGHT_MOVES_EXCHANGE_HPP
#define SPINWRIGHT_MOVES_EXCHANGE_HPP

#include "../config.hpp"
#include "move.hpp"

#include "../detail/buffer.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::uint32_t

namespace spinwright {

template <class Model>
class CountKeepingSwap {
 public:
  using state_type = SpinState<Model>;
  using index_type = typename Model::index_type;
  using energy_type = typename Model::energy_type;
  struct proposal_type {
    index_type up;           // a site with spin +1
    index_type down;         // a site with spin -1
    std::uint32_t up_pos;    // its place in the +1 list
    std::uint32_t down_pos;  // its place in the -1 list
  };

  CountKeepingSwap() = default;

  /// Lists for n spins carved from an arena (no heap); check valid().
  CountKeepingSwap(std::size_t n, Arena& arena) : up_(n, arena), down_(n, arena), pos_(n, arena) {}
  static std::size_t bytes_needed(std::size_t n) noexcept {
    return 2 * arena_bytes<index_type>(n) + arena_bytes<std::uint32_t>(n);
  }
  bool valid() const noexcept { return up_.valid() && down_.valid() && pos_.valid(); }

  // Rebuilds the two lists from the state. Heap builds allocate on the first call for a given
  // size only; arena-built lists must already have the state's size (asserted).
  void prepare(const state_type& s) {
    const std::size_t n = s.size();
    if (up_.size() != n) {
#if !SPINWRIGHT_NO_HEAP
      up_ = detail::Buffer<index_type>(n);
      down_ = detail::Buffer<index_type>(n);
      pos_ = detail::Buffer<std::uint32_t>(n);
#else
      SPINWRIGHT_ASSERT(false, "CountKeepingSwap lists were made for another number of spins");
      return;
#endif
    }
    n_up_ = n_down_ = 0;
    for (std::size_t i = 0; i < n; ++i) {
      if (s.spin(static_cast<index_type>(i)) > 0) {
        pos_[i] = n_up_;
        up_[n_up_++] = static_cast<index_type>(i);
      } else {
        pos_[i] = n_down_;
        down_[n_down_++] = static_cast<index_type>(i);
      }
    }
  }

  std::size_t count_up() const noexcept { return n_up_; }

  // One attempt per spin, or none when every spin has the same sign.
  std::size_t moves_per_sweep(const state_type& s) const noexcept {
    return (n_up_ == 0 || n_down_ == 0) ? 0 : s.size();
  }

  proposal_type propose(const state_type&, Xoshiro256& rng) noexcept {
    const std::uint32_t a = rng.below(n_up_);
    const std::uint32_t b = rng.below(n_down_);
    return {up_[a], down_[b], a, b};
  }

  energy_type delta(const state_type& s, const proposal_type& p) const noexcept { return s.delta_swap(p.up, p.down); }

  void apply(state_type& s, const proposal_type& p, energy_type) noexcept {
    s.apply_swap(p.up, p.down);
    up_[p.up_pos] = p.down;
    down_[p.down_pos] = p.up;
    pos_[p.down] = p.up_pos;
    pos_[p.up] = p.down_pos;
  }

  // Descent: every (+1, -1) pair, k = a * count_down + b.
  std::size_t neighbourhood_size(const state_type&) const noexcept { return static_cast<std::size_t>(n_up_) * n_down_; }
  proposal_type proposal_at(const state_type&, std::size_t k) const noexcept {
    const auto a = static_cast<std::uint32_t>(k / n_down_);
    const auto b = static_cast<std::uint32_t>(k % n_down_);
    return {up_[a], down_[b], a, b};
  }

 private:
  detail::Buffer<index_type> up_;
  detail::Buffer<index_type> down_;
  detail::Buffer<std::uint32_t> pos_;
  std::uint32_t n_up_ = 0;
  std::uint32_t n_down_ = 0;
};

}  // namespace spinwright

#endif  // SPINWRIGHT_MOVES_EXCHANGE_HPP
