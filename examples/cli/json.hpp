// spinwright command-line program — a small JSON writer for the report.
// Integers are written as integers; doubles with %.17g (they read back to the same double);
// NaN and infinities, which JSON cannot hold, become null. Strings are escaped per RFC 8259
// (quote, backslash and control characters; other bytes are copied as they are).
// Object members go one per line; arrays, and objects inside arrays, stay on one line.
#ifndef SPINWRIGHT_CLI_JSON_HPP
#define SPINWRIGHT_CLI_JSON_HPP

#include <cstdint>  // std::int64_t, std::uint64_t
#include <string>   // std::string
#include <vector>   // std::vector

namespace spinwright_cli {

class JsonWriter {
 public:
  JsonWriter& begin_object();
  JsonWriter& end_object();
  JsonWriter& begin_array();
  JsonWriter& end_array();
  JsonWriter& key(const std::string& name);

  JsonWriter& value(std::int64_t v);
  JsonWriter& value(std::uint64_t v);
  JsonWriter& value(int v) { return value(static_cast<std::int64_t>(v)); }
  JsonWriter& value(unsigned v) { return value(static_cast<std::uint64_t>(v)); }
  JsonWriter& value(double v);
  JsonWriter& value(bool v);
  JsonWriter& value(const std::string& v);
  JsonWriter& value(const char* v) { return value(std::string(v)); }
  JsonWriter& null();

  template <class T>
  JsonWriter& member(const std::string& name, const T& v) {
    key(name);
    return value(v);
  }

  // The document so far (complete once every object and array is closed).
  const std::string& str() const noexcept { return out_; }

 private:
  struct Level {
    bool object;
    bool empty;
    bool compact;  // inside an array: members on one line
  };
  void before_value();
  std::string out_;
  std::vector<Level> stack_;
  bool after_key_ = false;
};

std::string json_escape(const std::string& s);
std::string format_double(double v);  // %.17g, or "null" when not finite

}  // namespace spinwright_cli

#endif  // SPINWRIGHT_CLI_JSON_HPP
