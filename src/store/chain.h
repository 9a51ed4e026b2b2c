// The hash chain over every stored row, and the canonical row encoding it hashes.
//
// One chain runs across all tables in `seq` order (1, 2, 3, ... with no gaps; passes use their
// id as seq). Row hash:
//     hash(seq) = SHA-256( hash(seq - 1) || canonical(row) )      hash(0) = 32 zero bytes
// Canonical encoding, version 1 ("SPR1"), cheap to build on the import hot path:
//     "SPR1" | field(table name) | int64(seq) | int64(id) | field(column) for each chained
//     column of the table, in the order of chained_tables() below
// where a field is one tag byte then its payload:
//     0 NULL | 1 int64, 8 bytes little-endian two's complement |
//     2 REAL, IEEE-754 binary64 bits as 8 bytes little-endian (-0.0 encoded as +0.0, since SQLite
//       may store an integral REAL as an integer and read it back as +0.0) |
//     3 TEXT, uint32 little-endian byte length then the UTF-8 bytes.
// A later encoding gets a new magic; rows never change, so old rows keep verifying.
// SHA-256 via OpenSSL libcrypto (FIPS 180-4).
#pragma once
#include <openssl/evp.h>

#include <algorithm>
#include <array>
#include <cstdint>
#include <cstring>
#include <string>
#include <string_view>
#include <vector>

namespace sp::store {

using Hash = std::array<unsigned char, 32>;

std::string to_hex(const Hash& h);

// Reusable SHA-256 context: fetches the digest once (OpenSSL 3 implicit fetches are slow).
class Sha256 {
 public:
  Sha256();
  ~Sha256();
  Sha256(const Sha256&) = delete;
  Sha256& operator=(const Sha256&) = delete;
  Hash digest(const Hash& prev, std::string_view data);
  Hash digest(std::string_view data);

 private:
  EVP_MD* md_ = nullptr;
  EVP_MD_CTX* ctx_ = nullptr;
};

enum class ColType { integer, real, text };

struct Column {
  const char* name;
  ColType type;
};

// A chained table: its name, whether its id is its seq (passes), the column that names a
// ticket in messages (or nullptr), and its chained columns (everything but id, seq, hash).
struct TableDesc {
  const char* name;
  bool id_is_seq;
  const char* ticket_column;
  std::vector<Column> columns;
};

const std::vector<TableDesc>& chained_tables();
const TableDesc& table_desc(std::string_view name);

// Builds one canonical encoding. Usage: start(), then one add_* per column in order, then
// data() or chained(). The encoding is built behind a 32-byte slot, so that the hashed input
// prev || encoding is one piece (one digest update, no copy). The add_* are inline: they run
// once per column on the import and check-store hot paths.
class Encoder {
 public:
  void start(const TableDesc& t, long long seq, long long id);
  void add_null() {
    *grow(1) = '\0';
    ++fields_;
  }
  void add_int(long long v) {
    char* p = grow(9);
    p[0] = '\1';
    put64(p + 1, static_cast<uint64_t>(v));
    ++fields_;
  }
  void add_real(double v) {
    if (v == 0) v = 0.0;  // -0.0 -> +0.0, see header
    uint64_t bits = 0;
    std::memcpy(&bits, &v, sizeof bits);
    char* p = grow(9);
    p[0] = '\2';
    put64(p + 1, bits);
    ++fields_;
  }
  void add_text(std::string_view v) {
    const auto n = static_cast<uint32_t>(v.size());
    char* p = grow(5 + v.size());
    p[0] = '\3';
    for (int i = 0; i < 4; ++i) p[1 + i] = static_cast<char>((n >> (8 * i)) & 0xff);
    if (n != 0) std::memcpy(p + 5, v.data(), v.size());
    ++fields_;
  }
  // The encoding; valid until the next start() or add_*.
  std::string_view data() const { return {buf_.data() + kSlot, size_ - kSlot}; }
  // prev || the encoding, as hashed (chain.h header); valid like data().
  std::string_view chained(const Hash& prev) {
    std::memcpy(buf_.data(), prev.data(), kSlot);
    return {buf_.data(), size_};
  }
  size_t fields() const { return fields_; }

 private:
  static constexpr size_t kSlot = sizeof(Hash);
  // Little-endian whatever the host (the encoding is fixed); compilers make this one store.
  static void put64(char* p, uint64_t v) {
    for (int i = 0; i < 8; ++i) p[i] = static_cast<char>((v >> (8 * i)) & 0xff);
  }
  // Room for n more bytes at the end; returns where they go. Grows by doubling, so a
  // reused encoder stops allocating once it has seen its largest row.
  char* grow(size_t n) {
    if (size_ + n > buf_.size()) buf_.resize(std::max(2 * buf_.size(), size_ + n));
    char* p = buf_.data() + size_;
    size_ += n;
    return p;
  }
  // 512 bytes to start: more than a typical row (a pass encodes to ~200 bytes).
  std::vector<char> buf_ = std::vector<char>(512);
  size_t size_ = kSlot;
  size_t fields_ = 0;
};

}  // namespace sp::store
