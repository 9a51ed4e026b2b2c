#include "report/pdf_extract.h"


namespace sp::report {
namespace {

bool is_space(char c) {
  return c == ' ' || c == '\n' || c == '\r' || c == '\t' || c == '\f' || c == '\0';
}
bool is_digit(char c) { return c >= '0' && c <= '9'; }

void skip_space(std::string_view s, std::size_t& i) {
  while (i < s.size() && is_space(s[i])) ++i;
}

// Reads a non-negative decimal integer (at most 12 digits) at i.
std::optional<std::size_t> read_uint(std::string_view s, std::size_t& i) {
  skip_space(s, i);
  std::size_t start = i, v = 0;
  while (i < s.size() && is_digit(s[i]) && i - start < 12) v = v * 10 + static_cast<std::size_t>(s[i++] - '0');
  if (i == start || (i < s.size() && is_digit(s[i]))) return std::nullopt;
  return v;
}

bool read_word(std::string_view s, std::size_t& i, std::string_view word) {
  skip_space(s, i);
  if (s.substr(i, word.size()) != word) return false;
  i += word.size();
  return true;
}

// Reads "n g R" at i; returns n.
std::optional<std::size_t> read_ref(std::string_view s, std::size_t& i) {
  auto n = read_uint(s, i);
  if (!n || !read_uint(s, i) || !read_word(s, i, "R")) return std::nullopt;
  return n;
}

// Position just after "n 0 obj" for object n (first definition at a line start), or npos.
std::size_t find_object(std::string_view pdf, std::size_t n) {
  std::string head = std::to_string(n) + " 0 obj";
  std::size_t pos = 0, found = std::string_view::npos;
  while ((pos = pdf.find(head, pos)) != std::string_view::npos) {
    bool line_start = pos == 0 || pdf[pos - 1] == '\n' || pdf[pos - 1] == '\r';
    if (line_start) {
      if (found != std::string_view::npos) return std::string_view::npos;  // redefined: refuse
      found = pos + head.size();
    }
    pos += head.size();
  }
  return found;
}

// End of the dictionary that starts at `open` ("<<"), tracking nesting; npos if unbalanced.
std::size_t dict_end(std::string_view s, std::size_t open) {
  int depth = 0;
  for (std::size_t i = open; i + 1 < s.size(); ++i) {
    if (s[i] == '<' && s[i + 1] == '<') {
      ++depth;
      ++i;
    } else if (s[i] == '>' && s[i + 1] == '>') {
      if (--depth == 0) return i + 2;
      ++i;
    }
  }
  return std::string_view::npos;
}

std::optional<std::string> stream_of_object(std::string_view pdf, std::size_t n) {
  std::size_t i = find_object(pdf, n);
  if (i == std::string_view::npos) return std::nullopt;
  skip_space(pdf, i);
  if (pdf.substr(i, 2) != "<<") return std::nullopt;
  std::size_t end = dict_end(pdf, i);
  if (end == std::string_view::npos) return std::nullopt;
  std::string_view dict = pdf.substr(i, end - i);
  if (dict.find("/Filter") != std::string_view::npos) return std::nullopt;  // we write none
  std::size_t k = dict.find("/Length");
  if (k == std::string_view::npos) return std::nullopt;
  k += 7;
  std::size_t save = k;
  std::optional<std::size_t> length;
  if (auto ref = read_ref(dict, k)) {
    std::size_t j = find_object(pdf, *ref);
    if (j == std::string_view::npos) return std::nullopt;
    length = read_uint(pdf, j);
    if (!length || !read_word(pdf, j, "endobj")) return std::nullopt;
  } else {
    k = save;
    length = read_uint(dict, k);
  }
  if (!length) return std::nullopt;
  std::size_t s = end;
  if (!read_word(pdf, s, "stream")) return std::nullopt;
  if (s < pdf.size() && pdf[s] == '\r') ++s;
  if (s >= pdf.size() || pdf[s] != '\n') return std::nullopt;
  ++s;
  if (*length > pdf.size() - s) return std::nullopt;
  std::size_t after = s + *length;
  if (!read_word(pdf, after, "endstream")) return std::nullopt;
  return std::string(pdf.substr(s, *length));
}

}  // namespace

bool looks_like_pdf(std::string_view bytes) {
  return bytes.substr(0, 5) == "%PDF-" && bytes.find("%%EOF") != std::string_view::npos;
}

std::optional<std::string> find_attachment(std::string_view pdf, std::string_view name) {
  if (!looks_like_pdf(pdf) || name.empty()) return std::nullopt;
  std::string key = "/F (" + std::string(name) + ")";
  std::size_t pos = pdf.find(key);
  if (pos == std::string_view::npos) return std::nullopt;
  if (pdf.find(key, pos + key.size()) != std::string_view::npos) return std::nullopt;  // ambiguous
  std::size_t ef = pdf.find("/EF", pos + key.size());
  std::size_t stop = pdf.find("endobj", pos);
  if (ef == std::string_view::npos || stop == std::string_view::npos || ef > stop) return std::nullopt;
  std::size_t i = ef + 3;
  if (!read_word(pdf, i, "<<") || !read_word(pdf, i, "/F")) return std::nullopt;
  auto ref = read_ref(pdf, i);
  if (!ref) return std::nullopt;
  return stream_of_object(pdf, *ref);
}

}  // namespace sp::report
