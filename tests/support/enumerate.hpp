// Test helper: visit every spin assignment of n spins (n <= 24), in binary order.
#ifndef SPINWRIGHT_TEST_SUPPORT_ENUMERATE_HPP
#define SPINWRIGHT_TEST_SUPPORT_ENUMERATE_HPP

#include <cstdint>
#include <vector>

namespace test_support {

template <class Fn>
void for_each_assignment(std::uint32_t n, Fn&& fn) {
  std::vector<std::int8_t> s(n);
  for (std::uint64_t code = 0; code < (std::uint64_t{1} << n); ++code) {
    for (std::uint32_t k = 0; k < n; ++k) s[k] = ((code >> k) & 1) ? -1 : 1;
    fn(static_cast<const std::int8_t*>(s.data()));
  }
}

}  // namespace test_support

#endif
