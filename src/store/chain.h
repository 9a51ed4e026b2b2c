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

#include <array>
#include <cstdint>
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

// Builds one canonical encoding. Usage: start(), then one add_* per column in order, then data().
class Encoder {
 public:
  void start(const TableDesc& t, long long seq, long long id);
  void add_null();
  void add_int(long long v);
  void add_real(double v);
  void add_text(std::string_view v);
  const std::string& data() const { return buf_; }
  size_t fields() const { return fields_; }

 private:
  void put64(uint64_t v);
  std::string buf_;
  size_t fields_ = 0;
};

}  // namespace sp::store
