// spinwright command-line program — JSON writer.
#include "json.hpp"

#include <cmath>    // std::isfinite, std::floor, std::fabs
#include <cstdio>   // std::snprintf
#include <cstdlib>  // std::strtod

namespace spinwright_cli {

std::string json_escape(const std::string& s) {
  std::string out;
  out.reserve(s.size() + 2);
  out += '"';
  for (const char ch : s) {
    const auto c = static_cast<unsigned char>(ch);
    switch (c) {
      case '"':
        out += "\\\"";
        break;
      case '\\':
        out += "\\\\";
        break;
      case '\b':
        out += "\\b";
        break;
      case '\f':
        out += "\\f";
        break;
      case '\n':
        out += "\\n";
        break;
      case '\r':
        out += "\\r";
        break;
      case '\t':
        out += "\\t";
        break;
      default:
        if (c < 0x20) {
          char buf[8];
          std::snprintf(buf, sizeof buf, "\\u%04x", static_cast<unsigned>(c));
          out += buf;
        } else {
          out += ch;
        }
    }
  }
  out += '"';
  return out;
}

std::string format_double(double v) {
  if (!std::isfinite(v)) return "null";
  // Integers in plain digits (exact below 2^53); otherwise the shortest form that reads back
  // to the same double (at most 17 significant digits).
  char buf[40];
  if (v == std::floor(v) && std::fabs(v) < 0x1.0p53) {
    std::snprintf(buf, sizeof buf, "%.0f", v);
    return buf;
  }
  for (int precision = 1; precision <= 17; ++precision) {
    std::snprintf(buf, sizeof buf, "%.*g", precision, v);
    if (std::strtod(buf, nullptr) == v) break;
  }
  return buf;
}

void JsonWriter::before_value() {
  if (after_key_) {
    after_key_ = false;
    return;
  }
  if (stack_.empty()) return;
  Level& top = stack_.back();
  if (!top.empty) out_ += (top.object && !top.compact) ? ",\n" : ", ";
  top.empty = false;
}

JsonWriter& JsonWriter::begin_object() {
  const bool compact = !stack_.empty() && (!stack_.back().object || stack_.back().compact);
  before_value();
  out_ += "{";
  stack_.push_back({true, true, compact});
  return *this;
}

JsonWriter& JsonWriter::end_object() {
  const bool empty = stack_.back().empty;
  const bool compact = stack_.back().compact;
  stack_.pop_back();
  if (!empty && !compact) {
    out_ += "\n";
    out_.append(2 * stack_.size(), ' ');
  }
  out_ += "}";
  if (stack_.empty()) out_ += "\n";
  return *this;
}

JsonWriter& JsonWriter::begin_array() {
  before_value();
  out_ += "[";
  stack_.push_back({false, true, true});
  return *this;
}

JsonWriter& JsonWriter::end_array() {
  stack_.pop_back();
  out_ += "]";
  return *this;
}

JsonWriter& JsonWriter::key(const std::string& name) {
  Level& top = stack_.back();
  if (top.compact) {
    if (!top.empty) out_ += ", ";
  } else {
    out_ += top.empty ? "\n" : ",\n";
    out_.append(2 * stack_.size(), ' ');
  }
  top.empty = false;
  out_ += json_escape(name);
  out_ += ": ";
  after_key_ = true;
  return *this;
}

JsonWriter& JsonWriter::value(std::int64_t v) {
  before_value();
  out_ += std::to_string(v);
  return *this;
}

JsonWriter& JsonWriter::value(std::uint64_t v) {
  before_value();
  out_ += std::to_string(v);
  return *this;
}

JsonWriter& JsonWriter::value(double v) {
  before_value();
  out_ += format_double(v);
  return *this;
}

JsonWriter& JsonWriter::value(bool v) {
  before_value();
  out_ += v ? "true" : "false";
  return *this;
}

JsonWriter& JsonWriter::value(const std::string& v) {
  before_value();
  out_ += json_escape(v);
  return *this;
}

JsonWriter& JsonWriter::null() {
  before_value();
  out_ += "null";
  return *this;
}

}  // namespace spinwright_cli
