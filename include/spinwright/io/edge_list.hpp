// spinwright — weighted edge lists as the max-cut literature distributes them:
//
//   N M            nodes and edges (any text after the two numbers is ignored)
//   i j w          M lines: 1-based nodes, integer or real weight, undirected
//   i j            or, in an unweighted list (every edge line has two fields), weight 1
//
// Reading gives the max-cut Ising model J_ij = w, h = 0: self-loops fold into the offset and
// repeated edges are summed (the builder's rules), zero weights are dropped. Blank lines and
// lines whose first non-blank character is '#' or '%' are skipped anywhere. Writing refuses
// models with fields or an offset, which the format cannot hold. See docs/file-formats.md.
#ifndef SPINWRIGHT_IO_EDGE_LIST_HPP
#define SPINWRIGHT_IO_EDGE_LIST_HPP

#include "../config.hpp"
#include "../model/form.hpp"
#include "../model/sparse_model.hpp"
#include "../status.hpp"
#include "io_status.hpp"
#include "detail/term_list.hpp"
#include "text_input.hpp"

#include <cstddef>      // std::size_t
#include <cstdint>      // std::uint32_t, std::uint64_t
#include <string>       // std::string
#include <string_view>  // std::string_view
#include <utility>      // std::move

namespace spinwright::io {
namespace detail {

/// Case-insensitive test for the Matrix Market banner at the start of a line.
inline bool starts_with_banner(std::string_view line) noexcept {
  constexpr std::string_view banner = "%%matrixmarket";
  if (line.size() < banner.size()) return false;
  for (std::size_t k = 0; k < banner.size(); ++k) {
    char c = line[k];
    if (c >= 'A' && c <= 'Z') c = static_cast<char>(c - 'A' + 'a');
    if (c != banner[k]) return false;
  }
  return true;
}

inline bool is_skippable_edge_list_line(std::string_view trimmed) noexcept {
  return trimmed.empty() || trimmed.front() == '#' || trimmed.front() == '%';
}

/// Scans an edge list into a term list (no value type chosen yet).
inline IoResult<TermList> scan_edge_list(std::string_view text, std::string_view name, const ReadOptions& options) {
  LineReader reader(text);
  Line line;
  TermList list;
  list.form = Form::ising;
  list.diagonal_is_linear = false;
  std::uint64_t declared_edges = 0;
  bool have_header = false;
  std::size_t header_fields = 0;
  std::size_t columns = 0;  // fields of every edge line: 3 (i j w) or 2 (i j, weight 1); 0 before the first
  std::uint64_t columns_line = 0;
  StatusCode code = StatusCode::ok;
  std::string_view tok[4];
  while (reader.next(line)) {
    const std::string_view s = trim(line.text);
    if (starts_with_banner(s)) {
      return IoStatus::error(StatusCode::parse_error, name, line.number,
                             line.number == 1 ? "this is a Matrix Market file, not an edge list"
                                              : "a Matrix Market banner must be the first line of its file");
    }
    if (is_skippable_edge_list_line(s)) continue;
    const std::size_t count = split_tokens(s, tok, 4);
    if (!have_header) {
      if (count < 2) {
        return IoStatus::error(StatusCode::parse_error, name, line.number,
                               "header must start with 'N M' (number of nodes and number of edges)");
      }
      std::string why = parse_count(tok[0], list.num_spins, code, "number of nodes");
      if (why.empty()) why = parse_count(tok[1], declared_edges, code, "number of edges");
      if (!why.empty()) return IoStatus::error(code, name, line.number, "header: " + why);
      if (list.num_spins > options.max_spins) {
        return IoStatus::error(StatusCode::size_limit, name, line.number,
                               "header declares " + std::to_string(list.num_spins) + " nodes, more than the limit of " +
                                   std::to_string(options.max_spins) + " (ReadOptions::max_spins)");
      }
      list.header_line = line.number;
      header_fields = count;
      have_header = true;
      // Never trust the header for a reservation: each edge line needs at least 6 bytes.
      list.terms.reserve(bounded_reserve(declared_edges, reader.remaining_bytes()));
      continue;
    }
    if (list.terms.size() >= declared_edges) {
      return IoStatus::error(StatusCode::parse_error, name, line.number,
                             "extra line: the header on line " + std::to_string(list.header_line) + " declares " +
                                 std::to_string(declared_edges) + " edges");
    }
    if (count < 2) {
      return IoStatus::error(StatusCode::parse_error, name, line.number,
                             "expected 'i j w' (two node numbers and a weight) or 'i j' (unweighted), found 1 field");
    }
    if (count > 3) {
      return IoStatus::error(StatusCode::parse_error, name, line.number,
                             "trailing text after the weight: " + quote(tok[3]));
    }
    if (columns == 0) {
      columns = count;
      columns_line = line.number;
    } else if (count != columns) {
      // The lines differ: the two-field one is the line that lacks its weight (a repeated
      // header 'N M' is caught there too).
      const bool missing_here = count == 2;
      return IoStatus::error(StatusCode::parse_error, name, missing_here ? line.number : columns_line,
                             "missing weight: this edge line has 2 fields but line " +
                                 std::to_string(missing_here ? columns_line : line.number) +
                                 " has 3; every edge line is 'i j w', or every one is 'i j' (unweighted, weight 1)");
    }
    RawTerm t;
    std::uint64_t ends[2] = {0, 0};
    for (int e = 0; e < 2; ++e) {
      if (!read_plain_count(tok[e], ends[e])) {
        const std::string why = parse_count(tok[e], ends[e], code, "node number");
        if (!why.empty()) return IoStatus::error(code, name, line.number, why);
      }
      if (ends[e] == 0) {
        return IoStatus::error(StatusCode::index_out_of_range, name, line.number,
                               "node number 0: nodes are numbered from 1 to N");
      }
      if (ends[e] > list.num_spins) {
        // A file without its header line reads its first edge as 'N M': say so when it looks so.
        const bool headerless = list.terms.empty() && (header_fields == 3 || list.num_spins <= 2);
        return IoStatus::error(
            StatusCode::index_out_of_range, name, line.number,
            "node number " + std::to_string(ends[e]) + " is beyond N = " + std::to_string(list.num_spins) +
                " declared on line " + std::to_string(list.header_line) +
                (headerless ? "; is the header line missing? An edge list starts with 'N M' (number of nodes, "
                              "number of edges), and line " +
                                  std::to_string(list.header_line) + " was read as that header"
                            : ""));
      }
    }
    // Unweighted lists: every edge has weight 1 (the literal below, so messages can quote it).
    const std::string_view weight = count == 3 ? tok[2] : std::string_view("1");
    Number value;
    if (!read_short_integer(weight, value)) {
      const std::string why = parse_number(weight, value, code);
      if (!why.empty()) return IoStatus::error(code, name, line.number, "weight: " + why);
    }
    t.i = ends[0] - 1;
    t.j = ends[1] - 1;
    t.set_value(value);
    t.set_token(weight);
    t.line = line.number;
    // Automatic value type: int64_t only when every weight is an integer literal that fits.
    list.all_integer = list.all_integer && value.integer && !value.int_overflow;
    list.terms.push_back(t);
  }
  if (!have_header) {
    return IoStatus::error(StatusCode::parse_error, name, reader.last_line() + 1,
                           reader.last_line() == 0 ? "empty file: expected a header 'N M'"
                                                   : "no header: expected 'N M' before the end of the file");
  }
  if (list.terms.size() < declared_edges) {
    return IoStatus::error(StatusCode::parse_error, name, reader.last_line() + 1,
                           "file ends after " + std::to_string(list.terms.size()) + " of the " +
                               std::to_string(declared_edges) + " edges declared on line " +
                               std::to_string(list.header_line) + " (truncated file?)");
  }
  return list;
}

}  // namespace detail

/// Parses an edge list held in memory; `name` is used in messages. The fuzzing entry point.
/// Integer Value types need integer weights that fit; float/double accept any finite number.
template <class Value, class Index = std::uint32_t>
IoResult<IsingModel<Value, Index>> parse_edge_list(std::string_view text, std::string_view name,
                                                   const ReadOptions& options = {}) {
  auto scanned = detail::scan_edge_list(text, name, options);
  if (!scanned.ok()) return scanned.status();
  return detail::build_terms<Form::ising, Value, Index>(scanned.value(), name);
}

/// Reads an edge-list file (see parse_edge_list).
template <class Value, class Index = std::uint32_t>
IoResult<IsingModel<Value, Index>> read_edge_list(const std::string& path, const ReadOptions& options = {}) {
  auto text = read_file_text(path, options);
  if (!text.ok()) return text.status();
  return parse_edge_list<Value, Index>(text.value(), path, options);
}

/// Writes a max-cut Ising model as an edge list: "N M", then one "i j w" line per coupling
/// (i < j, 1-based, in increasing order). Values are written exactly (integers in decimal,
/// reals as the shortest text that reads back to the same double). Refuses (invalid_argument,
/// line 0) a model with a non-zero field or offset. `name` is used in messages.
template <class Value, class Index>
IoResult<std::string> format_edge_list(const IsingModel<Value, Index>& m, std::string_view name = "<edge list>") {
  const std::size_t n = m.num_spins();
  for (std::size_t i = 0; i < n; ++i) {
    if (m.field(static_cast<Index>(i)) != Value{0}) {
      return IoStatus::error(
          StatusCode::invalid_argument, name, 0,
          "spin " + std::to_string(i + 1) +
              " has a non-zero field; an edge list holds couplings only (write Matrix Market instead)");
    }
  }
  if (m.offset() != energy_t<Value>{0}) {
    return IoStatus::error(
        StatusCode::invalid_argument, name, 0,
        "the model has a non-zero offset; an edge list cannot hold it (write Matrix Market instead)");
  }
  std::string out;
  out.reserve(16 + m.num_pairs() * 16);
  detail::append_u64(out, n);
  out += ' ';
  detail::append_u64(out, m.num_pairs());
  out += '\n';
  for (std::size_t i = 0; i < n; ++i) {
    const auto ii = static_cast<Index>(i);
    m.for_each_neighbour(ii, [&](Index j, Value v) {
      if (j <= ii) return;
      detail::append_u64(out, i + 1);
      out += ' ';
      detail::append_u64(out, static_cast<std::uint64_t>(j) + 1);
      out += ' ';
      detail::append_value(out, v);
      out += '\n';
    });
  }
  return out;
}

/// Writes an edge-list file (see format_edge_list); errors name `path`.
template <class Value, class Index>
IoStatus write_edge_list(const std::string& path, const IsingModel<Value, Index>& m) {
  auto text = format_edge_list(m, path);
  if (!text.ok()) return text.status();
  return write_file_text(path, text.value());
}

}  // namespace spinwright::io

#endif  // SPINWRIGHT_IO_EDGE_LIST_HPP
