// spinwright — Arena: memory the caller owns (a static array in firmware) from which states and
// kernel workspaces are carved in builds without a heap; StaticArena brings its own storage.
// Every kernel's arena constructor and bytes_needed() use it (docs/embedding.md).
#ifndef SPINWRIGHT_ARENA_HPP
#define SPINWRIGHT_ARENA_HPP

#include "config.hpp"

#include <cstddef>  // std::size_t, std::max_align_t
#include <cstdint>  // std::uintptr_t

namespace spinwright {

// A bump allocator over memory the caller owns (a static array in firmware). Allocations are
// never freed one by one; reset() forgets them all. Not thread-safe: one arena per thread.
class Arena {
 public:
  Arena(void* memory, std::size_t bytes) noexcept : base_(static_cast<unsigned char*>(memory)), capacity_(bytes) {}
  Arena(const Arena&) = delete;
  Arena& operator=(const Arena&) = delete;

  // n objects of T, aligned for T, or nullptr (and failed() becomes true) when it does not fit.
  template <class T>
  T* allocate(std::size_t n) noexcept {
    const std::uintptr_t start = reinterpret_cast<std::uintptr_t>(base_) + used_;
    const std::size_t pad = (alignof(T) - start % alignof(T)) % alignof(T);
    if (n > (capacity_ - used_) / sizeof(T) || pad > capacity_ - used_ - n * sizeof(T)) {
      failed_ = true;
      return nullptr;
    }
    T* p = reinterpret_cast<T*>(base_ + used_ + pad);
    used_ += pad + n * sizeof(T);
    return p;
  }

  std::size_t used() const noexcept { return used_; }
  std::size_t capacity() const noexcept { return capacity_; }
  bool failed() const noexcept { return failed_; }
  void reset() noexcept {
    used_ = 0;
    failed_ = false;
  }

 private:
  unsigned char* base_;
  std::size_t capacity_;
  std::size_t used_ = 0;
  bool failed_ = false;
};

// An Arena with its own storage of a size fixed at compile time (static or stack storage).
template <std::size_t Bytes>
class StaticArena : public Arena {
 public:
  StaticArena() noexcept : Arena(storage_, Bytes) {}

 private:
  alignas(std::max_align_t) unsigned char storage_[Bytes];
};

// Bytes an arena needs for n objects of T, with the worst-case alignment padding.
template <class T>
constexpr std::size_t arena_bytes(std::size_t n) noexcept {
  return n * sizeof(T) + alignof(T);
}

}  // namespace spinwright

#endif  // SPINWRIGHT_ARENA_HPP
