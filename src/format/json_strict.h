// Strict JSON reading helpers for our versioned input files (session files first).
//
// Contract: every failure throws sp::Error(data_error) whose message is
//   "<source>: <JSON path>: expected <what>, got <what was there>"
// Types only: ranges and text content are format/validate.h's, the one validator.
// with the JSON path in the "$.a.b[2].c" form. Syntax errors carry "line L, column C" (1-based,
// columns counted in bytes of the line; the column is where the parser stopped, i.e. the end of
// an offending string or number token) instead of a path. Pure: strings in, values out.
#pragma once
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace sp::format {

// 1-based line and column of byte offset `byte` in `text` (offsets past the end clamp to it).
struct TextPosition {
  std::size_t line = 1;
  std::size_t column = 1;
};
TextPosition text_position(std::string_view text, std::size_t byte);

// Parses `text` as one JSON document. Rejects invalid JSON (with line and column), numbers
// too large for a double, nesting deeper than 64 levels, and an object that repeats a key
// (nlohmann would silently keep the last one, which hides a mis-keyed file).
nlohmann::json parse_json_strict(std::string_view text, const std::string& source);

// The candidate closest to `word` by edit distance when it is a likely typo, else "".
std::string closest_name(const std::string& word, const std::vector<std::string>& candidates);

// A short, printable rendering of a JSON value for "got ..." parts of messages.
std::string describe_json(const nlohmann::json& value);

// Reads one JSON object at `path` (e.g. "$.passes[2]"). Every accessor throws as above.
class ObjectReader {
 public:
  ObjectReader(const nlohmann::json& value, std::string path, const std::string& source);

  // Rejects any key not in `allowed`, suggesting the nearest valid one.
  void allow_only(const std::vector<std::string>& allowed) const;
  bool has(const std::string& key) const;
  // The child value; throws "missing required field" when absent.
  const nlohmann::json& required(const std::string& key) const;
  // The child value, or nullptr when absent.
  const nlohmann::json* optional(const std::string& key) const;
  // JSON path of a child key.
  std::string path_of(const std::string& key) const;
  const std::string& path() const { return path_; }
  const std::string& source() const { return source_; }

  // A string (its content is judged by format/validate.h, not here).
  std::string string(const std::string& key) const;
  std::optional<std::string> optional_string(const std::string& key) const;
  // A number (finite: JSON has no others); its range is judged by format/validate.h.
  double number(const std::string& key) const;
  std::optional<double> optional_number(const std::string& key) const;
  std::optional<long long> optional_integer(const std::string& key, long long lo) const;
  std::optional<bool> optional_bool(const std::string& key) const;

  // Throws "<source>: <path of key>: <message>".
  [[noreturn]] void fail(const std::string& key, const std::string& message) const;

 private:
  const nlohmann::json& value_;
  std::string path_;
  const std::string& source_;
};

// Throws "<source>: <path>: <message>" as sp::Error(data_error).
[[noreturn]] void fail_at(const std::string& source, const std::string& path,
                          const std::string& message);

// Formats a number for messages without trailing zeros ("200000", "0.5", "30.48").
std::string number_text(double v);

}  // namespace sp::format
