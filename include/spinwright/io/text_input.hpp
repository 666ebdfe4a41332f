// spinwright — shared pieces of the text readers: ReadOptions, reading a whole file with a size
// cap, and (in io::detail) line splitting, tokens and strict number parsing with
// std::from_chars (whole tokens only: "12abc", "0x10" and "1,5" are refused).
#ifndef SPINWRIGHT_IO_TEXT_INPUT_HPP
#define SPINWRIGHT_IO_TEXT_INPUT_HPP

#include "../config.hpp"
#include "../status.hpp"
#include "io_status.hpp"

#include <cerrno>        // errno
#include <charconv>      // std::from_chars, std::to_chars
#include <cstddef>       // std::size_t
#include <cstdint>       // std::int64_t, std::uint64_t
#include <filesystem>    // std::filesystem::status (no-throw overloads)
#include <fstream>       // std::ifstream, std::ofstream
#include <limits>        // std::numeric_limits
#include <string>        // std::string
#include <string_view>   // std::string_view
#include <system_error>  // std::errc, std::error_code, std::generic_category
#include <type_traits>   // std::is_integral_v

namespace spinwright::io {

/// Which value type read_model_file() builds. automatic: Matrix Market files follow their
/// banner's field ('integer' -> int64_t, 'real' -> double); edge lists give int64_t when every
/// weight is an integer literal that fits int64_t, double otherwise. integer: always int64_t
/// (a real literal is then an error). real: always double.
enum class ValueKind : std::uint8_t { automatic, integer, real };

/// Limits and choices shared by every reader.
struct ReadOptions {
  /// Sanity cap on the number of spins a header may declare (checked before any allocation,
  /// together with the limit of the index type).
  std::uint64_t max_spins = std::uint64_t{1} << 26;
  /// Files longer than this are refused while being read (before parsing).
  std::uint64_t max_file_bytes = std::uint64_t{1} << 32;
  /// Value type chosen by read_model_file / parse_model_text.
  ValueKind value_kind = ValueKind::automatic;
};

/// Reads a whole file into a string. Errors (line 0): the file is missing, is a directory,
/// cannot be opened or read (io_error), or is longer than options.max_file_bytes (size_limit).
inline IoResult<std::string> read_file_text(const std::string& path, const ReadOptions& options = {}) {
  std::error_code ec;
  const auto st = std::filesystem::status(path, ec);
  if (st.type() == std::filesystem::file_type::not_found) {
    return IoStatus::error(StatusCode::io_error, path, 0, "cannot open file: no such file or directory");
  }
  if (st.type() == std::filesystem::file_type::directory) {
    return IoStatus::error(StatusCode::io_error, path, 0, "cannot read: this is a directory, not a file");
  }
  errno = 0;
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    const int err = errno;
    std::string why = "cannot open file for reading";
    if (err != 0) why += ": " + std::generic_category().message(err);
    return IoStatus::error(StatusCode::io_error, path, 0, why);
  }
  std::string text;
  // The file's size, when known and within the limit, is reserved at once (no regrowth); the
  // read below still decides what the text is.
  if (st.type() == std::filesystem::file_type::regular) {
    const auto size = std::filesystem::file_size(path, ec);
    if (!ec && size <= options.max_file_bytes && size <= text.max_size()) text.reserve(static_cast<std::size_t>(size));
  }
  char chunk[1 << 16];
  while (in) {
    in.read(chunk, sizeof chunk);
    const auto got = static_cast<std::size_t>(in.gcount());
    if (got == 0) break;
    if (text.size() + got > options.max_file_bytes) {
      return IoStatus::error(StatusCode::size_limit, path, 0,
                             "file is longer than the limit of " + std::to_string(options.max_file_bytes) +
                                 " bytes (ReadOptions::max_file_bytes)");
    }
    text.append(chunk, got);
  }
  if (in.bad()) return IoStatus::error(StatusCode::io_error, path, 0, "read error while reading the file");
  return text;
}

/// Writes a string to a file, replacing it. Errors (line 0, io_error): cannot open or write.
inline IoStatus write_file_text(const std::string& path, std::string_view text) {
  errno = 0;
  std::ofstream out(path, std::ios::binary | std::ios::trunc);
  if (!out) {
    const int err = errno;
    std::string why = "cannot open file for writing";
    if (err != 0) why += ": " + std::generic_category().message(err);
    return IoStatus::error(StatusCode::io_error, path, 0, why);
  }
  out.write(text.data(), static_cast<std::streamsize>(text.size()));
  out.flush();
  if (!out) return IoStatus::error(StatusCode::io_error, path, 0, "write error (disk full or file not writable?)");
  return IoStatus::success();
}

