// The migration runner on a real old store: tests/data/store/v1.db was made by the version-1
// code (the build of commit 74eff00, before schema/002 existed) with the stock commands:
//   init; scale add --id ST-3 --division 20 --unit lb --inspected 2026-03-14;
//   rig add --file tests/data/csv/rig.toml; import tests/data/csv/two_sessions.csv;
//   pass void 8 --reason "drive keyed twice"; session close 2; key new;
//   report --session 1 --issued-at 2026-11-03T10:00:00-06:00
// and that build's `check-store` said: ok, 15 rows, head 3ae844f9...74b5 (below).
// Opening it upgrades it; every old row (value for value), its hash and the head must stay.
#include <doctest/doctest.h>

#include <fstream>
#include <vector>

#include "core/embedded.h"
#include "store/chain.h"
#include "store_fixture.h"

using namespace storetest;

namespace {

constexpr const char* kV1Head = "3ae844f96724defde0128d99773a35467a97d844473302b36972ba94396174b5";
constexpr long long kV1Rows = 15;
const char* const kV1Tables[] = {"scales",      "scale_inspections", "vehicles",         "trailers",
                                 "rigs",        "sessions",          "session_closings", "passes",
                                 "corrections", "issued_reports"};

// A fresh copy of the fixture in its own temp folder (the test must not upgrade the original).
struct V1Copy {
  std::string dir, path;
  V1Copy() {
    char tmpl[] = "/tmp/sp-v1-test-XXXXXX";
    dir = mkdtemp(tmpl);
    path = dir + "/store.db";
    std::ifstream in(SCALEPROOF_TEST_DATA "/store/v1.db", std::ios::binary);
    REQUIRE(in.good());
    std::ofstream out(path, std::ios::binary);
    out << in.rdbuf();
  }
  ~V1Copy() {
    for (const char* s : {"", "-wal", "-shm"}) std::remove((path + s).c_str());
    rmdir(dir.c_str());
  }
};

// Every row of the version-1 tables, each value with its storage type, in id order: what
// "not changed" is checked against (the hash column included).
std::string dump_v1_rows(const std::string& path) {
  sqlite3* db = nullptr;
  REQUIRE(sqlite3_open_v2(path.c_str(), &db, SQLITE_OPEN_READONLY, nullptr) == SQLITE_OK);
  std::string out;
  for (const char* t : kV1Tables) {
    sqlite3_stmt* st = nullptr;
    std::string sql = std::string("SELECT * FROM ") + t + " ORDER BY id";
    REQUIRE(sqlite3_prepare_v2(db, sql.c_str(), -1, &st, nullptr) == SQLITE_OK);
    while (sqlite3_step(st) == SQLITE_ROW) {
      out += t;
      for (int c = 0; c < sqlite3_column_count(st); ++c) {
        int type = sqlite3_column_type(st, c);
        out += "|" + std::to_string(type) + ":";
        if (type == SQLITE_BLOB) {
          auto* p = static_cast<const unsigned char*>(sqlite3_column_blob(st, c));
          for (int k = 0; k < sqlite3_column_bytes(st, c); ++k) {
            char hex[3];
            std::snprintf(hex, sizeof hex, "%02x", p[k]);
            out += hex;
          }
        } else if (type != SQLITE_NULL) {
          out += reinterpret_cast<const char*>(sqlite3_column_text(st, c));
        }
      }
      out += "\n";
    }
    sqlite3_finalize(st);
  }
  sqlite3_close(db);
  return out;
}

std::string one_value(const std::string& path, const std::string& sql) {
  sqlite3* db = nullptr;
  sqlite3_open_v2(path.c_str(), &db, SQLITE_OPEN_READONLY, nullptr);
  sqlite3_stmt* st = nullptr;
  std::string v = "<none>";
  if (sqlite3_prepare_v2(db, sql.c_str(), -1, &st, nullptr) == SQLITE_OK &&
      sqlite3_step(st) == SQLITE_ROW && sqlite3_column_text(st, 0) != nullptr) {
    v = reinterpret_cast<const char*>(sqlite3_column_text(st, 0));
  }
  sqlite3_finalize(st);
  sqlite3_close(db);
  return v;
}

int latest_migration() {
  int latest = 0;
  for (const auto& f : embedded::schema_files()) {
    latest = std::max(latest, std::atoi(std::string(f.name).c_str()));
  }
  return latest;
}

}  // namespace

