// spinwright — Matrix Market coordinate files (the NIST exchange format) holding an Ising or a
// QUBO model: the `% spinwright form` / `% spinwright offset` directives, how a stored matrix
// M becomes the model (entries summed; symmetric storage counts off-diagonals twice; the
// Ising diagonal holds fields), the variants refused and the writer's layout are in
// docs/file-formats.md.
#ifndef SPINWRIGHT_IO_MATRIX_MARKET_HPP
#define SPINWRIGHT_IO_MATRIX_MARKET_HPP

#include "../config.hpp"
#include "../model/form.hpp"
#include "../model/sparse_model.hpp"
#include "../status.hpp"
#include "edge_list.hpp"  // detail::starts_with_banner
#include "io_status.hpp"
#include "detail/term_list.hpp"
#include "text_input.hpp"

#include <cstddef>      // std::size_t
#include <cstdint>      // std::uint64_t
#include <string>       // std::string
#include <string_view>  // std::string_view
#include <type_traits>  // std::is_integral_v

namespace spinwright::io {
namespace detail {

inline std::string lower(std::string_view s) {
  std::string out(s);
  for (char& c : out) {
    if (c >= 'A' && c <= 'Z') c = static_cast<char>(c - 'A' + 'a');
  }
  return out;
}

// What the banner line says about the entries.
struct MmBanner {
  bool integer_field = false;
  bool symmetric = false;
};

inline IoResult<MmBanner> scan_mm_banner(std::string_view text, std::string_view name) {
  if (!starts_with_banner(trim(text))) {
    return IoStatus::error(StatusCode::parse_error, name, 1,
                           "missing banner: the first line must be '%%MatrixMarket matrix coordinate real general' "
                           "(or integer / symmetric)");
  }
  std::string_view tok[6];
  const std::size_t count = split_tokens(text, tok, 6);
  if (count < 5) {
    return IoStatus::error(StatusCode::parse_error, name, 1,
                           "incomplete banner: expected '%%MatrixMarket matrix coordinate <field> <symmetry>'");
  }
  if (count > 5)
    return IoStatus::error(StatusCode::parse_error, name, 1, "trailing text after the banner: " + quote(tok[5]));
  if (tok[0].size() != 14)
    return IoStatus::error(StatusCode::parse_error, name, 1, "malformed banner word " + quote(tok[0]));
  const std::string object = lower(tok[1]);
  const std::string format = lower(tok[2]);
  const std::string field = lower(tok[3]);
  const std::string symmetry = lower(tok[4]);
  auto refuse = [&](const std::string& why) { return IoStatus::error(StatusCode::unsupported, name, 1, why); };
  if (object != "matrix") return refuse("object " + quote(tok[1]) + " is not supported; only 'matrix' is");
  if (format == "array")
    return refuse("dense 'array' storage is not supported; write the matrix in 'coordinate' format");
  if (format != "coordinate") return refuse("unknown storage format " + quote(tok[2]));
  if (field == "complex" || field == "pattern") {
    return refuse("field " + quote(tok[3]) + " is not supported; use 'real' or 'integer' (a model needs values)");
  }
  if (field != "integer" && field != "real") return refuse("unknown field " + quote(tok[3]));
  if (symmetry == "skew-symmetric" || symmetry == "hermitian") {
    return refuse("symmetry " + quote(tok[4]) + " is not supported; use 'general' or 'symmetric'");
  }
  if (symmetry != "symmetric" && symmetry != "general") return refuse("unknown symmetry " + quote(tok[4]));
  MmBanner b;
  b.integer_field = field == "integer";
  b.symmetric = symmetry == "symmetric";
  return b;
}

// A '% spinwright form|offset' directive (tok[0] is "spinwright"; count tokens in all).
inline IoStatus scan_mm_directive(const std::string_view* tok, std::size_t count, std::uint64_t line,
                                  const MmBanner& banner, std::string_view name, TermList& list) {
  auto error = [&](const std::string& why) { return IoStatus::error(StatusCode::parse_error, name, line, why); };
  if (count < 3)
    return error("incomplete directive: expected '% spinwright form ising|qubo' or '% spinwright offset <value>'");
  if (count > 3) return error("trailing text after the directive: " + quote(tok[3]));
  if (tok[1] == "form") {
    if (list.form_line != 0) {
      return error("second 'spinwright form' directive (the first is on line " + std::to_string(list.form_line) + ")");
    }
    if (tok[2] == "ising") {
      list.form = Form::ising;
    } else if (tok[2] == "qubo") {
      list.form = Form::qubo;
    } else {
      return error("unknown form " + quote(tok[2]) + "; expected 'ising' or 'qubo'");
    }
    list.form_line = line;
    return IoStatus{};
  }
  if (tok[1] != "offset") return error("unknown directive " + quote(tok[1]) + "; expected 'form' or 'offset'");
  if (list.has_offset) {
    return error("second 'spinwright offset' directive (the first is on line " + std::to_string(list.offset_line) +
                 ")");
  }
  StatusCode code = StatusCode::ok;
  const std::string why = parse_number(tok[2], list.offset, code);
  if (!why.empty()) return IoStatus::error(code, name, line, "offset: " + why);
  if (banner.integer_field && !list.offset.integer)
    return error("real offset " + quote(tok[2]) + " in an 'integer' file");
  list.has_offset = true;
  list.offset_token = tok[2];
  list.offset_line = line;
  return IoStatus{};
}

// The size line 'rows columns entries': a square matrix within options.max_spins.
inline IoStatus scan_mm_size(const std::string_view* tok, std::size_t count, std::uint64_t line, std::string_view name,
                             const ReadOptions& options, TermList& list, std::uint64_t& declared) {
  if (count < 3) {
    return IoStatus::error(StatusCode::parse_error, name, line,
                           "size line must be 'rows columns entries', found " + std::to_string(count) +
                               (count == 1 ? " field" : " fields"));
  }
  if (count > 3)
    return IoStatus::error(StatusCode::parse_error, name, line, "trailing text after the size line: " + quote(tok[3]));
  StatusCode code = StatusCode::ok;
  std::uint64_t rows = 0;
  std::uint64_t cols = 0;
  std::string why = parse_count(tok[0], rows, code, "number of rows");
  if (why.empty()) why = parse_count(tok[1], cols, code, "number of columns");
  if (why.empty()) why = parse_count(tok[2], declared, code, "number of entries");
  if (!why.empty()) return IoStatus::error(code, name, line, "size line: " + why);
  if (rows != cols) {
    return IoStatus::error(
        StatusCode::unsupported, name, line,
        "the matrix is " + std::to_string(rows) + " x " + std::to_string(cols) + "; a model needs a square matrix");
  }
  if (rows > options.max_spins) {
    return IoStatus::error(StatusCode::size_limit, name, line,
                           "size line declares " + std::to_string(rows) + " variables, more than the limit of " +
                               std::to_string(options.max_spins) + " (ReadOptions::max_spins)");
  }
  list.num_spins = rows;
  list.header_line = line;
  return IoStatus{};
}

// One entry 'i j value' (1-based), appended to the list.
inline IoStatus scan_mm_entry(const std::string_view* tok, std::size_t count, std::uint64_t line,
                              const MmBanner& banner, std::string_view name, TermList& list) {
  if (count < 3) {
    return IoStatus::error(
        StatusCode::parse_error, name, line,
        "expected 'i j value', found " + std::to_string(count) + (count == 1 ? " field" : " fields"));
  }
  if (count > 3)
    return IoStatus::error(StatusCode::parse_error, name, line, "trailing text after the value: " + quote(tok[3]));
  StatusCode code = StatusCode::ok;
  std::uint64_t ends[2] = {0, 0};
  for (int e = 0; e < 2; ++e) {
    const char* what = e == 0 ? "row" : "column";
    const std::string why = parse_count(tok[e], ends[e], code, e == 0 ? "row index" : "column index");
    if (!why.empty()) return IoStatus::error(code, name, line, why);
    if (ends[e] == 0) {
      return IoStatus::error(StatusCode::index_out_of_range, name, line,
                             std::string(what) + " index 0: Matrix Market indices start at 1");
    }
    if (ends[e] > list.num_spins) {
      return IoStatus::error(StatusCode::index_out_of_range, name, line,
                             std::string(what) + " index " + std::to_string(ends[e]) + " is beyond the size " +
                                 std::to_string(list.num_spins) + " declared on line " +
                                 std::to_string(list.header_line));
    }
  }
  RawTerm t;
  Number value;
  if (!read_short_integer(tok[2], value)) {
    const std::string why = parse_number(tok[2], value, code);
    if (!why.empty()) return IoStatus::error(code, name, line, "value: " + why);
  }
  if (banner.integer_field && !value.integer) {
    return IoStatus::error(StatusCode::parse_error, name, line,
                           "real value " + quote(tok[2]) + " in an 'integer' file");
  }
  t.i = ends[0] - 1;
  t.j = ends[1] - 1;
  t.set_value(value);
  t.set_token(tok[2]);
  t.line = line;
  t.set_mirrored(banner.symmetric && t.i != t.j);
  list.terms.push_back(t);
  return IoStatus{};
}

/// Scans a Matrix Market coordinate file into a term list: the banner, then comments and
/// '% spinwright' directives, the size line, and the entries.
inline IoResult<TermList> scan_matrix_market(std::string_view text, std::string_view name, const ReadOptions& options) {
  LineReader reader(text);
  Line line;
  TermList list;
  list.form = Form::qubo;
  list.diagonal_is_linear = true;
  if (!reader.next(line)) {
    return IoStatus::error(StatusCode::parse_error, name, 1, "empty file: expected a '%%MatrixMarket' banner");
  }
  const auto banner = scan_mm_banner(line.text, name);
  if (!banner.ok()) return banner.status();
  bool have_size = false;
  std::uint64_t declared = 0;
  std::string_view tok[4];
  while (reader.next(line)) {
    const std::string_view s = trim(line.text);
    if (s.empty()) continue;
    if (starts_with_banner(s)) {
      return IoStatus::error(StatusCode::parse_error, name, line.number,
                             "second Matrix Market banner (the first is on line 1)");
    }
    IoStatus st;
    if (s.front() == '%') {
      const std::size_t count = split_tokens(trim(s.substr(1)), tok, 4);
      if (count == 0 || tok[0] != "spinwright") continue;  // an ordinary comment
      if (have_size) {
        return IoStatus::error(
            StatusCode::parse_error, name, line.number,
            "'% spinwright' directives must come before the size line (line " + std::to_string(list.header_line) + ")");
      }
      st = scan_mm_directive(tok, count, line.number, banner.value(), name, list);
    } else if (!have_size) {
      st = scan_mm_size(tok, split_tokens(s, tok, 4), line.number, name, options, list, declared);
      have_size = st.ok();
      if (have_size) list.terms.reserve(bounded_reserve(declared, reader.remaining_bytes()));
    } else if (list.terms.size() >= declared) {
      return IoStatus::error(StatusCode::parse_error, name, line.number,
                             "extra line: the size line (line " + std::to_string(list.header_line) + ") declares " +
                                 std::to_string(declared) + " entries");
    } else {
      st = scan_mm_entry(tok, split_tokens(s, tok, 4), line.number, banner.value(), name, list);
    }
    if (!st.ok()) return st;
  }
  if (!have_size) {
    return IoStatus::error(StatusCode::parse_error, name, reader.last_line() + 1,
                           "no size line: expected 'rows columns entries' after the banner and comments");
  }
  if (list.terms.size() < declared) {
    return IoStatus::error(StatusCode::parse_error, name, reader.last_line() + 1,
                           "file ends after " + std::to_string(list.terms.size()) + " of the " +
                               std::to_string(declared) + " entries declared on line " +
                               std::to_string(list.header_line) + " (truncated file?)");
  }
  list.all_integer = banner.value().integer_field;  // automatic value type: the banner's field decides
  return list;
}

}  // namespace detail

/// Parses a Matrix Market model held in memory into `Model` (IsingModel<V, I> or
/// QuboModel<V, I>); `name` is used in messages. The file's form must match the model's form
/// (unsupported otherwise, at the line of the form directive or line 1 when the form is the
/// QUBO default). The fuzzing entry point.
template <class Model>
IoResult<Model> parse_matrix_market(std::string_view text, std::string_view name, const ReadOptions& options = {}) {
  auto scanned = detail::scan_matrix_market(text, name, options);
  if (!scanned.ok()) return scanned.status();
  const detail::TermList& list = scanned.value();
  if (list.form != Model::form) {
    const bool file_ising = list.form == Form::ising;
    return IoStatus::error(StatusCode::unsupported, name, list.form_line == 0 ? 1 : list.form_line,
                           std::string("the file holds ") + (file_ising ? "an Ising" : "a QUBO") + " model" +
                               (list.form_line == 0 ? " (the default when no '% spinwright form' line is given)" : "") +
                               " but " + (file_ising ? "a QUBO" : "an Ising") +
                               " model was requested; read it as its own form and convert (model/convert.hpp)");
  }
  return detail::build_terms<Model::form, typename Model::value_type, typename Model::index_type>(list, name);
}

/// Reads a Matrix Market file (see parse_matrix_market).
template <class Model>
IoResult<Model> read_matrix_market(const std::string& path, const ReadOptions& options = {}) {
  auto text = read_file_text(path, options);
  if (!text.ok()) return text.status();
  return parse_matrix_market<Model>(text.value(), path, options);
}

/// Writes a model as Matrix Market: banner ('integer' for integer value types, 'real'
/// otherwise, always 'general'), the form and offset directives, the size line, then the
/// non-zero diagonal (fields or unary terms) and the pairs i < j, 1-based, in row order.
/// Values are exact (integers in decimal, reals as the shortest text that reads back to the
/// same double). Never fails for a valid model; returns IoResult for symmetry with the readers.
template <Form F, class Value, class Index>
IoResult<std::string> format_matrix_market(const SparseModel<F, Value, Index>& m) {
  const std::size_t n = m.num_spins();
  std::size_t nnz = m.num_pairs();
  for (std::size_t i = 0; i < n; ++i) {
    if (m.site_term(static_cast<Index>(i)) != Value{0}) ++nnz;
  }
  std::string out;
  out.reserve(128 + nnz * 20);
  out += "%%MatrixMarket matrix coordinate ";
  out += std::is_integral_v<Value> ? "integer" : "real";
  out += " general\n% spinwright form ";
  out += F == Form::ising ? "ising" : "qubo";
  out += "\n% spinwright offset ";
  detail::append_value(out, m.offset());
  out += '\n';
  detail::append_u64(out, n);
  out += ' ';
  detail::append_u64(out, n);
  out += ' ';
  detail::append_u64(out, nnz);
  out += '\n';
  for (std::size_t i = 0; i < n; ++i) {
    const auto ii = static_cast<Index>(i);
    const Value lin = m.site_term(ii);
    if (lin != Value{0}) {
      detail::append_u64(out, i + 1);
      out += ' ';
      detail::append_u64(out, i + 1);
      out += ' ';
      detail::append_value(out, lin);
      out += '\n';
    }
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

/// Writes a Matrix Market file (see format_matrix_market); errors name `path` (line 0).
template <Form F, class Value, class Index>
IoStatus write_matrix_market(const std::string& path, const SparseModel<F, Value, Index>& m) {
  auto text = format_matrix_market(m);
  if (!text.ok()) return text.status();
  return write_file_text(path, text.value());
}

}  // namespace spinwright::io

#endif  // SPINWRIGHT_IO_MATRIX_MARKET_HPP