namespace detail {

/// One line of input without its end-of-line characters; `number` is 1-based.
struct Line {
  std::string_view text;
  std::uint64_t number = 0;
};

/// Splits a buffer into lines at '\n'; a trailing '\r' is dropped (CRLF files). A final line
/// without '\n' still counts; the empty piece after a final '\n' does not. A UTF-8 byte order
/// mark at the very start is skipped.
class LineReader {
 public:
  explicit LineReader(std::string_view text) noexcept : text_(text) {
    if (text_.substr(0, 3) == "\xEF\xBB\xBF") pos_ = 3;
  }

  bool next(Line& out) noexcept {
    if (pos_ >= text_.size()) return false;
    std::size_t end = text_.find('\n', pos_);
    if (end == std::string_view::npos) end = text_.size();
    std::string_view line = text_.substr(pos_, end - pos_);
    if (!line.empty() && line.back() == '\r') line.remove_suffix(1);
    pos_ = end + 1;
    out.text = line;
    out.number = ++number_;
    return true;
  }
  /// Number of the last line returned (0 before the first).
  std::uint64_t last_line() const noexcept { return number_; }
  /// Bytes not yet returned as lines.
  std::size_t remaining_bytes() const noexcept { return pos_ >= text_.size() ? 0 : text_.size() - pos_; }

