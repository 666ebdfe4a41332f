// spinwright — a tournament tree over N keys (the tabu walk's move selection): the root holds
// the leaf of least key, ties to the leftmost; one key change is O(log N). Internal to kernels/.
#ifndef SPINWRIGHT_KERNELS_DETAIL_MIN_TREE_HPP
#define SPINWRIGHT_KERNELS_DETAIL_MIN_TREE_HPP

#include "../../config.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::uint32_t
#include <limits>   // std::numeric_limits
#include <vector>   // std::vector

namespace spinwright {
namespace detail {

// Tournament tree over N keys: the root holds the index of the least key (lowest index on ties).
template <class Energy>
class MinTree {
 public:
  static constexpr Energy infinity() noexcept {
    if constexpr (std::numeric_limits<Energy>::has_infinity) {
      return std::numeric_limits<Energy>::infinity();
    } else {
      return std::numeric_limits<Energy>::max();
    }
  }

  MinTree() = default;
  explicit MinTree(std::size_t n) {
    leaves_ = 1;
    while (leaves_ < n) leaves_ *= 2;
    keys_.assign(leaves_, infinity());
    node_.assign(2 * leaves_, 0);
    rebuild();
  }

  std::size_t leaves() const noexcept { return leaves_; }
  std::uint32_t top() const noexcept { return node_[1]; }
  Energy top_key() const noexcept { return keys_[node_[1]]; }
  Energy key(std::size_t i) const noexcept { return keys_[i]; }

  // Sets a key without touching the tree (call rebuild() afterwards).
  void put(std::size_t i, Energy k) noexcept { keys_[i] = k; }

  void set(std::size_t i, Energy k) noexcept {
    keys_[i] = k;
    std::size_t p = (i + leaves_) / 2;
    while (p >= 1) {
      const std::uint32_t a = node_[2 * p];
      const std::uint32_t b = node_[2 * p + 1];
      node_[p] = keys_[b] < keys_[a] ? b : a;
      p /= 2;
    }
  }

  void rebuild() noexcept {
    for (std::size_t i = 0; i < leaves_; ++i) node_[leaves_ + i] = static_cast<std::uint32_t>(i);
    for (std::size_t p = leaves_ - 1; p >= 1; --p) {
      const std::uint32_t a = node_[2 * p];
      const std::uint32_t b = node_[2 * p + 1];
      node_[p] = keys_[b] < keys_[a] ? b : a;
    }
  }

 private:
  std::size_t leaves_ = 1;
  std::vector<Energy> keys_;
  std::vector<std::uint32_t> node_;
};

}  // namespace detail
}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_DETAIL_MIN_TREE_HPP
