// check-store: walks the one hash chain across every table in seq order and recomputes each
// row's hash from its stored content (see chain.h). Reports the first row whose content,
// link or position does not match.
#include <cstring>
#include <fmt/format.h>

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
    if (has_row) seq = q->i64(1);
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

}  // namespace

ChainCheck SqliteStore::check_chain(const std::function<void(long long)>& progress) {
  std::vector<Cursor> cursors;
  for (const auto& t : chained_tables()) {
    std::string cols = t.id_is_seq ? "id, id, hash" : "id, seq, hash";
    for (const auto& c : t.columns) {
      cols += ", ";
      cols += c.name;
    }
    Cursor c{&t, std::make_unique<Stmt>(db_, fmt::format("SELECT {} FROM {} ORDER BY {}", cols,
                                                         t.name, t.id_is_seq ? "id" : "seq"))};
    c.advance();
    cursors.push_back(std::move(c));
  }
  ChainCheck r;
  Hash prev{};
  long long expected = 1;
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
    if (c.seq < expected) {
      return bad(c, fmt::format("position {} of the chain appears twice", c.seq));
    }
    sqlite3_stmt* st = c.q->handle();
    enc_.start(*c.desc, c.seq, c.q->i64(0));
    for (size_t k = 0; k < c.desc->columns.size(); ++k) {
      int col = static_cast<int>(k) + 3;
      int type = sqlite3_column_type(st, col);
      const Column& def = c.desc->columns[k];
      if (type == SQLITE_NULL) {
        enc_.add_null();
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
        case ColType::integer: enc_.add_int(sqlite3_column_int64(st, col)); break;
        case ColType::real: enc_.add_real(sqlite3_column_double(st, col)); break;
        case ColType::text: enc_.add_text(c.q->text_view(col)); break;
      }
    }
    Hash h = sha_.digest(prev, enc_.data());
    const void* stored = sqlite3_column_blob(st, 2);
    if (sqlite3_column_bytes(st, 2) != 32 || std::memcmp(stored, h.data(), 32) != 0) {
      return bad(c, expected == 1
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

}  // namespace sp::store
