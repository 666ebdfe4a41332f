// Test helper (annealing area): replaces the global operator new / delete to count
// allocations. Include it in exactly one translation unit of a test executable of its own
// (the replacement is global). Counting is on only between start() and stop().
#ifndef SPINWRIGHT_TEST_SUPPORT_ALLOC_COUNTER_HPP
#define SPINWRIGHT_TEST_SUPPORT_ALLOC_COUNTER_HPP

#include <atomic>   // std::atomic
#include <cstddef>  // std::size_t
#include <cstdlib>  // std::malloc, std::free, std::abort
#include <new>      // std::bad_alloc, std::align_val_t

namespace alloc_counter {
inline std::atomic<std::size_t> count{0};
inline std::atomic<bool> counting{false};
inline void start() {
  count.store(0);
  counting.store(true);
}
inline std::size_t stop() {
  counting.store(false);
  return count.load();
}
inline void* allocate(std::size_t n) {
  if (counting.load(std::memory_order_relaxed)) count.fetch_add(1, std::memory_order_relaxed);
  if (void* p = std::malloc(n != 0 ? n : 1)) return p;
  std::abort();
}
}  // namespace alloc_counter

void* operator new(std::size_t n) { return alloc_counter::allocate(n); }
void* operator new[](std::size_t n) { return alloc_counter::allocate(n); }
void operator delete(void* p) noexcept { std::free(p); }
void operator delete[](void* p) noexcept { std::free(p); }
void operator delete(void* p, std::size_t) noexcept { std::free(p); }
void operator delete[](void* p, std::size_t) noexcept { std::free(p); }

#endif  // SPINWRIGHT_TEST_SUPPORT_ALLOC_COUNTER_HPP
