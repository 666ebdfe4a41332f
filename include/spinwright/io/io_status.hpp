// spinwright — how file readers and writers report errors: IoStatus (code, file, 1-based line,
// reason and the full "FILE:LINE: reason" message) and IoResult<T> (a value or an IoStatus).
// Unlike the core Status, these own their text (std::string), because a useful message names
// the file and quotes the offending token.
#ifndef SPINWRIGHT_IO_IO_STATUS_HPP
#define SPINWRIGHT_IO_IO_STATUS_HPP

#include "../config.hpp"
#include "../status.hpp"

#include <cstdint>      // std::uint64_t
#include <string>       // std::string, std::to_string
#include <string_view>  // std::string_view
#include <utility>      // std::move

namespace spinwright::io {

/// The outcome of reading or writing a file. `line` is 1-based; it is 0 only when the error is
/// not about any line (the file cannot be opened or read, or a model cannot be written).
/// `message` is always exactly `file + ":" + line + ": " + reason`.
struct [[nodiscard]] IoStatus {
  StatusCode code = StatusCode::ok;
  std::string file;
  std::uint64_t line = 0;
  std::string reason;
  std::string message;

  bool ok() const noexcept { return code == StatusCode::ok; }
  explicit operator bool() const noexcept { return ok(); }

  static IoStatus success() { return {}; }
  /// Builds an error and formats its message. Allocates.
  static IoStatus error(StatusCode c, std::string_view file_name, std::uint64_t line_number, std::string why) {
    IoStatus s;
    s.code = c;
    s.file = std::string(file_name);
    s.line = line_number;
    s.reason = std::move(why);
    s.message = s.file + ":" + std::to_string(line_number) + ": " + s.reason;
    return s;
  }
};

/// A value or the IoStatus that explains why there is none. A failed read never hands out a
/// partly built value: value() on an error is a broken precondition (asserted, never thrown).
template <class T>
class [[nodiscard]] IoResult {
 public:
  IoResult(T value) : value_(std::move(value)) {}           // NOLINT: implicit by design
  IoResult(IoStatus status) : status_(std::move(status)) {  // NOLINT: implicit by design
    SPINWRIGHT_ASSERT(!status_.ok(), "IoResult built from an ok IoStatus without a value");
  }

  bool ok() const noexcept { return status_.ok(); }
  explicit operator bool() const noexcept { return ok(); }
  const IoStatus& status() const noexcept { return status_; }
  /// Shorthand for status().message ("" when ok).
  const std::string& message() const noexcept { return status_.message; }

  T& value() & {
    SPINWRIGHT_ASSERT(ok(), "IoResult::value() on an error");
    return value_;
  }
  const T& value() const& {
    SPINWRIGHT_ASSERT(ok(), "IoResult::value() on an error");
    return value_;
  }
  T&& value() && {
    SPINWRIGHT_ASSERT(ok(), "IoResult::value() on an error");
    return std::move(value_);
  }
  T* operator->() { return &value(); }
  const T* operator->() const { return &value(); }
  T& operator*() & { return value(); }
  const T& operator*() const& { return value(); }

 private:
  IoStatus status_{};
  T value_{};
};

}  // namespace spinwright::io

#endif  // SPINWRIGHT_IO_IO_STATUS_HPP
