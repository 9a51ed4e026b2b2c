// UTF-8 to the PDF's WinAnsiEncoding (ISO 32000-1:2008, Annex D.2), the single-byte encoding
// of the report's simple TrueType fonts.
//
// WinAnsiEncoding is Windows code page 1252: ASCII 0x20..0x7E, Latin-1 0xA0..0xFF, and 27
// punctuation and letter code points placed at 0x80..0x9F (euro sign, dashes, curly quotes,
// bullet, ...). Text is cut into runs: what fits WinAnsiEncoding is drawn with a face's simple
// font; a Unicode space that does not fit (the thin space grouping digits, U+2000..U+200A,
// U+202F, U+205F) is a gap of that space's width, so digit groups need no second font; any
// other run goes to the face's UTF-8 (Type0) font.
#pragma once
#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

namespace sp::report {

struct TextRun {
  enum class Kind { winansi, gap, unicode };
  Kind kind = Kind::winansi;
  std::string bytes;             // winansi: WinAnsiEncoding bytes; gap, unicode: the UTF-8
  std::uint32_t code_point = 0;  // gap: the space's code point
};

// The runs of `utf8`, in order; adjacent characters of one kind share a run (each gap is its
// own run). Not valid UTF-8: one unicode run with the bytes as given (libharu's own handling).
std::vector<TextRun> split_winansi_runs(std::string_view utf8);

}  // namespace sp::report
