// The ToUnicode CMap of the report's UTF-8 (Type0, Identity-H) fonts.
//
// libharu 2.3.0 gives such a font, as its /ToUnicode, the *encoding* CMap of its UTF-8
// encoder: a code-to-CID map written with `begincidrange`. A ToUnicode CMap maps codes to
// Unicode with `beginbfchar` / `beginbfrange` only (ISO 32000-1:2008 §9.10.3; Adobe Technical
// Note #5411, "ToUnicode Mapping File Tutorial"), so readers reject it (poppler: "Invalid
// 'begincidrange' operator in ToUnicode CMap") and fall back to guessing.
//
// With libharu's UTF-8 encoder a character's code is two bytes holding its BMP code point
// (CID = code point; CIDToGIDMap maps it to the glyph), so the right map is the identity from
// <0000>..<FFFF> to UTF-16BE. We write it as bfranges of one high byte each: a bfrange may
// only vary the last byte of its codes (§9.10.3: the last byte of srcCode1 plus
// srcCode2 - srcCode1 must not exceed 255), a block holds at most 100 of them (TN #5411, from
// memory), and the surrogate codes D800..DFFF, the C0 controls and U+FFFE/U+FFFF are not
// characters and map to nothing.
#pragma once
#include <string>

namespace sp::report {

// The CMap's text (a PostScript CMap resource, ASCII); the same bytes on every call.
const std::string& identity_to_unicode_cmap();

}  // namespace sp::report
