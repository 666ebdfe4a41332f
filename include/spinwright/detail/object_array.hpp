// spinwright — detail::ObjectArray: a fixed number of objects that are not plain numbers (states,
// acceptors), made once in heap storage or in a slice of an Arena, destroyed with the array.
#ifndef SPINWRIGHT_DETAIL_OBJECT_ARRAY_HPP
#define SPINWRIGHT_DETAIL_OBJECT_ARRAY_HPP

#include "../arena.hpp"
#include "../config.hpp"

#include <cstddef>  // std::size_t
#include <new>      // placement new
#include <utility>  // std::exchange

#if !SPINWRIGHT_NO_HEAP
#include <memory>  // std::allocator
#endif

namespace spinwright {
namespace detail {

template <class T>
class ObjectArray {
 public:
  ObjectArray() = default;

#if !SPINWRIGHT_NO_HEAP
  /// n objects, object k made by make(k), in heap storage.
  template <class Make>
  ObjectArray(std::size_t n, Make&& make) : data_(n ? std::allocator<T>().allocate(n) : nullptr), owned_(true) {
    construct(n, make);
  }
#endif

  /// The same in a slice of an arena; valid() is false when the arena had no room (then no
  /// object is made).
  template <class Make>
  ObjectArray(std::size_t n, Arena& arena, Make&& make) : data_(n ? arena.allocate<T>(n) : nullptr) {
    if (data_ != nullptr || n == 0) construct(n, make);
    want_ = n;
  }

  /// Arena bytes for n objects (the objects' own arena storage not included).
  static constexpr std::size_t bytes_needed(std::size_t n) noexcept { return arena_bytes<T>(n); }

  ObjectArray(ObjectArray&& o) noexcept
      : data_(std::exchange(o.data_, nullptr)),
        size_(std::exchange(o.size_, 0)),
        want_(std::exchange(o.want_, 0)),
        owned_(std::exchange(o.owned_, false)) {}
  ObjectArray& operator=(ObjectArray&& o) noexcept {
    if (this != &o) {
      release();
      data_ = std::exchange(o.data_, nullptr);
      size_ = std::exchange(o.size_, 0);
      want_ = std::exchange(o.want_, 0);
      owned_ = std::exchange(o.owned_, false);
    }
    return *this;
  }
  ObjectArray(const ObjectArray&) = delete;
  ObjectArray& operator=(const ObjectArray&) = delete;
  ~ObjectArray() { release(); }

  bool valid() const noexcept { return size_ == want_; }
  std::size_t size() const noexcept { return size_; }
  T& operator[](std::size_t k) noexcept { return data_[k]; }
  const T& operator[](std::size_t k) const noexcept { return data_[k]; }
  T* begin() noexcept { return data_; }
  T* end() noexcept { return data_ + size_; }
  const T* begin() const noexcept { return data_; }
  const T* end() const noexcept { return data_ + size_; }

 private:
  template <class Make>
  void construct(std::size_t n, Make& make) {
    for (; size_ < n; ++size_) ::new (static_cast<void*>(data_ + size_)) T(make(size_));
    want_ = n;
  }

  void release() noexcept {
    for (std::size_t k = size_; k > 0; --k) data_[k - 1].~T();
#if !SPINWRIGHT_NO_HEAP
    if (owned_ && data_ != nullptr) std::allocator<T>().deallocate(data_, want_);
#endif
    data_ = nullptr;
    size_ = want_ = 0;
    owned_ = false;
  }

  T* data_ = nullptr;
  std::size_t size_ = 0;
  std::size_t want_ = 0;  // objects asked for
  bool owned_ = false;
};

}  // namespace detail
}  // namespace spinwright

#endif  // SPINWRIGHT_DETAIL_OBJECT_ARRAY_HPP
