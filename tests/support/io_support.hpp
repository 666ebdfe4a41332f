// Test helpers for the io tests: a temporary directory removed on exit, random models built
// through the builders, and a check that an IoStatus carries the expected code and line.
#ifndef SPINWRIGHT_TEST_SUPPORT_IO_SUPPORT_HPP
#define SPINWRIGHT_TEST_SUPPORT_IO_SUPPORT_HPP

#include <doctest/doctest.h>
#include <spinwright/io.hpp>
#include <spinwright/model.hpp>
#include <spinwright/rng/xoshiro.hpp>

#include <atomic>
#include <cstdint>
#include <filesystem>
#include <fstream>
#include <string>
#include <type_traits>
#include <unistd.h>
#include <vector>

namespace test_support {

// A fresh directory under the system temporary directory, removed with its files on scope exit.
class IoTempDir {
 public:
  IoTempDir() {
    static std::atomic<unsigned> counter{0};
    const auto base = std::filesystem::temp_directory_path();
    for (unsigned attempt = 0;; ++attempt) {
      path_ = base / ("spinwright_io_" + std::to_string(::getpid()) + "_" + std::to_string(counter++) + "_" +
                      std::to_string(attempt));
      std::error_code ec;
      if (std::filesystem::create_directory(path_, ec)) break;
      REQUIRE(attempt < 100);
    }
  }
  ~IoTempDir() {
    std::error_code ec;
    std::filesystem::remove_all(path_, ec);
  }
  IoTempDir(const IoTempDir&) = delete;
  IoTempDir& operator=(const IoTempDir&) = delete;

  std::string file(const std::string& name) const { return (path_ / name).string(); }
  // Writes `text` byte for byte and returns the path.
  std::string write(const std::string& name, const std::string& text) const {
    const std::string p = file(name);
    std::ofstream out(p, std::ios::binary);
    out << text;
    REQUIRE(out.good());
    return p;
  }
  const std::filesystem::path& path() const { return path_; }

 private:
  std::filesystem::path path_;
};

// A random value: integers in [-range, range], reals with 1..17 significant digits and a wide
// spread of exponents, so that exact printing is exercised.
template <class Value>
Value random_value(spinwright::Xoshiro256& rng, std::int64_t range) {
  if constexpr (std::is_integral_v<Value>) {
    return static_cast<Value>(static_cast<std::int64_t>(rng.below(static_cast<std::uint32_t>(2 * range + 1))) - range);
  } else {
    const double mant = rng.uniform() * 2.0 - 1.0;  // 53 random bits
    const int shift = static_cast<int>(rng.below(41)) - 20;
    double v = mant * static_cast<double>(range);
    for (int k = 0; k < shift; ++k) v *= 2;
    for (int k = 0; k > shift; --k) v /= 2;
    return static_cast<Value>(v);
  }
}

// A random sparse model with n spins, about `pairs` pairs, optional site terms and offset.
template <spinwright::Form F, class Value, class Index = std::uint32_t>
spinwright::SparseModel<F, Value, Index> random_model(std::uint64_t seed, std::uint32_t n, std::uint32_t pairs,
                                                      bool linear, bool offset, std::int64_t range = 1000) {
  spinwright::Xoshiro256 rng(seed);
  using Builder = std::conditional_t<F == spinwright::Form::ising, spinwright::IsingBuilder<Value, Index>,
                                     spinwright::QuboBuilder<Value, Index>>;
  Builder b(n);
  for (std::uint32_t k = 0; k < pairs; ++k) {
    const std::uint32_t i = rng.below(n);
    const std::uint32_t j = rng.below(n);
    if (i == j) continue;
    if constexpr (F == spinwright::Form::ising) {
      b.add_coupling(i, j, random_value<Value>(rng, range));
    } else {
      b.add_pair(i, j, random_value<Value>(rng, range));
    }
  }
  if (linear) {
    for (std::uint32_t i = 0; i < n; ++i) {
      if (rng.coin()) continue;
      if constexpr (F == spinwright::Form::ising) {
        b.add_field(i, random_value<Value>(rng, range));
      } else {
        b.add_unary(i, random_value<Value>(rng, range));
      }
    }
  }
  if (offset) b.add_offset(static_cast<spinwright::energy_t<Value>>(random_value<Value>(rng, range)));
  auto built = b.build();
  REQUIRE(built.ok());
  return std::move(built).value();
}

template <class Model>
std::vector<std::int8_t> random_spins(spinwright::Xoshiro256& rng, const Model& m) {
  std::vector<std::int8_t> s(m.num_spins());
  for (auto& x : s) x = rng.coin() ? std::int8_t{1} : std::int8_t{-1};
  return s;
}

// Same structure and identical coefficients (exact comparison).
template <class A, class B>
void check_same_model(const A& a, const B& b) {
  REQUIRE(a.num_spins() == b.num_spins());
  REQUIRE(a.num_pairs() == b.num_pairs());
  CHECK(a.offset() == b.offset());
  CHECK(a.site_term_array() == b.site_term_array());
  CHECK(a.row_starts() == b.row_starts());
  CHECK(a.neighbour_array() == b.neighbour_array());
  CHECK(a.value_array() == b.value_array());
}

// The status has the code, the file name and the line, and its message is "file:line: reason".
inline void check_error(const spinwright::io::IoStatus& st, spinwright::StatusCode code, const std::string& file,
                        std::uint64_t line) {
  INFO("message: " << st.message);
  CHECK_FALSE(st.ok());
  CHECK(st.code == code);
  CHECK(st.file == file);
  CHECK(st.line == line);
  const std::string prefix = file + ":" + std::to_string(line) + ": ";
  CHECK(st.message.rfind(prefix, 0) == 0);
  CHECK(st.message == prefix + st.reason);
  CHECK_FALSE(st.reason.empty());
}

}  // namespace test_support

#endif  // SPINWRIGHT_TEST_SUPPORT_IO_SUPPORT_HPP