TEST_CASE("a version-1 store upgrades with every old row, hash and the chain head intact") {
  V1Copy v1;
  REQUIRE(one_value(v1.path, "PRAGMA user_version") == "1");
  const std::string before = dump_v1_rows(v1.path);
  REQUIRE(before.find("passes|") != std::string::npos);
  REQUIRE(latest_migration() >= 2);

  for (long long parallel : {0LL, 2LL}) {  // the one-thread walk and the two-half walk
    CAPTURE(parallel);
    Options o;
    o.parallel_check_rows = parallel;
    auto store = open_sqlite_store(v1.path, o);  // upgrades on the first round
    CHECK(store->schema_version() == latest_migration());
    auto check = store->check_chain({});
    CHECK(check.ok);
    CHECK(check.problem == "");
    CHECK(check.rows == kV1Rows);
    CHECK(check.head == kV1Head);
    CHECK(store->head_hash() == kV1Head);
    CHECK(store->row_count() == kV1Rows);
    store.reset();
    CHECK(dump_v1_rows(v1.path) == before);  // no stored value changed
  }
  CHECK(one_value(v1.path, "PRAGMA integrity_check") == "ok");
  CHECK(one_value(v1.path, "PRAGMA foreign_key_check") == "<none>");

  // The old data reads as before through the store: session 1 with its voided pass.
  auto store = open_sqlite_store(v1.path, Options{});
  store->begin_read();
  Session s1 = store->load_session(1);
  store->commit();
  REQUIRE(s1.passes.size() == 3);
  CHECK(s1.passes[1].ticket == "A-1002");
  CHECK(s1.passes[1].voided);
  CHECK(s1.passes[2].drive == 4760);

  // New rows chain on from the old head; the old rows still verify.
  store->begin_write();
  Pass fix = s1.passes[2];
  fix.drive = 4780;
  fix.gross = 15520;
  long long cid = store->correct_pass(9, 1, fix, "drive keyed 4760, ticket shows 4780",
                                      std::string("R. Quill"), "");
  store->commit();
  CHECK(cid == 1);
  auto after = store->check_chain({});
  CHECK(after.ok);
  CHECK(after.rows == kV1Rows + 1);
  CHECK(after.head != kV1Head);
  store.reset();
  CHECK(dump_v1_rows(v1.path) == before);
}

TEST_CASE("after the upgrade the guards refuse what they refused, and passes.kind is checked") {
  V1Copy v1;
  {
    auto store = open_sqlite_store(v1.path, Options{});
    store->begin_write();
    Session s1 = store->load_session(1);
    Pass fix = s1.passes[0];
    fix.steer = 4620;
    fix.gross = 8520;
    store->correct_pass(7, std::nullopt, fix, "steer keyed wrong", std::string("R. Quill"), "");
    store->commit();
  }
  auto raw = [&](const std::string& sql) {
    sqlite3* db = nullptr;
    sqlite3_open(v1.path.c_str(), &db);
    char* err = nullptr;
    int rc = sqlite3_exec(db, sql.c_str(), nullptr, nullptr, &err);
    std::string msg = rc == SQLITE_OK ? "" : (err != nullptr ? err : "error");
    sqlite3_free(err);
    sqlite3_close(db);
    return msg;
  };
  for (const auto& t : chained_tables()) {
    CAPTURE(t.name);
    const std::string name = t.name;
    // A table the upgrade left empty (checkpoints, schema/003) has no row for a guard to
    // refuse; store_append_only_test covers its guards on a table with rows.
    if (one_value(v1.path, "SELECT count(*) FROM " + name) == "0") {
      CHECK(name == "checkpoints");
      continue;
    }
    for (const std::string& sql :
         {"UPDATE " + name + " SET hash = hash", "DELETE FROM " + name,
          "INSERT OR REPLACE INTO " + name + " SELECT * FROM " + name + " LIMIT 1",
          "REPLACE INTO " + name + " SELECT * FROM " + name + " ORDER BY id DESC LIMIT 1"}) {
      CAPTURE(sql);
      CHECK(raw(sql).find("append-only") != std::string::npos);
    }
  }
  // The rewritten CHECK refuses what the old one refused, and its text is the new one.
  std::string bad_kind =
      "INSERT INTO passes (id, hash, session_id, kind, ticket, weighed_at, steer, drive, "
      "entered_at) VALUES (100, zeroblob(32), 1, 'parked', 'Z-1', 'x', 0, 0, 'x')";
  CHECK(raw(bad_kind).find("CHECK constraint failed") != std::string::npos);
  std::string sql = one_value(v1.path, "SELECT sql FROM sqlite_schema WHERE name = 'passes'");
  CHECK(sql.find("kind = 'unhitched' OR kind = 'hitched' OR kind = 'tensioned'") !=
        std::string::npos);
  CHECK(sql.find("kind IN") == std::string::npos);
  CHECK(one_value(v1.path, "PRAGMA integrity_check") == "ok");
  auto store = open_sqlite_store(v1.path, Options{});
  CHECK(store->check_chain({}).ok);
}
