// spinwright — SingleFlip: the built-in move that flips one spin, visiting sites in order or
// drawing them at random. The default move of annealing and descent.
#ifndef SPINWRIGHT_MOVES_SINGLE_FLIP_HPP
#define SPINWRIGHT_MOVES_SINGLE_FLIP_HPP

#include "../config.hpp"
#include "move.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::uint8_t, std::uint32_t

namespace spinwright {

enum class SiteOrder : std::uint8_t {
  sequential,  // sites 0, 1, ..., n-1 in every sweep
  random,      // n sites drawn uniformly with replacement per sweep
};

template <class Model>
class SingleFlip {
 public:
  using state_type = SpinState<Model>;
  using index_type = typename Model::index_type;
  using energy_type = typename Model::energy_type;
  using proposal_type = index_type;  // the spin to flip

  constexpr SingleFlip() noexcept = default;
  constexpr explicit SingleFlip(SiteOrder order) noexcept : order_(order) {}

  SiteOrder order() const noexcept { return order_; }

  void prepare(const state_type& s) noexcept {
    n_ = static_cast<std::uint32_t>(s.size());
    cursor_ = 0;
  }
  void begin_sweep(const state_type&, Xoshiro256&) noexcept { cursor_ = 0; }
  std::size_t moves_per_sweep(const state_type& s) const noexcept { return s.size(); }

  proposal_type propose(const state_type&, Xoshiro256& rng) noexcept {
    if (order_ == SiteOrder::random) return static_cast<index_type>(rng.below(n_));
    const std::uint32_t i = cursor_;
    cursor_ = (i + 1 == n_) ? 0 : i + 1;
    return static_cast<index_type>(i);
  }

  energy_type delta(const state_type& s, const proposal_type& i) const noexcept { return s.delta(i); }
  void apply(state_type& s, const proposal_type& i, energy_type d) const noexcept { s.flip_with_delta(i, d); }

  std::size_t neighbourhood_size(const state_type& s) const noexcept { return s.size(); }
  proposal_type proposal_at(const state_type&, std::size_t k) const noexcept { return static_cast<index_type>(k); }

 private:
  SiteOrder order_ = SiteOrder::random;
  std::uint32_t n_ = 0;
  std::uint32_t cursor_ = 0;
};

}  // namespace spinwright

#endif  // SPINWRIGHT_MOVES_SINGLE_FLIP_HPP
