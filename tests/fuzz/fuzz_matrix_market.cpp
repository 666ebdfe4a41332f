// libFuzzer target: the matrix_market reader's buffer entry point fed arbitrary bytes.
#include "fuzz/fuzz_entries.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::uint8_t

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  SPINWRIGHT_FUZZ_REQUIRE(fuzz_entries::matrix_market_entry(data, size));
  return 0;
}
