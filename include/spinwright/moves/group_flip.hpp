// spinwright — GroupFlip: flip every spin of one of a fixed list of groups at once (cluster
// or domain moves chosen by the user: a row of a lattice, the bits of one one-hot block...).
// The groups are copied at construction (heap), or read in place from caller arrays (no
// heap); each proposal draws one group uniformly.
#ifndef SPINWRIGHT_MOVES_GROUP_FLIP_HPP
#define SPINWRIGHT_MOVES_GROUP_FLIP_HPP

#include "../config.hpp"
#include "move.hpp"

#include "../detail/buffer.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::uint32_t

namespace spinwright {

template <class Model>
class GroupFlip {
 public:
  using state_type = SpinState<Model>;
  using index_type = typename Model::index_type;
  using energy_type = typename Model::energy_type;
  using proposal_type = std::uint32_t;  // the group number

  GroupFlip() = default;

#if !SPINWRIGHT_NO_HEAP
  // `groups` is any range of ranges of spin indices; indices inside a group must be distinct.
  template <class Groups>
  explicit GroupFlip(const Groups& groups) {
    std::size_t count = 0, members = 0;
    for (const auto& g : groups) {
      ++count;
      for (const auto i : g) {
        static_cast<void>(i);
        ++members;
      }
    }
    own_start_ = detail::Buffer<std::size_t>(count + 1);
    own_members_ = detail::Buffer<index_type>(members);
    std::size_t k = 0, m = 0;
    own_start_[0] = 0;
    for (const auto& g : groups) {
      for (const auto i : g) own_members_[m++] = static_cast<index_type>(i);
      own_start_[++k] = m;
    }
    groups_ = count;
  }
#endif

  // Groups read in place (no copy, no heap): group g is members[start[g] .. start[g + 1]);
  // `start` has num_groups + 1 entries. Both arrays must outlive the move.
  GroupFlip(const std::size_t* start, const index_type* members, std::size_t num_groups) noexcept
      : start_(start), members_(members), groups_(num_groups) {}

  std::size_t num_groups() const noexcept { return groups_; }

  // One attempt per group.
  std::size_t moves_per_sweep(const state_type&) const noexcept { return num_groups(); }

  proposal_type propose(const state_type&, Xoshiro256& rng) noexcept {
    return rng.below(static_cast<std::uint32_t>(num_groups()));
  }

  energy_type delta(const state_type& s, const proposal_type& g) const noexcept {
    const std::size_t* st = starts();
    return s.delta_group(members() + st[g], st[g + 1] - st[g]);
  }

  void apply(state_type& s, const proposal_type& g, energy_type) const noexcept {
    const std::size_t* st = starts();
    s.flip_group(members() + st[g], st[g + 1] - st[g]);
  }

  std::size_t neighbourhood_size(const state_type&) const noexcept { return num_groups(); }
  proposal_type proposal_at(const state_type&, std::size_t k) const noexcept { return static_cast<proposal_type>(k); }

 private:
  const std::size_t* starts() const noexcept { return start_ != nullptr ? start_ : own_start_.data(); }
  const index_type* members() const noexcept { return start_ != nullptr ? members_ : own_members_.data(); }

  const std::size_t* start_ = nullptr;  // caller arrays (view mode)
  const index_type* members_ = nullptr;
  std::size_t groups_ = 0;
  detail::Buffer<std::size_t> own_start_;  // copied groups (heap mode)
  detail::Buffer<index_type> own_members_;
};

}  // namespace spinwright

#endif  // SPINWRIGHT_MOVES_GROUP_FLIP_HPP
