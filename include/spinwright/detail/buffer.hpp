// spinwright — Arena (caller-supplied memory for builds without a heap) and detail::Buffer,
// the fixed-size array every state and kernel workspace is made of.
//
// A Buffer either owns heap memory (new[]; not available when SPINWRIGHT_NO_HEAP is 1, so a
// firmware build never references operator new or delete) or borrows a slice of an Arena.
// Its size is fixed when it is made; nothing ever grows.
#ifndef SPINWRIGHT_DETAIL_BUFFER_HPP
#define SPINWRIGHT_DETAIL_BUFFER_HPP

#include "../config.hpp"

#include <cstddef>      // std::size_t, std::max_align_t
#include <cstdint>      // std::uintptr_t
#include <type_traits>  // std::is_trivially_copyable_v
#include <utility>      // std::exchange

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

namespace detail {

template <class T>
class Buffer {
  static_assert(std::is_trivially_copyable_v<T>, "buffers hold plain numbers");

 public:
  Buffer() = default;

#if !SPINWRIGHT_NO_HEAP
  explicit Buffer(std::size_t n, T init = T{}) : data_(n ? new T[n] : nullptr), size_(n), owned_(true) { fill(init); }
#endif

  // A slice of an arena; valid() is false when the arena had no room.
  Buffer(std::size_t n, Arena& arena, T init = T{}) noexcept : data_(n ? arena.allocate<T>(n) : nullptr), size_(n) {
    fill(init);
  }

  Buffer(Buffer&& other) noexcept
      : data_(std::exchange(other.data_, nullptr)),
        size_(std::exchange(other.size_, 0)),
        owned_(std::exchange(other.owned_, false)) {}
  Buffer& operator=(Buffer&& other) noexcept {
    if (this != &other) {
      release();
      data_ = std::exchange(other.data_, nullptr);
      size_ = std::exchange(other.size_, 0);
      owned_ = std::exchange(other.owned_, false);
    }
    return *this;
  }

#if !SPINWRIGHT_NO_HEAP
  // A copy always owns heap memory, whatever the source's storage.
  Buffer(const Buffer& other) : data_(other.size_ ? new T[other.size_] : nullptr), size_(other.size_), owned_(true) {
    for (std::size_t k = 0; k < size_; ++k) data_[k] = other.data_[k];
  }
  Buffer& operator=(const Buffer& other) {
    if (this != &other) {
      Buffer copy(other);
      *this = std::move(copy);
    }
    return *this;
  }
#else
  Buffer(const Buffer&) = delete;
  Buffer& operator=(const Buffer&) = delete;
#endif

  ~Buffer() { release(); }

  bool valid() const noexcept { return size_ == 0 || data_ != nullptr; }
  std::size_t size() const noexcept { return size_; }
  bool empty() const noexcept { return size_ == 0; }
  T* data() noexcept { return data_; }
  const T* data() const noexcept { return data_; }
  T& operator[](std::size_t k) noexcept { return data_[k]; }
  const T& operator[](std::size_t k) const noexcept { return data_[k]; }
  T* begin() noexcept { return data_; }
  T* end() noexcept { return data_ + (data_ ? size_ : 0); }
  const T* begin() const noexcept { return data_; }
  const T* end() const noexcept { return data_ + (data_ ? size_ : 0); }

  void fill(T value) noexcept {
    if (data_ == nullptr) return;
    for (std::size_t k = 0; k < size_; ++k) data_[k] = value;
  }

 private:
  void release() noexcept {
#if !SPINWRIGHT_NO_HEAP
    if (owned_) delete[] data_;
#endif
    data_ = nullptr;
    size_ = 0;
    owned_ = false;
  }

  T* data_ = nullptr;
  std::size_t size_ = 0;
  bool owned_ = false;
};

}  // namespace detail
}  // namespace spinwright

#endif  // SPINWRIGHT_DETAIL_BUFFER_HPP
