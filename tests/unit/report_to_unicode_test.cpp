// The ToUnicode CMap written for the report's UTF-8 (Type0) fonts (src/report/to_unicode.h).
// Rules checked: ISO 32000-1:2008 §9.10.3 (a ToUnicode CMap uses beginbfchar / beginbfrange;
// a bfrange varies only the last byte of its codes) and Adobe Technical Note #5411,
// "ToUnicode Mapping File Tutorial" (at most 100 entries a block, from memory).
#include <doctest/doctest.h>

#include <sstream>
#include <string>
#include <vector>

#include "report/to_unicode.h"

using sp::report::identity_to_unicode_cmap;

namespace {

unsigned hex(const std::string& token) {
  REQUIRE(token.size() == 6);
  REQUIRE(token.front() == '<');
  REQUIRE(token.back() == '>');
  return static_cast<unsigned>(std::stoul(token.substr(1, 4), nullptr, 16));
}

}  // namespace

TEST_CASE("ToUnicode CMap: bfranges only, identity over the BMP's characters") {
  const std::string& cmap = identity_to_unicode_cmap();
  CHECK(cmap.find("cidrange") == std::string::npos);  // the operator poppler rejected
  CHECK(cmap.find("bfchar") == std::string::npos);
  CHECK(cmap.find("/CMapType 2 def") != std::string::npos);
  CHECK(cmap.find("1 begincodespacerange\n<0000> <FFFF>\nendcodespacerange") != std::string::npos);
  CHECK(&cmap == &identity_to_unicode_cmap());

  std::vector<bool> mapped(0x10000, false);
  std::istringstream in(cmap);
  std::string line;
  int blocks = 0;
  while (std::getline(in, line)) {
    const auto at = line.find(" beginbfrange");
    if (at == std::string::npos) continue;
    ++blocks;
    const int n = std::stoi(line.substr(0, at));
    CAPTURE(blocks);
    CHECK(n >= 1);
    CHECK(n <= 100);
    for (int k = 0; k < n; ++k) {
      REQUIRE(std::getline(in, line));
      CAPTURE(line);
      std::istringstream row(line);
      std::string a, b, d;
      row >> a >> b >> d;
      const unsigned lo = hex(a), hi = hex(b), dst = hex(d);
      CHECK(lo <= hi);
      CHECK((lo >> 8) == (hi >> 8));          // one high byte
      CHECK((lo & 0xFF) + (hi - lo) <= 255);  // §9.10.3
      CHECK(dst == lo);                       // identity
      for (unsigned c = lo; c <= hi; ++c) {
        CHECK_FALSE(mapped[c]);  // no code mapped twice
        mapped[c] = true;
      }
    }
    REQUIRE(std::getline(in, line));
    CHECK(line == "endbfrange");
  }
  CHECK(blocks == 3);
  // What must map (printable BMP) and what must not (controls, surrogates, U+FFFE/FFFF).
  for (unsigned c : {0x20u, 0x41u, 0xB1u, 0x2009u, 0x2212u, 0x2264u, 0x03A9u, 0x0141u, 0xFFFDu}) {
    CAPTURE(c);
    CHECK(mapped[c]);
  }
  for (unsigned c : {0x00u, 0x0Au, 0x1Fu, 0xD800u, 0xDBFFu, 0xDC00u, 0xDFFFu, 0xFFFEu, 0xFFFFu}) {
    CAPTURE(c);
    CHECK_FALSE(mapped[c]);
  }
}
