// spinwright command-line program — text report helpers: aligned label/value lines, tables,
// number formatting, and writing a finished report in one piece.
#ifndef SPINWRIGHT_CLI_TEXT_HPP
#define SPINWRIGHT_CLI_TEXT_HPP

#include "args.hpp"

#include <cstddef>  // std::size_t
#include <cstdint>  // std::int8_t
#include <string>   // std::string
#include <utility>  // std::pair
#include <vector>   // std::vector

namespace spinwright_cli {

// "label   value" lines with the values aligned in one column.
class TextReport {
 public:
  void line(const std::string& label, const std::string& value) { rows_.emplace_back(label, value); }
  std::string str() const;

 private:
  std::vector<std::pair<std::string, std::string>> rows_;
};

// Columns aligned; numbers (cells starting with a digit, a sign or "inf") right-aligned.
class TextTable {
 public:
  explicit TextTable(std::vector<std::string> header) : header_(std::move(header)) {}
  void row(std::vector<std::string> cells) { rows_.push_back(std::move(cells)); }
  std::string str() const;

 private:
  std::vector<std::string> header_;
  std::vector<std::vector<std::string>> rows_;
};

// The text report leaves out the spins line of a model with more spins than this (JSON and
// --state-out keep the state).
inline constexpr std::size_t max_text_spins = 100;

std::string number_text(double v);  // shortest exact form: %.17g trimmed to what reads back equal
// An energy for people: the shortest form within the rounding of a floating model's arithmetic,
// 1e-12 of its energy range `scale` (exact for integers: number_text).
std::string energy_text(double v, double scale);
std::string seconds_text(double seconds);                                     // "0.0123 s", "12.3 s"
std::string probability_text(double p);                                       // "0.625"
std::string bytes_text(double bytes);                                         // "1.2 MiB"
std::string spins_text(const std::vector<std::int8_t>& spins, bool as_bits);  // "+-+..." or "010..."

// Writes a whole report to stdout at once; false when stdout cannot take it.
bool write_stdout(const std::string& text);
// "spinwright: message" and, for usage errors, "hint: ..." on stderr.
void print_failure(const Failure& f);

}  // namespace spinwright_cli

#endif  // SPINWRIGHT_CLI_TEXT_HPP
