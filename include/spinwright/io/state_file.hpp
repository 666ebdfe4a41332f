// spinwright — state files: one variable per line, in index order, written either as spins
// ('+' for +1, '-' for -1) or as bits ('0' for spin +1, '1' for spin -1, since x = (1 - s) / 2).
// Blank lines and lines starting with '#' or '%' are skipped. Reading always returns spins.
// See docs/file-formats.md.
#ifndef SPINWRIGHT_IO_STATE_FILE_HPP
#define SPINWRIGHT_IO_STATE_FILE_HPP

#include "../config.hpp"
#include "../status.hpp"
#include "io_status.hpp"
#include "text_input.hpp"

#include <cstddef>      // std::size_t
#include <cstdint>      // std::int8_t, std::uint8_t, std::uint64_t
#include <string>       // std::string
#include <string_view>  // std::string_view
#include <vector>       // std::vector

namespace spinwright::io {

/// How a state file writes each variable.
enum class StateStyle : std::uint8_t { spins, bits };

/// Passed as `expected_size` when the number of values is not known in advance.
inline constexpr std::uint64_t any_size = ~std::uint64_t{0};

/// Parses a state held in memory into spins (+1/-1). Every non-comment line holds exactly one
/// of '+', '-', '0', '1'; a file must not mix spins and bits. When `expected_size` is given
/// the count must match it exactly (an extra value is reported at its line, a missing one at
/// the end). Without it a file with no values is an error. More than options.max_spins values
/// are refused (size_limit). The fuzzing entry point.
inline IoResult<std::vector<std::int8_t>> parse_state(std::string_view text, std::string_view name,
                                                      std::uint64_t expected_size = any_size,
                                                      const ReadOptions& options = {}) {
  detail::LineReader reader(text);
  detail::Line line;
  std::vector<std::int8_t> spins;
  if (expected_size != any_size && expected_size > options.max_spins) {
    return IoStatus::error(StatusCode::size_limit, name, 0,
                           "expected size " + std::to_string(expected_size) + " exceeds the limit of " +
                               std::to_string(options.max_spins) + " (ReadOptions::max_spins)");
  }
  if (expected_size != any_size) spins.reserve(static_cast<std::size_t>(expected_size));
  bool have_style = false;
  StateStyle style = StateStyle::spins;
  std::uint64_t style_line = 0;
  while (reader.next(line)) {
    const std::string_view s = detail::trim(line.text);
    if (s.empty() || s.front() == '#' || s.front() == '%') continue;
    std::string_view tok[2];
    const std::size_t count = detail::split_tokens(s, tok, 2);
    if (count > 1) {
      return IoStatus::error(StatusCode::parse_error, name, line.number,
                             "one value per line expected; trailing text " + detail::quote(tok[1]));
    }
    StateStyle here = StateStyle::spins;
    std::int8_t spin = 1;
    if (s == "+" || s == "-") {
      here = StateStyle::spins;
      spin = s == "+" ? 1 : -1;
    } else if (s == "0" || s == "1") {
      here = StateStyle::bits;
      spin = s == "0" ? 1 : -1;
    } else {
      return IoStatus::error(StatusCode::parse_error, name, line.number,
                             "expected '+' or '-' (spins) or '0' or '1' (bits), found " + detail::quote(s));
    }
    if (!have_style) {
      have_style = true;
      style = here;
      style_line = line.number;
    } else if (here != style) {
      return IoStatus::error(StatusCode::parse_error, name, line.number,
                             std::string("mixes spins and bits: line ") + std::to_string(style_line) + " holds " +
                                 (style == StateStyle::spins ? "a spin" : "a bit") + ", this line " +
                                 (here == StateStyle::spins ? "a spin" : "a bit"));
    }
    if (expected_size != any_size && spins.size() >= expected_size) {
      return IoStatus::error(StatusCode::parse_error, name, line.number,
                             "more values than the " + std::to_string(expected_size) + " the model has");
    }
    if (spins.size() >= options.max_spins) {
      return IoStatus::error(
          StatusCode::size_limit, name, line.number,
          "more values than the limit of " + std::to_string(options.max_spins) + " (ReadOptions::max_spins)");
    }
    spins.push_back(spin);
  }
  if (expected_size != any_size && spins.size() < expected_size) {
    return IoStatus::error(StatusCode::parse_error, name, reader.last_line() + 1,
                           "file ends after " + std::to_string(spins.size()) + " of the " +
                               std::to_string(expected_size) + " values the model needs");
  }
  if (expected_size == any_size && spins.empty()) {
    return IoStatus::error(
        StatusCode::parse_error, name, reader.last_line() + 1,
        reader.last_line() == 0 ? "empty file: expected one value per line" : "no values in the file");
  }
  return spins;
}

/// Reads a state file (see parse_state).
inline IoResult<std::vector<std::int8_t>> read_state(const std::string& path, std::uint64_t expected_size = any_size,
                                                     const ReadOptions& options = {}) {
  auto text = read_file_text(path, options);
  if (!text.ok()) return text.status();
  return parse_state(text.value(), path, expected_size, options);
}

/// Formats `n` spins (+1/-1) one per line, optionally after a comment (each of its lines is
/// written prefixed with "# "). Refuses (invalid_argument, line 0) a value other than +1/-1.
inline IoResult<std::string> format_state(const std::int8_t* spins, std::size_t n, StateStyle style = StateStyle::spins,
                                          std::string_view comment = {}, std::string_view name = "<state>") {
  std::string out;
  out.reserve(n * 2 + comment.size() + 8);
  while (!comment.empty()) {
    const std::size_t end = comment.find('\n');
    out += "# ";
    out += comment.substr(0, end);
    out += '\n';
    if (end == std::string_view::npos) break;
    comment.remove_prefix(end + 1);
  }
  for (std::size_t i = 0; i < n; ++i) {
    if (spins[i] != 1 && spins[i] != -1) {
      return IoStatus::error(StatusCode::invalid_argument, name, 0,
                             "spin " + std::to_string(i + 1) + " is " + std::to_string(spins[i]) + ", not +1 or -1");
    }
    if (style == StateStyle::spins) {
      out += spins[i] > 0 ? '+' : '-';
    } else {
      out += spins[i] > 0 ? '0' : '1';
    }
    out += '\n';
  }
  return out;
}

inline IoResult<std::string> format_state(const std::vector<std::int8_t>& spins, StateStyle style = StateStyle::spins,
                                          std::string_view comment = {}) {
  return format_state(spins.data(), spins.size(), style, comment);
}

/// Writes a state file (see format_state); errors name `path`.
inline IoStatus write_state(const std::string& path, const std::int8_t* spins, std::size_t n,
                            StateStyle style = StateStyle::spins, std::string_view comment = {}) {
  auto text = format_state(spins, n, style, comment, path);
  if (!text.ok()) return text.status();
  return write_file_text(path, text.value());
}

inline IoStatus write_state(const std::string& path, const std::vector<std::int8_t>& spins,
                            StateStyle style = StateStyle::spins, std::string_view comment = {}) {
  return write_state(path, spins.data(), spins.size(), style, comment);
}

}  // namespace spinwright::io

#endif  // SPINWRIGHT_IO_STATE_FILE_HPP
