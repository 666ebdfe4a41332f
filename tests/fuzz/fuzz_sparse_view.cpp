// libFuzzer target: SparseModelView::over() fed arbitrary caller arrays (rows, neighbours, values).
#include "fuzz/fuzz_entries.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::uint8_t
#include <cstdio>   // std::fprintf
#include <cstdlib>  // std::abort

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  if (const char* failure = fuzz_entries::view_entry(data, size)) {
    std::fprintf(stderr, "invariant broken: %s\n", failure);
    std::abort();
  }
  return 0;
}