 private:
  std::string_view text_;
  std::size_t pos_ = 0;
  std::uint64_t number_ = 0;
};

constexpr bool is_space(char c) noexcept { return c == ' ' || c == '\t' || c == '\r' || c == '\v' || c == '\f'; }

inline std::string_view trim(std::string_view s) noexcept {
  while (!s.empty() && is_space(s.front())) s.remove_prefix(1);
  while (!s.empty() && is_space(s.back())) s.remove_suffix(1);
  return s;
}

/// Splits on blanks. Stores at most `capacity` tokens; returns how many there are in all.
inline std::size_t split_tokens(std::string_view s, std::string_view* tokens, std::size_t capacity) noexcept {
  std::size_t count = 0;
  std::size_t k = 0;
  while (k < s.size()) {
    while (k < s.size() && is_space(s[k])) ++k;
    if (k >= s.size()) break;
    const std::size_t start = k;
    while (k < s.size() && !is_space(s[k])) ++k;
    if (count < capacity) tokens[count] = s.substr(start, k - start);
    ++count;
  }
  return count;
}

/// A token as it may appear in a message: quoted, at most 40 characters, non-printable bytes
/// escaped as \xNN.
inline std::string quote(std::string_view token) {
  static constexpr char hex[] = "0123456789abcdef";
  std::string q = "'";
  const std::size_t shown = token.size() > 40 ? 40 : token.size();
  for (std::size_t k = 0; k < shown; ++k) {
    const auto c = static_cast<unsigned char>(token[k]);
    if (c >= 0x20 && c < 0x7f && c != '\\') {
      q += static_cast<char>(c);
    } else {
      q += "\\x";
      q += hex[c >> 4];
      q += hex[c & 15];
    }
  }
  if (shown < token.size()) q += "...";
  q += "'";
  return q;
}

/// A numeric token: an integer literal ([+-]digits) or a real literal. Integers that do not fit
/// int64_t keep their double value and set int_overflow.
struct Number {
  bool integer = false;
  bool int_overflow = false;
  std::int64_t i = 0;
  double d = 0;
};

/// Decimal exponent of the leading digit of a real literal that from_chars reported as out of
/// range: positive means overflow, negative means underflow (the value rounds to zero).
inline bool real_literal_overflows(std::string_view t) noexcept {
  std::size_t k = 0;
  if (k < t.size() && (t[k] == '-' || t[k] == '+')) ++k;
  std::int64_t lead = 0;  // decimal exponent of the first non-zero digit
  bool found = false;
  std::int64_t int_digits = 0;
  while (k < t.size() && t[k] >= '0' && t[k] <= '9') {
    if (found || t[k] != '0') {
      found = true;
      ++int_digits;
    }
    ++k;
  }
  if (found) {
    lead = int_digits - 1;
  } else if (k < t.size() && t[k] == '.') {
    ++k;
    std::int64_t zeros = 0;
    while (k < t.size() && t[k] == '0') {
      ++zeros;
      ++k;
    }
    lead = -(zeros + 1);
  }
  while (k < t.size() && t[k] != 'e' && t[k] != 'E') ++k;
  if (k < t.size()) {
    ++k;
    bool neg = false;
    if (k < t.size() && (t[k] == '-' || t[k] == '+')) neg = t[k++] == '-';
    std::int64_t e = 0;
    while (k < t.size() && t[k] >= '0' && t[k] <= '9') {
      if (e < 1000000) e = e * 10 + (t[k] - '0');
      ++k;
    }
    lead += neg ? -e : e;
  }
  return lead > 0;
}

/// The usual tokens, read directly (no message to build, nothing to allocate): a short integer
/// ('-' and 1 to 18 digits) into `out` as parse_number reads it, or plain digits (1 to 19) as
/// parse_count reads them. False: not such a token; the full parser decides.
inline bool read_short_integer(std::string_view t, Number& out) noexcept {
  const bool negative = !t.empty() && t.front() == '-';
  const std::size_t digits = t.size() - (negative ? 1 : 0);
  if (digits < 1 || digits > 18) return false;
  std::int64_t v = 0;
  std::size_t k = negative ? 1 : 0;
  for (; k < t.size() && t[k] >= '0' && t[k] <= '9'; ++k) v = v * 10 + (t[k] - '0');
  if (k != t.size()) return false;
  out = Number{};
  out.integer = true;
  out.i = negative ? -v : v;
  out.d = static_cast<double>(out.i);
  return true;
}
inline bool read_plain_count(std::string_view t, std::uint64_t& out) noexcept {
  if (t.empty() || t.size() > 19) return false;
  std::uint64_t v = 0;
  std::size_t k = 0;
  for (; k < t.size() && t[k] >= '0' && t[k] <= '9'; ++k) v = v * 10 + static_cast<std::uint64_t>(t[k] - '0');
  if (k != t.size()) return false;
  out = v;
  return true;
}

/// Parses a whole token as a number. Returns "" on success, otherwise the reason (and sets
/// `code`): not a number, trailing characters, NaN/infinity, or beyond the range of double.
/// A leading '+' is accepted. Real literals that underflow read as 0 (correct rounding).
inline std::string parse_number(std::string_view t, Number& out, StatusCode& code) {
  code = StatusCode::parse_error;
  std::string_view body = t;
  if (!body.empty() && body.front() == '+') {
    body.remove_prefix(1);
    if (body.empty() || body.front() == '-' || body.front() == '+') return "not a number: " + quote(t);
  }
  if (read_short_integer(body, out)) return {};
  const char* first = body.data();
  const char* last = body.data() + body.size();
  bool int_syntax = !body.empty();
  for (std::size_t k = 0; k < body.size(); ++k) {
    const char c = body[k];
    if (!((c >= '0' && c <= '9') || (k == 0 && c == '-' && body.size() > 1))) {
      int_syntax = false;
      break;
    }
  }
  out = Number{};
  if (int_syntax) {
    const auto r = std::from_chars(first, last, out.i);
    if (r.ec == std::errc() && r.ptr == last) {
      out.integer = true;
      out.d = static_cast<double>(out.i);
      return {};
    }
    // Too large for int64_t: keep the (rounded) double value for real-valued models.
    out.integer = true;
    out.int_overflow = true;
    const auto rd = std::from_chars(first, last, out.d);
    if (rd.ec == std::errc::result_out_of_range) {
      code = StatusCode::value_out_of_range;
      return "number " + quote(t) + " is beyond the range of double";
    }
    return {};
  }
  const auto r = std::from_chars(first, last, out.d, std::chars_format::general);
  if (r.ptr == first || (r.ec != std::errc() && r.ec != std::errc::result_out_of_range)) {
    return "not a number: " + quote(t);
  }
  if (r.ptr != last) return "trailing characters after a number in " + quote(t);
  if (r.ec == std::errc::result_out_of_range) {
    if (real_literal_overflows(body)) {
      code = StatusCode::value_out_of_range;
      return "number " + quote(t) + " is beyond the range of double";
    }
    out.d = (body.front() == '-') ? -0.0 : 0.0;
    return {};
  }
  if (!(out.d - out.d == 0.0)) {
    code = StatusCode::non_finite_value;
    return "NaN or infinity is not allowed: " + quote(t);
  }
  return {};
}

/// Parses a whole token as a non-negative count (digits, optional leading '+').
inline std::string parse_count(std::string_view t, std::uint64_t& out, StatusCode& code, const char* what) {
  code = StatusCode::parse_error;
  if (read_plain_count(t, out)) return {};
  std::string_view body = t;
  if (!body.empty() && body.front() == '+') body.remove_prefix(1);
  if (!body.empty() && body.front() == '-') {
    bool digits = body.size() > 1;
    for (std::size_t k = 1; k < body.size(); ++k) digits = digits && body[k] >= '0' && body[k] <= '9';
    if (digits) {
      code = StatusCode::invalid_argument;
      return std::string(what) + " is negative: " + quote(t);
    }
    return std::string(what) + " is not a whole number: " + quote(t);
  }
  if (body.empty() || body.front() < '0' || body.front() > '9') {
    return std::string(what) + " is not a whole number: " + quote(t);
  }
  const auto r = std::from_chars(body.data(), body.data() + body.size(), out);
  if (r.ec == std::errc::result_out_of_range) {
    code = StatusCode::size_limit;
    return std::string(what) + " " + quote(t) + " is too large";
  }
  if (r.ec != std::errc() || r.ptr != body.data() + body.size()) {
    return std::string(what) + " is not a whole number: " + quote(t);
  }
  return {};
}

/// Converts a parsed number to a model's value type. Integer value types need an integer
/// literal that fits; float needs |v| <= FLT_MAX. Returns "" on success.
template <class Value>
std::string number_to_value(const Number& n, std::string_view token, Value& out, StatusCode& code) {
  if constexpr (std::is_integral_v<Value>) {
    if (!n.integer) {
      code = StatusCode::parse_error;
      return "real number " + quote(token) + " where the integer value type needs a whole number";
    }
    if (n.int_overflow || n.i < static_cast<std::int64_t>(std::numeric_limits<Value>::min()) ||
        n.i > static_cast<std::int64_t>(std::numeric_limits<Value>::max())) {
      code = StatusCode::value_out_of_range;
      return "integer " + quote(token) + " does not fit the " + std::to_string(sizeof(Value) * 8) +
             "-bit integer value type";
    }
    out = static_cast<Value>(n.i);
    return {};
  } else {
    const double lim = static_cast<double>(std::numeric_limits<Value>::max());
    if (n.d > lim || n.d < -lim) {
      code = StatusCode::value_out_of_range;
      return "number " + quote(token) + " is beyond the range of " +
             (sizeof(Value) == sizeof(float) ? std::string("float") : std::string("double"));
    }
    out = static_cast<Value>(n.d);
    return {};
  }
}

/// Appends a value exactly: integers in decimal, floating values as the shortest text that
/// reads back to the same double (std::to_chars), with ".0" added when that text looks like an
/// integer, so that a reader can tell real values from integers. float values are widened to
/// double first so that reading back through double is exact.
template <class Value>
void append_value(std::string& s, Value v) {
  char buf[64];
  if constexpr (std::is_integral_v<Value>) {
    const auto r = std::to_chars(buf, buf + sizeof buf, static_cast<std::int64_t>(v));
    s.append(buf, static_cast<std::size_t>(r.ptr - buf));
  } else {
    const auto r = std::to_chars(buf, buf + sizeof buf, static_cast<double>(v));
    const std::string_view text(buf, static_cast<std::size_t>(r.ptr - buf));
    s.append(text);
    if (text.find_first_of(".eE") == std::string_view::npos) s.append(".0");
  }
}

inline void append_u64(std::string& s, std::uint64_t v) {
  char buf[32];
  const auto r = std::to_chars(buf, buf + sizeof buf, v);
  s.append(buf, static_cast<std::size_t>(r.ptr - buf));
}

/// Lines that need at least this many bytes each ("1 2 3" plus a newline) bound how many
/// entries a header may make us reserve.
inline constexpr std::size_t min_entry_line_bytes = 6;

inline std::size_t bounded_reserve(std::uint64_t declared, std::size_t remaining_bytes) noexcept {
  const std::uint64_t fit = remaining_bytes / min_entry_line_bytes + 1;
  return static_cast<std::size_t>(declared < fit ? declared : fit);
}

}  // namespace detail
}  // namespace spinwright::io

#endif  // SPINWRIGHT_IO_TEXT_INPUT_HPP
