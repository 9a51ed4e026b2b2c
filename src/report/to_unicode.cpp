#include "report/to_unicode.h"

#include <algorithm>
#include <cstdio>
#include <utility>
#include <vector>

namespace sp::report {
namespace {

std::string hex4(unsigned v) {
  char buf[8];
  std::snprintf(buf, sizeof buf, "<%04X>", v & 0xFFFFu);
  return buf;
}

std::string build() {
  // [first, last] code ranges, each within one high byte (see the header).
  std::vector<std::pair<unsigned, unsigned>> ranges;
  ranges.emplace_back(0x0020, 0x00FF);  // C0 controls map to nothing
  for (unsigned hi = 0x01; hi <= 0xFF; ++hi) {
    if (hi >= 0xD8 && hi <= 0xDF) continue;  // surrogates
    ranges.emplace_back(hi << 8, hi == 0xFF ? 0xFFFD : (hi << 8) | 0xFF);
  }
  std::string out =
      "/CIDInit /ProcSet findresource begin\n"
      "12 dict begin\n"
      "begincmap\n"
      "/CIDSystemInfo << /Registry (Adobe) /Ordering (UCS) /Supplement 0 >> def\n"
      "/CMapName /Adobe-Identity-UCS def\n"
      "/CMapType 2 def\n"
      "1 begincodespacerange\n"
      "<0000> <FFFF>\n"
      "endcodespacerange\n";
  constexpr std::size_t kBlock = 100;  // TN #5411: at most 100 entries a block (from memory)
  for (std::size_t i = 0; i < ranges.size(); i += kBlock) {
    const std::size_t n = std::min(kBlock, ranges.size() - i);
    out += std::to_string(n) + " beginbfrange\n";
    for (std::size_t k = i; k < i + n; ++k) {
      out +=
          hex4(ranges[k].first) + " " + hex4(ranges[k].second) + " " + hex4(ranges[k].first) + "\n";
    }
    out += "endbfrange\n";
  }
  out +=
      "endcmap\n"
      "CMapName currentdict /CMap defineresource pop\n"
      "end\n"
      "end\n";
  return out;
}

}  // namespace

const std::string& identity_to_unicode_cmap() {
  static const std::string text = build();
  return text;
}

}  // namespace sp::report
