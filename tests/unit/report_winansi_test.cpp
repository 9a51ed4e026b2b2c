// Cutting report text into WinAnsiEncoding runs (src/report/winansi.h).
#include <doctest/doctest.h>

#include <cstdint>
#include <string>
#include <vector>

#include "report/winansi.h"

using sp::report::split_winansi_runs;
using sp::report::TextRun;
using Kind = TextRun::Kind;

namespace {

std::string utf8(std::uint32_t cp) {
  std::string s;
  if (cp < 0x80) {
    s += static_cast<char>(cp);
  } else if (cp < 0x800) {
    s += static_cast<char>(0xC0 | (cp >> 6));
    s += static_cast<char>(0x80 | (cp & 0x3F));
  } else if (cp < 0x10000) {
    s += static_cast<char>(0xE0 | (cp >> 12));
    s += static_cast<char>(0x80 | ((cp >> 6) & 0x3F));
    s += static_cast<char>(0x80 | (cp & 0x3F));
  } else {
    s += static_cast<char>(0xF0 | (cp >> 18));
    s += static_cast<char>(0x80 | ((cp >> 12) & 0x3F));
    s += static_cast<char>(0x80 | ((cp >> 6) & 0x3F));
    s += static_cast<char>(0x80 | (cp & 0x3F));
  }
  return s;
}

std::string describe(const std::vector<TextRun>& runs) {
  std::string out;
  for (const auto& r : runs) {
    out += r.kind == Kind::winansi ? "W[" : r.kind == Kind::gap ? "G[" : "U[";
    for (unsigned char c : r.bytes) {
      static const char* d = "0123456789abcdef";
      if (c >= 0x20 && c < 0x7F) {
        out += static_cast<char>(c);
      } else {
        out += "\\x";
        out += d[c >> 4];
        out += d[c & 15];
      }
    }
    out += "]";
  }
  return out;
}

}  // namespace

TEST_CASE("bytes 0x80..0x9F map as in CP1252.TXT") {
  // Unicode consortium, MAPPINGS/VENDORS/MICSFT/WINDOWS/CP1252.TXT (the same table as
  // ISO 32000-1:2008 Annex D.2's WinAnsiEncoding column); 0 marks the five undefined bytes.
  const std::uint32_t table[32] = {0x20AC, 0,      0x201A, 0x0192, 0x201E, 0x2026, 0x2020, 0x2021,
                                   0x02C6, 0x2030, 0x0160, 0x2039, 0x0152, 0,      0x017D, 0,
                                   0,      0x2018, 0x2019, 0x201C, 0x201D, 0x2022, 0x2013, 0x2014,
                                   0x02DC, 0x2122, 0x0161, 0x203A, 0x0153, 0,      0x017E, 0x0178};
  for (int b = 0x80; b < 0xA0; ++b) {
    const std::uint32_t cp = table[b - 0x80];
    if (cp == 0) continue;
    CAPTURE(b);
    auto runs = split_winansi_runs(utf8(cp));
    REQUIRE(runs.size() == 1);
    CHECK(runs[0].kind == Kind::winansi);
    CHECK(runs[0].bytes == std::string(1, static_cast<char>(b)));
  }
  // The C1 controls at the undefined bytes are not WinAnsi characters.
  for (std::uint32_t cp : {0x81u, 0x8Du, 0x8Fu, 0x90u, 0x9Du}) {
    CAPTURE(cp);
    CHECK(split_winansi_runs(utf8(cp))[0].kind == Kind::unicode);
  }
}

TEST_CASE("ASCII and Latin-1 are their own code points") {
  // ISO 32000-1:2008 Annex D.2: WinAnsiEncoding is ISO 8859-1 at 0x20..0x7E and 0xA0..0xFF.
  for (std::uint32_t cp = 0x20; cp <= 0xFF; ++cp) {
    if (cp >= 0x7F && cp < 0xA0) continue;
    CAPTURE(cp);
    auto runs = split_winansi_runs(utf8(cp));
    REQUIRE(runs.size() == 1);
    CHECK(runs[0].kind == Kind::winansi);
    CHECK(runs[0].bytes == std::string(1, static_cast<char>(cp)));
  }
}

TEST_CASE("text is cut into runs") {
  struct Case {
    const char* what;
    std::string in;
    std::string want;
  };
  const std::string thin = utf8(0x2009);
  const Case cases[] = {
      {"empty", "", ""},
      {"plain", "Axle loads", "W[Axle loads]"},
      {"report symbols", "\xc2\xb1 3 lb \xc2\xb7 \xe2\x80\x94", "W[\\xb1 3 lb \\xb7 \\x97]"},
      {"digit groups", "15" + thin + "760", "W[15]G[\\xe2\\x80\\x89]W[760]"},
      {"two gaps in a row", "a" + thin + utf8(0x202F) + "b",
       "W[a]G[\\xe2\\x80\\x89]G[\\xe2\\x80\\xaf]W[b]"},
      {"Greek inside Latin", "Zo\xc3\xab \xce\xa9mega", "W[Zo\\xeb ]U[\\xce\\xa9]W[mega]"},
      {"control character", "a\tb", "W[a]U[\\x09]W[b]"},
      {"outside the BMP", "x" + utf8(0x1F69A), "W[x]U[\\xf0\\x9f\\x9a\\x9a]"},
      {"invalid UTF-8 kept whole", "ab\xff", "U[ab\\xff]"},
      {"truncated sequence", "ab\xe2\x80", "U[ab\\xe2\\x80]"},
      {"overlong form", "\xc0\xaf", "U[\\xc0\\xaf]"},
      {"surrogate", "\xed\xa0\x80", "U[\\xed\\xa0\\x80]"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.what);
    CHECK(describe(split_winansi_runs(c.in)) == c.want);
  }
}
