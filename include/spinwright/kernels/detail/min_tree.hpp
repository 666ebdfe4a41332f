// spinwright — a tournament tree over N keys (the tabu walk's move selection): the root holds
// the leaf of least key, ties to the leftmost; one key change is O(log N). Internal to kernels/.
#ifndef SPINWRIGHT_KERNELS_DETAIL_MIN_TREE_HPP
#define SPINWRIGHT_KERNELS_DETAIL_MIN_TREE_HPP

#include "../../arena.hpp"
#include "../../config.hpp"
#include "../../detail/buffer.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::uint32_t
#include <limits>   // std::numeric_limits

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
#if !SPINWRIGHT_NO_HEAP
  explicit MinTree(std::size_t n) : leaves_(leaves_for(n)), keys_(leaves_, infinity()), node_(2 * leaves_, 0) {
    rebuild();
  }
#endif
  /// The same in a slice of an arena; check valid().
  MinTree(std::size_t n, Arena& arena)
      : leaves_(leaves_for(n)), keys_(leaves_, arena, infinity()), node_(2 * leaves_, arena, 0) {
    if (valid()) rebuild();
  }

  static constexpr std::size_t leaves_for(std::size_t n) noexcept {
    std::size_t l = 1;
    while (l < n) l *= 2;
    return l;
  }
  static constexpr std::size_t bytes_needed(std::size_t n) noexcept {
    return arena_bytes<Energy>(leaves_for(n)) + arena_bytes<std::uint32_t>(2 * leaves_for(n));
  }
  bool valid() const noexcept { return keys_.valid() && node_.valid(); }

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
  Buffer<Energy> keys_;
  Buffer<std::uint32_t> node_;
};

}  // namespace detail
}  // namespace spinwright

#endif  // SPINWRIGHT_KERNELS_DETAIL_MIN_TREE_HPP
