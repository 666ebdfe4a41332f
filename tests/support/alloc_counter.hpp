// Test helper (annealing area): replaces the global operator new / delete to count
// allocations. Include it in exactly one translation unit of a test executable of its own
// (the replacement is global). Counting is on only between start() and stop().
#ifndef SPINWRIGHT_TEST_SUPPORT_ALLOC_COUNTER_HPP
#define SPINWRIGHT_TEST_SUPPORT_ALLOC_COUNTER_HPP

#include <atomic>   // std::atomic
#include <cstddef>  // std::size_t
#include <cstdlib>  // std::malloc, std::free, std::abort
#include <new>      // std::bad_alloc, std::align_val_t, std::nothrow_t

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
inline void* allocate_nothrow(std::size_t n) noexcept {
  if (counting.load(std::memory_order_relaxed)) count.fetch_add(1, std::memory_order_relaxed);
  return std::malloc(n != 0 ? n : 1);
}
// Out of line, so that GCC does not see operator new's malloc meet operator delete's free at an
// inlined call site (a false -Wmismatched-new-delete at -O1).
[[gnu::noinline]] inline void release(void* p) noexcept { std::free(p); }
}  // namespace alloc_counter

void* operator new(std::size_t n) { return alloc_counter::allocate(n); }
void* operator new[](std::size_t n) { return alloc_counter::allocate(n); }
void operator delete(void* p) noexcept { alloc_counter::release(p); }
void operator delete[](void* p) noexcept { alloc_counter::release(p); }
void operator delete(void* p, std::size_t) noexcept { alloc_counter::release(p); }
void operator delete[](void* p, std::size_t) noexcept { alloc_counter::release(p); }
// The nothrow forms too (std::stable_sort's temporary buffer uses them): otherwise they come from
// the runtime's allocator and are freed by the replaced delete above, which AddressSanitizer
// reports as an alloc-dealloc mismatch.
void* operator new(std::size_t n, const std::nothrow_t&) noexcept { return alloc_counter::allocate_nothrow(n); }
void* operator new[](std::size_t n, const std::nothrow_t&) noexcept { return alloc_counter::allocate_nothrow(n); }
void operator delete(void* p, const std::nothrow_t&) noexcept { std::free(p); }
void operator delete[](void* p, const std::nothrow_t&) noexcept { std::free(p); }

#endif  // SPINWRIGHT_TEST_SUPPORT_ALLOC_COUNTER_HPP
