// Test support for tests/cli: a strict little JSON reader (RFC 8259 subset large enough for the
// CLI report: objects, arrays, strings with the standard escapes, numbers, true/false/null).
// parse() fails on trailing text, so it also proves stdout held exactly one JSON document.
#ifndef SPINWRIGHT_TESTS_SUPPORT_CLI_JSON_HPP
#define SPINWRIGHT_TESTS_SUPPORT_CLI_JSON_HPP

#include <cstddef>  // std::size_t
#include <cstdlib>  // std::strtod
#include <map>      // std::map
#include <memory>   // std::shared_ptr
#include <string>   // std::string
#include <vector>   // std::vector

namespace cli_test {

struct Json {
  enum class Kind { null, boolean, number, string, array, object } kind = Kind::null;
  bool b = false;
  double num = 0;
  std::string text;  // string value, or the number's literal
  std::vector<Json> items;
  std::map<std::string, Json> members;

  bool has(const std::string& k) const { return kind == Kind::object && members.count(k) != 0; }
  const Json& operator[](const std::string& k) const {
    static const Json missing;
    const auto it = members.find(k);
    return it == members.end() ? missing : it->second;
  }
  bool is_integer_literal() const { return kind == Kind::number && text.find_first_of(".eE") == std::string::npos; }
};

class JsonParser {
 public:
  explicit JsonParser(const std::string& s) : s_(s) {}

  bool parse(Json& out) {
    skip();
    if (!value(out)) return false;
    skip();
    return pos_ == s_.size();
  }

 private:
  void skip() {
    while (pos_ < s_.size() && (s_[pos_] == ' ' || s_[pos_] == '\n' || s_[pos_] == '\t' || s_[pos_] == '\r')) ++pos_;
  }
  bool literal(const char* word) {
    const std::string w = word;
    if (s_.compare(pos_, w.size(), w) != 0) return false;
    pos_ += w.size();
    return true;
  }
  bool string(std::string& out) {
    if (pos_ >= s_.size() || s_[pos_] != '"') return false;
    ++pos_;
    while (pos_ < s_.size() && s_[pos_] != '"') {
      char c = s_[pos_++];
      if (static_cast<unsigned char>(c) < 0x20) return false;
      if (c == '\\') {
        if (pos_ >= s_.size()) return false;
        const char e = s_[pos_++];
        switch (e) {
          case '"':
            c = '"';
            break;
          case '\\':
            c = '\\';
            break;
          case '/':
            c = '/';
            break;
          case 'b':
            c = '\b';
            break;
          case 'f':
            c = '\f';
            break;
          case 'n':
            c = '\n';
            break;
          case 'r':
            c = '\r';
            break;
          case 't':
            c = '\t';
            break;
          case 'u': {
            if (pos_ + 4 > s_.size()) return false;
            c = static_cast<char>(std::stoi(s_.substr(pos_, 4), nullptr, 16));
            pos_ += 4;
            break;
          }
          default:
            return false;
        }
      }
      out += c;
    }
    if (pos_ >= s_.size()) return false;
    ++pos_;
    return true;
  }
  bool number(Json& out) {
    const std::size_t start = pos_;
    if (pos_ < s_.size() && s_[pos_] == '-') ++pos_;
    if (pos_ >= s_.size() || s_[pos_] < '0' || s_[pos_] > '9') return false;
    while (pos_ < s_.size() && ((s_[pos_] >= '0' && s_[pos_] <= '9') || s_[pos_] == '.' || s_[pos_] == 'e' ||
                                s_[pos_] == 'E' || s_[pos_] == '+' || s_[pos_] == '-')) {
      ++pos_;
    }
    out.kind = Json::Kind::number;
    out.text = s_.substr(start, pos_ - start);
    char* end = nullptr;
    out.num = std::strtod(out.text.c_str(), &end);
    return end == out.text.c_str() + out.text.size();
  }
  bool value(Json& out) {
    skip();
    if (pos_ >= s_.size()) return false;
    const char c = s_[pos_];
    if (c == '{') {
      ++pos_;
      out.kind = Json::Kind::object;
      skip();
      if (pos_ < s_.size() && s_[pos_] == '}') {
        ++pos_;
        return true;
      }
      for (;;) {
        skip();
        std::string k;
        if (!string(k)) return false;
        skip();
        if (pos_ >= s_.size() || s_[pos_] != ':') return false;
        ++pos_;
        Json v;
        if (!value(v)) return false;
        if (out.members.count(k) != 0) return false;  // duplicate keys are a writer bug
        out.members[k] = v;
        skip();
        if (pos_ < s_.size() && s_[pos_] == ',') {
          ++pos_;
          continue;
        }
        if (pos_ < s_.size() && s_[pos_] == '}') {
          ++pos_;
          return true;
        }
        return false;
      }
    }
    if (c == '[') {
      ++pos_;
      out.kind = Json::Kind::array;
      skip();
      if (pos_ < s_.size() && s_[pos_] == ']') {
        ++pos_;
        return true;
      }
      for (;;) {
        Json v;
        if (!value(v)) return false;
        out.items.push_back(v);
        skip();
        if (pos_ < s_.size() && s_[pos_] == ',') {
          ++pos_;
          continue;
        }
        if (pos_ < s_.size() && s_[pos_] == ']') {
          ++pos_;
          return true;
        }
        return false;
      }
    }
    if (c == '"') {
      out.kind = Json::Kind::string;
      return string(out.text);
    }
    if (literal("true")) {
      out.kind = Json::Kind::boolean;
      out.b = true;
      return true;
    }
    if (literal("false")) {
      out.kind = Json::Kind::boolean;
      return true;
    }
    if (literal("null")) {
      out.kind = Json::Kind::null;
      return true;
    }
    return number(out);
  }

  const std::string& s_;
  std::size_t pos_ = 0;
};

inline bool parse_json(const std::string& text, Json& out) { return JsonParser(text).parse(out); }

}  // namespace cli_test

#endif  // SPINWRIGHT_TESTS_SUPPORT_CLI_JSON_HPP
