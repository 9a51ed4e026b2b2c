// Migrations: from empty to the latest version, idempotent re-open, refusal of files that are
// not stores or are newer than this build.
#include <doctest/doctest.h>

#include "core/embedded.h"
#include "store_fixture.h"

using namespace storetest;

TEST_CASE("migrations from empty reach the last migration's number") {
  TempStore ts;
  int latest = 0;
  for (const auto& f : embedded::schema_files()) {
    latest = std::max(latest, std::atoi(std::string(f.name).c_str()));
  }
  CHECK(latest >= 1);
  CHECK(ts.store->schema_version() == latest);
  CHECK(ts.store->row_count() == 0);
  CHECK(ts.store->head_hash().empty());
  // Re-opening applies nothing and keeps the version.
  ts.store.reset();
  ts.store = open_sqlite_store(ts.path, Options{});
  CHECK(ts.store->schema_version() == latest);
  auto check = ts.store->check_chain({});
  CHECK(check.ok);
  CHECK(check.rows == 0);
}

TEST_CASE("opening refuses a missing store, a foreign database and a newer schema") {
  TempStore ts;
  ts.store.reset();
  struct Row {
    const char* what;
    std::string path;
    std::string setup;  // raw SQL on the file first
    ExitCode code;
    const char* message;
  };
  std::string other = ts.dir + "/other.db";
  std::string newer = ts.dir + "/newer.db";
  {
    sqlite3* db = nullptr;
    sqlite3_open(other.c_str(), &db);
    sqlite3_exec(db, "CREATE TABLE t(x)", nullptr, nullptr, nullptr);
    sqlite3_close(db);
    sqlite3_open(newer.c_str(), &db);
    sqlite3_exec(db, "PRAGMA user_version = 999", nullptr, nullptr, nullptr);
    sqlite3_close(db);
  }
  const Row rows[] = {
      {"missing file", ts.dir + "/none.db", "", ExitCode::no_input, "scaleproof init"},
      {"foreign database", other, "", ExitCode::data_error, "not a scaleproof store"},
      {"newer schema", newer, "", ExitCode::data_error, "newer than this scaleproof"},
  };
  for (const Row& r : rows) {
    std::string what = r.what;
    CAPTURE(what);
    try {
      open_sqlite_store(r.path, Options{});
      FAIL("expected an error");
    } catch (const Error& e) {
      CHECK(e.code() == r.code);
      CHECK(std::string(e.what()).find(r.message) != std::string::npos);
    }
  }
  std::remove(other.c_str());
  std::remove(newer.c_str());
}

TEST_CASE("a store opens in WAL mode and passes PRAGMA integrity_check") {
  TempStore ts;
  long long s = seed_session(*ts.store);
  add_demo_passes(*ts.store, s);
  sqlite3* db = nullptr;
  sqlite3_open(ts.path.c_str(), &db);
  auto one = [&](const char* sql) {
    sqlite3_stmt* st = nullptr;
    sqlite3_prepare_v2(db, sql, -1, &st, nullptr);
    sqlite3_step(st);
    std::string v = reinterpret_cast<const char*>(sqlite3_column_text(st, 0));
    sqlite3_finalize(st);
    return v;
  };
  CHECK(one("PRAGMA journal_mode") == "wal");
  CHECK(one("PRAGMA integrity_check") == "ok");
  sqlite3_close(db);
}
