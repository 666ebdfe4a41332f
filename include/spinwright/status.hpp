// spinwright — status codes and Result<T>: how bad input is reported without exceptions.
#ifndef SPINWRIGHT_STATUS_HPP
#define SPINWRIGHT_STATUS_HPP

#include "config.hpp"

#include <cstdint>  // std::uint8_t, std::uint64_t
#include <utility>  // std::move

namespace spinwright {

enum class StatusCode : std::uint8_t {
  ok,
  index_out_of_range,  // a spin index beyond the model or beyond the index type
  non_finite_value,    // NaN or infinity offered as a coefficient
  value_out_of_range,  // a coefficient that does not fit the value type (after merging)
  energy_overflow,     // an integer model whose energy range could overflow the accumulator
  missing_term,        // an in-place edit of a coupling the model does not have
  size_limit,          // a size beyond a documented limit (exact enumeration, dense models)
  parse_error,         // malformed input text
  io_error,            // a file that cannot be opened, read or written
  invalid_argument,    // a parameter outside its documented range
  unsupported,         // a valid but unsupported variant (e.g. complex Matrix Market)
  capacity_exceeded,   // a caller-supplied buffer is too small
  stopped,             // a StopToken ended an operation that has no partial answer (exact enumeration)
};

inline constexpr const char* to_string(StatusCode code) noexcept {
  switch (code) {
    case StatusCode::ok:
      return "ok";
    case StatusCode::index_out_of_range:
      return "index out of range";
    case StatusCode::non_finite_value:
      return "non-finite value";
    case StatusCode::value_out_of_range:
      return "value out of range";
    case StatusCode::energy_overflow:
      return "energy overflow";
    case StatusCode::missing_term:
      return "missing term";
    case StatusCode::size_limit:
      return "size limit";
    case StatusCode::parse_error:
      return "parse error";
    case StatusCode::io_error:
      return "i/o error";
    case StatusCode::invalid_argument:
      return "invalid argument";
    case StatusCode::unsupported:
      return "unsupported";
    case StatusCode::capacity_exceeded:
      return "capacity exceeded";
    case StatusCode::stopped:
      return "stopped";
  }
  return "unknown";
}

inline constexpr std::uint64_t no_term = ~std::uint64_t{0};

// The outcome of an operation on data. `message` is always a string literal (nothing is
// allocated); `line` is the 1-based input line for parsers (0 otherwise); `term` is the
// 0-based position of the offending term in the order the builder received them, and
// `i`, `j` its indices, so that the caller can say which term was refused.
struct [[nodiscard]] Status {
  StatusCode code = StatusCode::ok;
  const char* message = "";
  std::uint64_t line = 0;
  std::uint64_t term = no_term;
  std::uint64_t i = 0;
  std::uint64_t j = 0;

  constexpr bool ok() const noexcept { return code == StatusCode::ok; }
  constexpr explicit operator bool() const noexcept { return ok(); }

  static constexpr Status success() noexcept { return {}; }
  static constexpr Status error(StatusCode c, const char* msg) noexcept {
    Status s;
    s.code = c;
    s.message = msg;
    return s;
  }
  constexpr Status& at_term(std::uint64_t t, std::uint64_t ii, std::uint64_t jj) noexcept {
    term = t;
    i = ii;
    j = jj;
    return *this;
  }
  constexpr Status& at_line(std::uint64_t l) noexcept {
    line = l;
    return *this;
  }
};

// A value or the Status that explains why there is none. value() on an error is a broken
// precondition: it asserts, never throws.
template <class T>
class [[nodiscard]] Result {
 public:
  Result(T value) : value_(std::move(value)) {}  // NOLINT: implicit by design
  Result(Status status) : status_(status) {      // NOLINT: implicit by design
    SPINWRIGHT_ASSERT(!status.ok(), "Result built from an ok Status without a value");
  }

  bool ok() const noexcept { return status_.ok(); }
  explicit operator bool() const noexcept { return ok(); }
  const Status& status() const noexcept { return status_; }

  T& value() & {
    SPINWRIGHT_ASSERT(ok(), "Result::value() on an error");
    return value_;
  }
  const T& value() const& {
    SPINWRIGHT_ASSERT(ok(), "Result::value() on an error");
    return value_;
  }
  T&& value() && {
    SPINWRIGHT_ASSERT(ok(), "Result::value() on an error");
    return std::move(value_);
  }
  T* operator->() { return &value(); }
  const T* operator->() const { return &value(); }
  T& operator*() & { return value(); }
  const T& operator*() const& { return value(); }

 private:
  Status status_{};
  T value_{};
};

}  // namespace spinwright

#endif  // SPINWRIGHT_STATUS_HPP
