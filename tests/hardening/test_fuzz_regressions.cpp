// Replays the fuzz seed corpora and every saved regression input (tests/fuzz/corpus/<target>/,
// tests/fuzz/regressions/<target>/) through the same entry points the libFuzzer targets use
// (tests/fuzz/fuzz_entries.hpp), so that the ordinary suite (and the `sanitize` preset) keeps
// checking every input that once broke an invariant.
#include <doctest/doctest.h>

#include "fuzz/fuzz_entries.hpp"

#include <algorithm>   // std::sort
#include <cstddef>     // std::size_t
#include <cstdint>     // std::uint8_t
#include <filesystem>  // std::filesystem::directory_iterator
#include <fstream>     // std::ifstream
#include <iterator>    // std::istreambuf_iterator
#include <string>      // std::string
#include <vector>      // std::vector

namespace {

using Entry = fuzz_entries::Failure (*)(const std::uint8_t*, std::size_t);

std::vector<std::filesystem::path> inputs_of(const std::string& target) {
  std::vector<std::filesystem::path> files;
  for (const char* kind : {"corpus", "regressions"}) {
    const std::filesystem::path dir = std::filesystem::path(SPINWRIGHT_TEST_DIR) / "fuzz" / kind / target;
    std::error_code ec;
    if (!std::filesystem::is_directory(dir, ec)) continue;
    for (const auto& e : std::filesystem::directory_iterator(dir)) {
      if (e.is_regular_file()) files.push_back(e.path());
    }
  }
  std::sort(files.begin(), files.end());
  return files;
}

std::size_t replay(const std::string& target, Entry entry) {
  const auto files = inputs_of(target);
  for (const auto& path : files) {
    std::ifstream in(path, std::ios::binary);
    REQUIRE(in);
    const std::vector<char> bytes((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
    const char* failure = entry(reinterpret_cast<const std::uint8_t*>(bytes.data()), bytes.size());
    INFO("input: " << path.string());
    CHECK_MESSAGE(failure == nullptr, (failure ? failure : ""));
  }
  return files.size();
}

}  // namespace

TEST_CASE("builder fuzz inputs: corpus and regressions keep every invariant") {
  CHECK(replay("builder", fuzz_entries::builder_entry) >= 2);
}

TEST_CASE("edge-list fuzz inputs: corpus and regressions keep every invariant") {
  CHECK(replay("edge_list", fuzz_entries::edge_list_entry) >= 1);
}

TEST_CASE("Matrix Market fuzz inputs: corpus and regressions keep every invariant") {
  CHECK(replay("matrix_market", fuzz_entries::matrix_market_entry) >= 1);
}

TEST_CASE("state-file fuzz inputs: corpus and regressions keep every invariant") {
  CHECK(replay("state_file", fuzz_entries::state_entry) >= 1);
}

TEST_CASE("SparseModelView fuzz inputs: corpus and regressions keep every invariant") {
  CHECK(replay("sparse_view", fuzz_entries::view_entry) >= 1);
}
