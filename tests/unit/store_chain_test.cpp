// The hash chain's building blocks: SHA-256 against FIPS 180-4, the canonical encoding
// (pinned, since changing it would break every stored chain), and the table descriptors
// against the migration's real columns.
#include <doctest/doctest.h>

#include "store/chain.h"
#include "store_fixture.h"

using namespace storetest;

TEST_CASE("sha256 of abc matches the FIPS 180-4 example") {
  Sha256 sha;
  // FIPS 180-4 / NIST example "abc" (also in /work/shared/notes/references.md).
  CHECK(to_hex(sha.digest("abc")) ==
        "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  // Chained form: prev (32 zero bytes) || data, checked against the one-shot digest.
  std::string joined(32, '\0');
  joined += "abc";
  CHECK(sha.digest(Hash{}, "abc") == sha.digest(joined));
}

TEST_CASE("canonical encoding v1 is byte-for-byte stable (regression: stored chains)") {
  Encoder e;
  const TableDesc& t = table_desc("corrections");
  e.start(t, 7, 2);
  e.add_int(5);
  e.add_text("void");
  e.add_text("ab");
  e.add_null();
  e.add_real(-0.0);
  std::string want("SPR1", 4);
  want += std::string("\3\13\0\0\0corrections", 16);
  want += std::string("\1\7\0\0\0\0\0\0\0", 9);
  want += std::string("\1\2\0\0\0\0\0\0\0", 9);
  want += std::string("\1\5\0\0\0\0\0\0\0", 9);
  want += std::string("\3\4\0\0\0void", 9);
  want += std::string("\3\2\0\0\0ab", 7);
  want += std::string("\0", 1);
  want += std::string("\2\0\0\0\0\0\0\0\0", 9);  // -0.0 encoded as +0.0 (see chain.h)
  CHECK(e.data() == want);
  CHECK(e.fields() == 5);
  Encoder f;
  f.start(t, 7, 2);
  f.add_real(4700.0);
  // 4700.0 = 0x40B25C0000000000 (IEEE 754 binary64), little-endian.
  CHECK(f.data().substr(f.data().size() - 9) ==
        std::string("\2\0\0\0\0\0\x5c\xb2\x40", 9));
}

// The check-store walk hashes Encoder::chained(prev) in one piece; it must be exactly the
// prev || encoding of chain.h, also after a row larger than the encoder's first buffer
// (the layout below is chain.h's field definition, spelled out by hand).
TEST_CASE("chained encoding is prev || data, across a buffer growth and a reuse") {
  Encoder e;
  Sha256 sha;
  const TableDesc& t = table_desc("corrections");
  const std::string big(3000, 'x');  // 3000: well over the encoder's first 512-byte buffer
  e.start(t, 7, 2);
  e.add_text(big);
  e.add_int(-1);
  std::string want("SPR1", 4);
  want += std::string("\3\13\0\0\0corrections", 16);
  want += std::string("\1\7\0\0\0\0\0\0\0", 9);
  want += std::string("\1\2\0\0\0\0\0\0\0", 9);
  want += std::string("\3\xb8\x0b\0\0", 5) + big;  // 3000 = 0x0bb8, little-endian
  want += std::string("\1\xff\xff\xff\xff\xff\xff\xff\xff", 9);
  CHECK(e.data() == want);
  CHECK(e.fields() == 2);
  Hash prev{};
  for (size_t i = 0; i < prev.size(); ++i) prev[i] = static_cast<unsigned char>(i + 1);
  const std::string prev_bytes(reinterpret_cast<const char*>(prev.data()), prev.size());
  CHECK(e.chained(prev) == prev_bytes + want);
  CHECK(sha.digest(e.chained(prev)) == sha.digest(prev, want));
  // Reused for a small row: nothing of the big one is left.
  e.start(t, 8, 3);
  e.add_null();
  std::string small("SPR1", 4);
  small += std::string("\3\13\0\0\0corrections", 16);
  small += std::string("\1\10\0\0\0\0\0\0\0", 9);
  small += std::string("\1\3\0\0\0\0\0\0\0", 9);
  small += std::string("\0", 1);
  CHECK(e.data() == small);
  CHECK(e.fields() == 1);
  CHECK(e.chained(prev) == prev_bytes + small);
}

TEST_CASE("table descriptors match the columns of the migrated schema") {
  TempStore ts;
  sqlite3* db = nullptr;
  REQUIRE(sqlite3_open(ts.path.c_str(), &db) == SQLITE_OK);
  for (const auto& t : chained_tables()) {
    CAPTURE(t.name);
    std::vector<std::string> cols;
    sqlite3_stmt* st = nullptr;
    std::string sql = std::string("PRAGMA table_info(") + t.name + ")";
    REQUIRE(sqlite3_prepare_v2(db, sql.c_str(), -1, &st, nullptr) == SQLITE_OK);
    while (sqlite3_step(st) == SQLITE_ROW) {
      cols.emplace_back(reinterpret_cast<const char*>(sqlite3_column_text(st, 1)));
    }
    sqlite3_finalize(st);
    std::vector<std::string> want = {"id"};
    if (!t.id_is_seq) want.push_back("seq");
    want.push_back("hash");
    for (const auto& c : t.columns) want.push_back(c.name);
    CHECK(cols == want);
  }
  sqlite3_close(db);
}
