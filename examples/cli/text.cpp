// spinwright command-line program — text report helpers.
#include "text.hpp"

#include <algorithm>  // std::max
#include <cmath>      // std::isfinite, std::fabs, std::floor
#include <cstdio>     // std::snprintf, std::fwrite, std::fflush, std::fputs
#include <cstdlib>    // std::strtod

namespace spinwright_cli {

std::string TextReport::str() const {
  std::size_t width = 0;
  for (const auto& r : rows_) width = std::max(width, r.first.size());
  std::string out;
  for (const auto& r : rows_) {
    out += r.first;
    out.append(width + 3 - r.first.size(), ' ');
    out += r.second;
    out += '\n';
  }
  return out;
}

namespace {
bool numeric_cell(const std::string& c) {
  if (c.empty()) return false;
  const char f = c[0];
  return (f >= '0' && f <= '9') || f == '-' || f == '+' || c.compare(0, 3, "inf") == 0;
}
}  // namespace

std::string TextTable::str() const {
  std::vector<std::size_t> width(header_.size(), 0);
  for (std::size_t k = 0; k < header_.size(); ++k) width[k] = header_[k].size();
  for (const auto& r : rows_) {
    for (std::size_t k = 0; k < r.size() && k < width.size(); ++k) width[k] = std::max(width[k], r[k].size());
  }
  std::vector<bool> right(header_.size(), true);
  for (const auto& r : rows_) {
    for (std::size_t k = 0; k < r.size() && k < right.size(); ++k) right[k] = right[k] && numeric_cell(r[k]);
  }
  auto emit = [&](const std::vector<std::string>& cells, std::string& out) {
    std::string line;
    for (std::size_t k = 0; k < width.size(); ++k) {
      const std::string c = k < cells.size() ? cells[k] : "";
      if (k > 0) line += "  ";
      const std::string pad(width[k] - c.size(), ' ');
      line += right[k] ? pad + c : c + pad;
    }
    while (!line.empty() && line.back() == ' ') line.pop_back();
    out += line + "\n";
  };
  std::string out;
  emit(header_, out);
  for (const auto& r : rows_) emit(r, out);
  return out;
}

std::string number_text(double v) {
  if (std::isnan(v)) return "nan";
  if (!std::isfinite(v)) return v > 0 ? "inf" : "-inf";
  char buf[40];
  if (v == std::floor(v) && std::fabs(v) < 0x1.0p53) {  // integers in plain digits
    std::snprintf(buf, sizeof buf, "%.0f", v);
    return buf;
  }
  for (int precision = 6; precision <= 17; ++precision) {
    std::snprintf(buf, sizeof buf, "%.*g", precision, v);
    if (std::strtod(buf, nullptr) == v) break;
  }
  return buf;
}

std::string energy_text(double v, double scale) {
  if (!std::isfinite(v) || v == std::floor(v)) return number_text(v);
  const double tol = 1e-12 * (scale > 1 ? scale : 1.0);
  char buf[40];
  for (int precision = 1; precision <= 17; ++precision) {
    std::snprintf(buf, sizeof buf, "%.*g", precision, v);
    if (std::fabs(std::strtod(buf, nullptr) - v) <= tol) return buf;
  }
  return number_text(v);
}

std::string seconds_text(double s) {
  char buf[40];
  if (!std::isfinite(s)) return "inf";
  if (s >= 100) {
    std::snprintf(buf, sizeof buf, "%.0f s", s);
  } else if (s >= 1) {
    std::snprintf(buf, sizeof buf, "%.2f s", s);
  } else if (s >= 0.001) {
    std::snprintf(buf, sizeof buf, "%.2f ms", s * 1e3);
  } else {
    std::snprintf(buf, sizeof buf, "%.1f us", s * 1e6);
  }
  return buf;
}

std::string probability_text(double p) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.3f", p);
  return buf;
}

std::string bytes_text(double bytes) {
  const char* units[] = {"B", "KiB", "MiB", "GiB", "TiB", "PiB"};
  int u = 0;
  while (bytes >= 1024 && u < 5) {
    bytes /= 1024;
    ++u;
  }
  char buf[40];
  if (u == 0) {
    std::snprintf(buf, sizeof buf, "%.0f %s", bytes, units[u]);
  } else {
    std::snprintf(buf, sizeof buf, "%.1f %s", bytes, units[u]);
  }
  return buf;
}

std::string spins_text(const std::vector<std::int8_t>& spins, bool as_bits) {
  std::string s;
  s.reserve(spins.size());
  for (const auto v : spins) s += as_bits ? (v < 0 ? '1' : '0') : (v < 0 ? '-' : '+');
  return s;
}

bool write_stdout(const std::string& text) {
  const std::size_t n = std::fwrite(text.data(), 1, text.size(), stdout);
  return std::fflush(stdout) == 0 && n == text.size();
}

void print_failure(const Failure& f) {
  std::string text;
  if (f.code == exit_usage) {
    text = "spinwright: " + f.message + "\n";
    if (!f.hint.empty()) text += "hint: " + f.hint + "\n";
  } else {
    text = f.message + "\n";
  }
  std::fputs(text.c_str(), stderr);
  std::fflush(stderr);
}

}  // namespace spinwright_cli
