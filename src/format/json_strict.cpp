#include "format/json_strict.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <set>

#include "core/error.h"
#include "core/typo.h"
#include "format/validate.h"

namespace sp::format {

using nlohmann::json;

void fail_at(const std::string& source, const std::string& path, const std::string& message) {
  throw data_error(source + ": " + path + ": " + message);
}

std::string number_text(double v) {
  if (v == 0) return "0";
  char buf[64];
  // %.10g: enough digits for any limit or reading we print, never an exponent for them.
  std::snprintf(buf, sizeof buf, "%.10g", v);
  return buf;
}

TextPosition text_position(std::string_view text, std::size_t byte) {
  TextPosition p;
  const std::size_t end = std::min(byte, text.size());
  for (std::size_t i = 0; i < end; ++i) {
    if (text[i] == '\n') {
      ++p.line;
      p.column = 1;
    } else {
      ++p.column;
    }
  }
  return p;
}

namespace {

// Our documents nest four levels; 64 leaves room for any future version and stops a hostile
// file from building a huge, deep tree.
constexpr std::size_t kMaxDepth = 64;

// Tracks where the parser is, so a repeated key can be reported with its JSON path.
struct Frame {
  bool is_array = false;
  std::size_t next_index = 0;
  std::string child;  // ".key" or "[i]" of the child being read
  std::set<std::string> keys;
};

std::string path_through(const std::vector<Frame>& frames, std::size_t count) {
  std::string p = "$";
  for (std::size_t i = 0; i < count && i < frames.size(); ++i) p += frames[i].child;
  return p;
}

// nlohmann's messages start with "[json.exception.parse_error.101] parse error at line 1,
// column 2: "; keep only the explanation after the last ": " prefix of that form.
std::string explanation(const std::string& what) {
  std::string s = what;
  if (auto b = s.find("] "); b != std::string::npos) s = s.substr(b + 2);
  if (s.rfind("parse error", 0) == 0) {
    if (auto c = s.find(": "); c != std::string::npos) s = s.substr(c + 2);
  }
  return s;
}

}  // namespace

json parse_json_strict(std::string_view text, const std::string& source) {
  std::vector<Frame> frames;
  auto on_event = [&](int /*depth*/, json::parse_event_t event, json& parsed) -> bool {
    auto begin_child = [&] {
      if (!frames.empty() && frames.back().is_array) {
        frames.back().child = "[" + std::to_string(frames.back().next_index++) + "]";
      }
    };
    switch (event) {
      case json::parse_event_t::object_start:
      case json::parse_event_t::array_start:
        begin_child();
        if (frames.size() >= kMaxDepth) {
          fail_at(source, path_through(frames, frames.size()),
                  "expected at most " + std::to_string(kMaxDepth) +
                      " levels of nested objects and arrays");
        }
        frames.push_back(Frame{event == json::parse_event_t::array_start, 0, {}, {}});
        break;
      case json::parse_event_t::object_end:
      case json::parse_event_t::array_end:
        if (!frames.empty()) frames.pop_back();
        break;
      case json::parse_event_t::key: {
        const std::string key = parsed.get<std::string>();
        Frame& f = frames.back();
        f.child = "." + key;
        if (!f.keys.insert(key).second) {
          fail_at(source, path_through(frames, frames.size()),
                  "key '" + key + "' appears twice in the same object; give it once");
        }
        break;
      }
      case json::parse_event_t::value:
        begin_child();
        break;
    }
    return true;
  };
  try {
    return json::parse(text.begin(), text.end(), on_event, /*allow_exceptions=*/true,
                       /*ignore_comments=*/false);
  } catch (const json::parse_error& e) {
    // e.byte is the 1-based index of the last character read: the offending character, or
    // the end of the offending token (a string or number is read whole before it is judged).
    const TextPosition p = text_position(text, e.byte > 0 ? e.byte - 1 : 0);
    throw data_error(source + ": line " + std::to_string(p.line) + ", column " +
                     std::to_string(p.column) + ": invalid JSON: " + explanation(e.what()));
  } catch (const json::out_of_range& e) {
    throw data_error(source + ": invalid JSON: " + explanation(e.what()) +
                     " (expected a number a double can hold)");
  }
}

std::string closest_name(const std::string& word, const std::vector<std::string>& candidates) {
  return likely_typo(word, candidates);
}

std::string describe_json(const json& v) {
  switch (v.type()) {
    case json::value_t::null: return "null";
    case json::value_t::boolean: return v.get<bool>() ? "true" : "false";
    case json::value_t::object: return "an object";
    case json::value_t::array: return "an array";
    case json::value_t::string:
      return validate::quoted(v.get_ref<const std::string&>());
    case json::value_t::number_integer:
    case json::value_t::number_unsigned:
    case json::value_t::number_float: return number_text(v.get<double>());
    default: return v.dump();
  }
}

ObjectReader::ObjectReader(const json& value, std::string path, const std::string& source)
    : value_(value), path_(std::move(path)), source_(source) {
  if (!value_.is_object()) fail_at(source_, path_, "expected an object, got " + describe_json(value_));
}

void ObjectReader::fail(const std::string& key, const std::string& message) const {
  fail_at(source_, path_of(key), message);
}

std::string ObjectReader::path_of(const std::string& key) const { return path_ + "." + key; }

void ObjectReader::allow_only(const std::vector<std::string>& allowed) const {
  for (const auto& item : value_.items()) {
    if (std::find(allowed.begin(), allowed.end(), item.key()) != allowed.end()) continue;
    std::string msg = "unknown key '" + item.key() + "'";
    if (auto near = closest_name(item.key(), allowed); !near.empty()) {
      msg += "; did you mean '" + near + "'?";
    } else {
      msg += "; expected one of:";
      for (std::size_t i = 0; i < allowed.size(); ++i) msg += (i ? ", " : " ") + allowed[i];
    }
    fail(item.key(), msg);
  }
}

bool ObjectReader::has(const std::string& key) const { return value_.contains(key); }

const json* ObjectReader::optional(const std::string& key) const {
  auto it = value_.find(key);
  return it == value_.end() ? nullptr : &*it;
}

const json& ObjectReader::required(const std::string& key) const {
  const json* v = optional(key);
  if (v == nullptr) fail_at(source_, path_, "missing required field '" + key + "'");
  return *v;
}

std::string ObjectReader::string(const std::string& key) const {
  const json& v = required(key);
  if (!v.is_string()) fail(key, "expected a string, got " + describe_json(v));
  return v.get<std::string>();
}

std::optional<std::string> ObjectReader::optional_string(const std::string& key) const {
  if (!has(key)) return std::nullopt;
  return string(key);
}

double ObjectReader::number(const std::string& key) const {
  const json& v = required(key);
  if (!v.is_number()) fail(key, "expected a number, got " + describe_json(v));
  return v.get<double>();
}

std::optional<double> ObjectReader::optional_number(const std::string& key) const {
  if (!has(key)) return std::nullopt;
  return number(key);
}

std::optional<long long> ObjectReader::optional_integer(const std::string& key,
                                                        long long lo) const {
  const json* v = optional(key);
  if (v == nullptr) return std::nullopt;
  if (!v->is_number_integer() || (v->is_number_unsigned() && v->get<unsigned long long>() >
                                                                 9007199254740992ULL)) {
    fail(key, "expected a whole number >= " + std::to_string(lo) + ", got " + describe_json(*v));
  }
  const auto n = v->get<long long>();
  if (n < lo) fail(key, "expected a whole number >= " + std::to_string(lo) + ", got " +
                            std::to_string(n));
  return n;
}

std::optional<bool> ObjectReader::optional_bool(const std::string& key) const {
  const json* v = optional(key);
  if (v == nullptr) return std::nullopt;
  if (!v->is_boolean()) fail(key, "expected true or false, got " + describe_json(*v));
  return v->get<bool>();
}

}  // namespace sp::format
