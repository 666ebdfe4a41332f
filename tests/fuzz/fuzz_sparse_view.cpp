// libFuzzer target: SparseModelView::over() fed arbitrary caller arrays (rows, neighbours, values).
#include "fuzz/fuzz_entries.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::uint8_t

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  SPINWRIGHT_FUZZ_REQUIRE(fuzz_entries::view_entry(data, size));
  return 0;
}
