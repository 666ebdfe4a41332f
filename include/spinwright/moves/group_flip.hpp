// spinwright — GroupFlip: flip every spin of one of a fixed list of groups at once (cluster
// or domain moves chosen by the user: a row of a lattice, the bits of one one-hot block...).
// The groups are copied at construction; each proposal draws one group uniformly.
#ifndef SPINWRIGHT_MOVES_GROUP_FLIP_HPP
#define SPINWRIGHT_MOVES_GROUP_FLIP_HPP

#include "../config.hpp"
#include "move.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::uint32_t
#include <vector>   // std::vector (copied at construction)

namespace spinwright {

template <class Model>
class GroupFlip {
 public:
  using state_type = SpinState<Model>;
  using index_type = typename Model::index_type;
  using energy_type = typename Model::energy_type;
  using proposal_type = std::uint32_t;  // the group number

  GroupFlip() = default;

  // `groups` is any range of ranges of spin indices; indices inside a group must be distinct.
  template <class Groups>
  explicit GroupFlip(const Groups& groups) {
    start_.push_back(0);
    for (const auto& g : groups) {
      for (const auto i : g) members_.push_back(static_cast<index_type>(i));
      start_.push_back(members_.size());
    }
  }

  std::size_t num_groups() const noexcept { return start_.empty() ? 0 : start_.size() - 1; }

  // One attempt per group.
  std::size_t moves_per_sweep(const state_type&) const noexcept { return num_groups(); }

  proposal_type propose(const state_type&, Xoshiro256& rng) noexcept {
    return rng.below(static_cast<std::uint32_t>(num_groups()));
  }

  energy_type delta(const state_type& s, const proposal_type& g) const noexcept {
    return s.delta_group(members_.data() + start_[g], start_[g + 1] - start_[g]);
  }

  void apply(state_type& s, const proposal_type& g, energy_type) const noexcept {
    s.flip_group(members_.data() + start_[g], start_[g + 1] - start_[g]);
  }

  std::size_t neighbourhood_size(const state_type&) const noexcept { return num_groups(); }
  proposal_type proposal_at(const state_type&, std::size_t k) const noexcept { return static_cast<proposal_type>(k); }

 private:
  std::vector<std::size_t> start_;
  std::vector<index_type> members_;
};

}  // namespace spinwright

#endif  // SPINWRIGHT_MOVES_GROUP_FLIP_HPP
