// libFuzzer target: IsingBuilder / QuboBuilder fed arbitrary term streams, then edits and
// flips on the built model (see builder_entry in fuzz_entries.hpp for the invariants).
#include "fuzz/fuzz_entries.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::uint8_t

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  SPINWRIGHT_FUZZ_REQUIRE(fuzz_entries::builder_entry(data, size));
  return 0;
}
