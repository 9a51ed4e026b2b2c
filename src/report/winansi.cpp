#include "report/winansi.h"

#include <cstdint>

namespace sp::report {
namespace {

// Code points of bytes 0x80..0x9F in WinAnsiEncoding; 0 where the byte is undefined
// (0x81, 0x8D, 0x8F, 0x90, 0x9D). ISO 32000-1:2008 Annex D.2; the same as the Unicode
// consortium's CP1252.TXT mapping.
constexpr std::uint16_t kHigh[32] = {
    0x20AC, 0,      0x201A, 0x0192, 0x201E, 0x2026, 0x2020, 0x2021,  // 0x80..0x87
    0x02C6, 0x2030, 0x0160, 0x2039, 0x0152, 0,      0x017D, 0,       // 0x88..0x8F
    0,      0x2018, 0x2019, 0x201C, 0x201D, 0x2022, 0x2013, 0x2014,  // 0x90..0x97
    0x02DC, 0x2122, 0x0161, 0x203A, 0x0153, 0,      0x017E, 0x0178,  // 0x98..0x9F
};

// Decodes one UTF-8 character at s[i], advancing i; -1 for a malformed sequence (overlong
// forms, surrogates and truncation included).
long decode(std::string_view s, std::size_t& i) {
  const auto b0 = static_cast<unsigned char>(s[i]);
  int extra = 0;
  long cp = 0;
  long min = 0;
  if (b0 < 0x80) {
    ++i;
    return b0;
  } else if ((b0 & 0xE0) == 0xC0) {
    extra = 1, cp = b0 & 0x1F, min = 0x80;
  } else if ((b0 & 0xF0) == 0xE0) {
    extra = 2, cp = b0 & 0x0F, min = 0x800;
  } else if ((b0 & 0xF8) == 0xF0) {
    extra = 3, cp = b0 & 0x07, min = 0x10000;
  } else {
    return -1;
  }
  if (i + extra >= s.size()) return -1;  // truncated
  for (int k = 1; k <= extra; ++k) {
    const auto b = static_cast<unsigned char>(s[i + k]);
    if ((b & 0xC0) != 0x80) return -1;
    cp = (cp << 6) | (b & 0x3F);
  }
  if (cp < min || cp > 0x10FFFF || (cp >= 0xD800 && cp <= 0xDFFF)) return -1;
  i += extra + 1;
  return cp;
}

int to_byte(long cp) {
  if (cp >= 0x20 && cp <= 0x7E) return static_cast<int>(cp);
  if (cp >= 0xA0 && cp <= 0xFF) return static_cast<int>(cp);
  for (int k = 0; k < 32; ++k) {
    if (kHigh[k] != 0 && kHigh[k] == cp) return 0x80 + k;
  }
  return -1;
}

bool is_gap_space(long cp) {
  return (cp >= 0x2000 && cp <= 0x200A) || cp == 0x202F || cp == 0x205F;
}

}  // namespace

std::vector<TextRun> split_winansi_runs(std::string_view utf8) {
  std::vector<TextRun> runs;
  std::size_t i = 0;
  while (i < utf8.size()) {
    const std::size_t start = i;
    const long cp = decode(utf8, i);
    if (cp < 0) return {TextRun{TextRun::Kind::unicode, std::string(utf8), 0}};
    const int b = to_byte(cp);
    const auto kind = b >= 0             ? TextRun::Kind::winansi
                      : is_gap_space(cp) ? TextRun::Kind::gap
                                         : TextRun::Kind::unicode;
    if (runs.empty() || runs.back().kind != kind || kind == TextRun::Kind::gap) {
      runs.push_back(
          TextRun{kind, {}, kind == TextRun::Kind::gap ? static_cast<std::uint32_t>(cp) : 0});
    }
    if (kind == TextRun::Kind::winansi) {
      runs.back().bytes.push_back(static_cast<char>(b));
    } else {
      runs.back().bytes.append(utf8.substr(start, i - start));
    }
  }
  return runs;
}

}  // namespace sp::report
