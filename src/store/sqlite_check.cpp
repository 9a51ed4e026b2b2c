// check-store: walks the one hash chain across every table in seq order and recomputes each
// row's hash from its stored content (see chain.h). Reports the first row whose content,
// link or position does not match. Large chains are walked in two halves on two threads.
#include <atomic>
#include <cstring>
#include <exception>
#include <fmt/format.h>
#include <limits>
#include <optional>
#include <thread>
#include <utility>

#include "store/sqlite_store.h"

namespace sp::store {

namespace {

struct Cursor {
  const TableDesc* desc;
  std::unique_ptr<Stmt> q;
  bool has_row = false;
  long long seq = 0;
  void advance() {
    has_row = q->step("reading the chain");
    if (has_row) seq = sqlite3_column_int64(q->handle(), 1);
  }
};

const char* type_name(int t) {
  switch (t) {
    case SQLITE_INTEGER: return "INTEGER";
    case SQLITE_FLOAT: return "REAL";
    case SQLITE_TEXT: return "TEXT";
    case SQLITE_BLOB: return "BLOB";
    default: return "NULL";
  }
}

// Walks chain positions from..to of `db`, the row before `from` having hash `prev` (zeros for
// from = 1). Reports the first row whose content, link or position does not match. From 1,
// rows at positions below 1 (which only tampering makes) are read too and reported.
ChainCheck walk_chain(Db& db, Encoder& enc, Sha256& sha, long long from, long long to,
                      Hash prev, const std::function<void(long long)>& progress) {
  const long long lowest = from == 1 ? std::numeric_limits<long long>::min() : from;
  std::vector<Cursor> cursors;
  for (const auto& t : chained_tables()) {
    std::string cols = t.id_is_seq ? "id, id, hash" : "id, seq, hash";
    for (const auto& c : t.columns) {
      cols += ", ";
      cols += c.name;
    }
    const char* seq = t.id_is_seq ? "id" : "seq";
    Cursor c{&t, std::make_unique<Stmt>(
                     db, fmt::format("SELECT {0} FROM {1} WHERE {2} BETWEEN ? AND ? ORDER BY {2}",
                                     cols, t.name, seq))};
    c.q->bind(1, lowest).bind(2, to);
    c.advance();
    cursors.push_back(std::move(c));
  }
  ChainCheck r;
  long long expected = from;
  auto bad = [&](Cursor& c, std::string problem) {
    r.ok = false;
    r.table = c.desc->name;
    r.id = c.q->i64(0);
    r.seq = c.seq;
    r.problem = std::move(problem);
    if (c.desc->ticket_column != nullptr) {
      for (size_t k = 0; k < c.desc->columns.size(); ++k) {
        if (std::strcmp(c.desc->columns[k].name, c.desc->ticket_column) == 0) {
          r.ticket = c.q->opt_text(static_cast<int>(k) + 3);
        }
      }
    }
    return r;
  };
  for (;;) {
    Cursor* next = nullptr;
    for (auto& c : cursors) {
      if (c.has_row && (next == nullptr || c.seq < next->seq)) next = &c;
    }
    if (next == nullptr) break;
    Cursor& c = *next;
    if (c.seq > expected) {
      return bad(c, fmt::format("rows {} to {} of the chain are missing (deleted)", expected,
                                c.seq - 1));
    }
    if (c.seq < 1) {
      return bad(c, fmt::format("position {} is outside the chain (positions start at 1)",
                                c.seq));
    }
    if (c.seq < expected) {
      return bad(c, fmt::format("position {} of the chain appears twice", c.seq));
    }
    sqlite3_stmt* st = c.q->handle();
    enc.start(*c.desc, c.seq, sqlite3_column_int64(st, 0));
    const std::vector<Column>& defs = c.desc->columns;
    for (size_t k = 0; k < defs.size(); ++k) {
      // One column fetch, then the value accessors: a third of the API calls of asking the
      // statement for the type, the text and its length. An unprotected sqlite3_value is
      // fine here: it is read on this thread, before the next step (sqlite3_column_value docs).
      sqlite3_value* v = sqlite3_column_value(st, static_cast<int>(k) + 3);
      const int type = sqlite3_value_type(v);
      const Column& def = defs[k];
      if (type == SQLITE_NULL) {
        enc.add_null();
        continue;
      }
      int want = def.type == ColType::integer ? SQLITE_INTEGER
                 : def.type == ColType::real  ? SQLITE_FLOAT
                                              : SQLITE_TEXT;
      if (type != want) {
        return bad(c, fmt::format("column {} holds {} where {} was stored", def.name,
                                  type_name(type), type_name(want)));
      }
      switch (def.type) {
        case ColType::integer: enc.add_int(sqlite3_value_int64(v)); break;
        case ColType::real: enc.add_real(sqlite3_value_double(v)); break;
        case ColType::text: {
          // The text, then its length, in that order (the length is of the form last asked
          // for: sqlite3_column_bytes docs). The stored value is TEXT, so no conversion.
          const unsigned char* p = sqlite3_value_text(v);
          const auto n = static_cast<size_t>(sqlite3_value_bytes(v));
          enc.add_text(p == nullptr ? std::string_view()
                                    : std::string_view(reinterpret_cast<const char*>(p), n));
          break;
        }
      }
    }
    Hash h = sha.digest(enc.chained(prev));
    // Compared as raw bytes: blob first, then its length (the documented order).
    sqlite3_value* hv = sqlite3_column_value(st, 2);
    const void* stored = sqlite3_value_blob(hv);
    if (sqlite3_value_bytes(hv) != 32 || std::memcmp(stored, h.data(), 32) != 0) {
      return bad(c, c.seq == 1
                        ? "the stored hash does not match the row's content (a value was "
                          "changed, or the hash replaced)"
                        : "the stored hash does not match the row's content and the previous "
                          "row's hash (a value of this row was changed, or the previous row was "
                          "changed and its hash forged)");
    }
    prev = h;
    ++r.rows;
    ++expected;
    if (progress && (r.rows & 0xffff) == 0) progress(r.rows);
    c.advance();
  }
  r.head = r.rows == 0 ? std::string() : to_hex(prev);
  return r;
}

// Highest chain position over every chained table, as `db` sees it (an index lookup each).
long long chain_top(Db& db) {
  long long top = 0;
  for (const auto& t : chained_tables()) {
    Stmt q(db, fmt::format("SELECT coalesce(max({}), 0) FROM {}", t.id_is_seq ? "id" : "seq",
                           t.name));
    q.step("measuring the chain");
    top = std::max(top, q.i64(0));
  }
  return top;
}

// The stored hash of chain position `seq`, when exactly 32 bytes are stored there.
std::optional<Hash> stored_hash(Db& db, long long seq) {
  for (const auto& t : chained_tables()) {
    Stmt q(db, fmt::format("SELECT hash FROM {} WHERE {} = ?", t.name, t.id_is_seq ? "id" : "seq"));
    q.bind(1, seq);
    if (!q.step("reading a chain hash")) continue;
    const void* p = sqlite3_column_blob(q.handle(), 0);
    if (p == nullptr || sqlite3_column_bytes(q.handle(), 0) != 32) return std::nullopt;
    Hash h{};
    std::memcpy(h.data(), p, 32);
    return h;
  }
  return std::nullopt;
}

}  // namespace

// A large chain is walked in two halves at once, each on its own connection: checking row n
// needs only row n-1's stored hash, so the halves are independent. The fast path only ever
// says "ok"; anything odd (a gap, a mismatch, the two connections seeing different rows)
// falls back to the one-thread walk, which words the finding exactly as before.
std::optional<ChainCheck> SqliteStore::check_chain_halves(
    const std::function<void(long long)>& progress) {
  // Positions 1..top must each hold one row; the halves' row counts prove it (a gap or a
  // repeat makes a half fail, and the one-thread walk then names it).
  const long long rows = chain_top(db_);
  if (rows < parallel_check_rows_) return std::nullopt;
  const long long half = rows / 2;
  std::optional<Hash> mid = stored_hash(db_, half);
  std::optional<Hash> last = stored_hash(db_, rows);
  if (!mid || !last) return std::nullopt;
  Db other(db_.path(), false, busy_timeout_ms_);
  other.exec("BEGIN", "starting a read");
  // The same rows on both connections: the store only grows, so the same top row with the
  // same hash means no writer came in between the two snapshots.
  if (chain_top(other) != rows || stored_hash(other, rows) != last) return std::nullopt;
  std::atomic<long long> other_rows{0};
  ChainCheck second;
  std::exception_ptr failure;
  std::thread worker([&] {
    // Hands any exception to the caller's thread (one escaping a thread ends the process).
    try {
      Encoder enc;
      Sha256 sha;
      second = walk_chain(other, enc, sha, half + 1, rows, *mid,
                          [&](long long n) { other_rows = n; });
    } catch (...) {
      failure = std::current_exception();
    }
  });
  std::function<void(long long)> both;
  if (progress) both = [&](long long n) { progress(n + other_rows); };
  ChainCheck first;
  try {
    first = walk_chain(db_, enc_, sha_, 1, half, Hash{}, both);
  } catch (...) {
    worker.join();
    throw;
  }
  worker.join();
  if (failure) std::rethrow_exception(failure);
  if (!first.ok || !second.ok || first.rows != half || second.rows != rows - half) {
    return std::nullopt;
  }
  second.rows = rows;
  second.walkers = 2;
  return second;
}

ChainCheck SqliteStore::check_chain(const std::function<void(long long)>& progress) {
  if (db_.path() != ":memory:" && parallel_check_rows_ > 0) {
    if (auto r = check_chain_halves(progress)) return *r;
  }
  return walk_chain(db_, enc_, sha_, 1, std::numeric_limits<long long>::max(), Hash{}, progress);
}

}  // namespace sp::store
