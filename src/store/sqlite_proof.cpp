// What a ledger proof needs from the store: the chain head (the anchor a report records), one
// stored hash (a prefix test once the walk verified it), signed checkpoints, and the schema
// compared with what the migrations make.
#include <fmt/format.h>

#include <cstring>
#include <map>

#include "core/embedded.h"
#include "store/sqlite_store.h"

namespace sp::store {

ChainHead SqliteStore::chain_head() {
  if (!in_write_) load_head();
  return {next_seq_ - 1, next_seq_ == 1 ? std::string() : to_hex(head_)};
}

std::optional<std::string> SqliteStore::stored_hash_at(long long seq) {
  for (const auto& t : chained_tables()) {
    Stmt& q =
        stmt(fmt::format("SELECT hash FROM {} WHERE {} = ?", t.name, t.id_is_seq ? "id" : "seq"));
    q.bind(1, seq);
    if (!q.step("reading a chain hash")) {
      q.reset();
      continue;
    }
    std::optional<std::string> out;
    const void* p = sqlite3_column_blob(q.handle(), 0);
    if (p != nullptr && sqlite3_column_bytes(q.handle(), 0) == 32) {
      Hash h{};
      std::memcpy(h.data(), p, 32);
      out = to_hex(h);
    }
    q.reset();
    return out;
  }
  return std::nullopt;
}

long long SqliteStore::add_checkpoint(const Checkpoint& c) {
  require_write("checkpoints");
  const ChainHead now = chain_head();
  if (now.rows == 0) throw data_error("checkpoint: the store is empty; there is nothing to sign");
  if (c.rows != now.rows || c.head != now.head) {
    throw data_error(
        fmt::format("checkpoint: it signs {} rows with head {}, but the chain now "
                    "has {} rows with head {}; sign again",
                    c.rows, c.head, now.rows, now.head));
  }
  return RowBuilder(*this, "checkpoints")
      .i(c.rows)
      .t(c.head)
      .t(c.public_key)
      .t(c.key_fingerprint)
      .t(c.signature)
      .t(c.signed_by)
      .t(c.signed_at)
      .append(fmt::format("adding a checkpoint of {} rows", c.rows));
}

namespace {
constexpr const char* kCheckpointCols =
    "id, seq, rows, head, public_key, key_fingerprint, signature, signed_by, signed_at";

Checkpoint read_checkpoint(const Stmt& q) {
  Checkpoint c;
  c.id = q.i64(0);
  c.seq = q.i64(1);
  c.rows = q.i64(2);
  c.head = q.text(3);
  c.public_key = q.text(4);
  c.key_fingerprint = q.text(5);
  c.signature = q.text(6);
  c.signed_by = q.opt_text(7);
  c.signed_at = q.text(8);
  return c;
}
}  // namespace

std::vector<Checkpoint> SqliteStore::list_checkpoints() {
  std::vector<Checkpoint> out;
  Stmt& q = stmt(fmt::format("SELECT {} FROM checkpoints ORDER BY seq", kCheckpointCols));
  while (q.step("listing checkpoints")) out.push_back(read_checkpoint(q));
  q.reset();
  return out;
}

std::optional<Checkpoint> SqliteStore::latest_checkpoint() {
  Stmt& q =
      stmt(fmt::format("SELECT {} FROM checkpoints ORDER BY seq DESC LIMIT 1", kCheckpointCols));
  std::optional<Checkpoint> out;
  if (q.step("reading the latest checkpoint")) out = read_checkpoint(q);
  q.reset();
  return out;
}

namespace {

struct SchemaObject {
  std::string type, table, sql;
};

// name -> object, from sqlite_schema. An automatic index has no SQL (NULL): kept as "".
std::map<std::string, SchemaObject> schema_objects(Db& db) {
  std::map<std::string, SchemaObject> out;
  Stmt q(db, "SELECT type, name, tbl_name, coalesce(sql, '') FROM sqlite_schema");
  while (q.step("reading the schema")) {
    std::string name = q.text(1);
    // ANALYZE makes sqlite_stat1 (and _stat4): planner statistics, no stored data.
    if (name.rfind("sqlite_stat", 0) == 0) continue;
    out[name] = SchemaObject{q.text(0), q.text(2), q.text(3)};
  }
  return out;
}

long long pragma_value(Db& db, const char* pragma) {
  Stmt q(db, std::string("PRAGMA ") + pragma);
  q.step("reading a pragma");
  return q.i64(0);
}

// Hints for the usual causes; the finding itself is the object and its state.
std::string missing_hint(const SchemaObject& o) {
  if (o.type == "trigger") return " (an append-only guard was dropped)";
  return "";
}

}  // namespace

std::vector<SchemaDifference> SqliteStore::check_schema() {
  const int version = schema_version();
  // The expected schema: the same migration files, applied to an empty in-memory database.
  Db expected_db(":memory:", true, busy_timeout_ms_);
  // As in migrate(): a migration may rewrite a table's SQL text (002 does, for a CHECK), which
  // needs writable_schema, which defensive mode refuses. This database is a scratch copy.
  sqlite3_db_config(expected_db.handle(), SQLITE_DBCONFIG_DEFENSIVE, 0, nullptr);
  for (const auto& f : embedded::schema_files()) {
    if (std::atoi(std::string(f.name).c_str()) > version) continue;
    expected_db.exec(std::string(f.contents),
                     "building the expected schema " + std::string(f.name));
  }
  const auto want = schema_objects(expected_db);
  const auto have = schema_objects(db_);
  std::vector<SchemaDifference> out;
  for (const auto& [name, o] : want) {
    auto it = have.find(name);
    if (it == have.end()) {
      out.push_back(
          {o.type, name,
           fmt::format("is missing: migrations 1 to {} make it{}", version, missing_hint(o))});
    } else if (it->second.type != o.type || it->second.table != o.table ||
               it->second.sql != o.sql) {
      out.push_back({o.type, name,
                     fmt::format("differs from what migrations 1 to {} make (its SQL was "
                                 "changed)",
                                 version)});
    }
  }
  for (const auto& [name, o] : have) {
    if (want.count(name) == 0) {
      out.push_back({o.type, name,
                     fmt::format("was not made by migrations 1 to {} (added behind the tool's "
                                 "back)",
                                 version)});
    }
  }
  if (pragma_value(db_, "application_id") != pragma_value(expected_db, "application_id")) {
    out.push_back({"pragma", "application_id", "is not scaleproof's (\"sprf\")"});
  }
  return out;
}

}  // namespace sp::store
