// spinwright — detail::Buffer, the fixed-size array every state and kernel workspace is made
// of (heap-owning, or a slice of an Arena: arena.hpp).
//
// A Buffer either owns heap memory (new[]; not available when SPINWRIGHT_NO_HEAP is 1, so a
// firmware build never references operator new or delete) or borrows a slice of an Arena.
// Its size is fixed when it is made; nothing ever grows.
#ifndef SPINWRIGHT_DETAIL_BUFFER_HPP
#define SPINWRIGHT_DETAIL_BUFFER_HPP

#include "../arena.hpp"
#include "../config.hpp"

#include <cstddef>      // std::size_t
#include <type_traits>  // std::is_trivially_copyable_v
#include <utility>      // std::exchange

namespace spinwright {
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
