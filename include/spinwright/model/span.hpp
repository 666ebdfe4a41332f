// spinwright — Span: a small read-only view of contiguous values (C++17 has no std::span).
#ifndef SPINWRIGHT_MODEL_SPAN_HPP
#define SPINWRIGHT_MODEL_SPAN_HPP

#include "../config.hpp"

#include <cstddef>  // std::size_t

namespace spinwright {

template <class T>
struct Span {
  const T* ptr = nullptr;
  std::size_t len = 0;
  constexpr const T* begin() const noexcept { return ptr; }
  constexpr const T* end() const noexcept { return ptr + len; }
  constexpr std::size_t size() const noexcept { return len; }
  constexpr bool empty() const noexcept { return len == 0; }
  constexpr const T& operator[](std::size_t k) const noexcept { return ptr[k]; }
  constexpr const T* data() const noexcept { return ptr; }
};

}  // namespace spinwright

#endif  // SPINWRIGHT_MODEL_SPAN_HPP
