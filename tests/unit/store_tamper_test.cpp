// Tampering behind the tool's back (a plain SQLite connection with the triggers dropped, as
// with the stock sqlite3 shell) is found by check_chain at the right row.
#include <doctest/doctest.h>

#include "store_fixture.h"

using namespace storetest;

namespace {

const char* kDropTriggers =
    "DROP TRIGGER passes_no_update; DROP TRIGGER passes_no_delete; "
    "DROP TRIGGER sessions_no_update; DROP TRIGGER scales_no_update;";

}  // namespace

TEST_CASE("check_chain finds each kind of tampering at the first bad row") {
  struct Row {
    const char* what;
    std::string sql;
    const char* table;
    long long id;
    std::optional<std::string> ticket;
    const char* problem;
  };
  // Rows of the seeded store, in chain order: 1 scale, 2 inspection, 3 vehicle, 4 trailer,
  // 5 rig, 6 session, 7..9 passes A-1001..A-1003.
  const Row rows[] = {
      {"edit a reading", "UPDATE passes SET drive = 4780 WHERE id = 8", "passes", 8, "A-1002",
       "does not match"},
      {"edit the scale division", "UPDATE scales SET division = 10 WHERE id = 1", "scales", 1,
       std::nullopt, "does not match"},
      {"delete a pass", "DELETE FROM passes WHERE id = 8", "passes", 9, "A-1003", "missing"},
      {"reorder (swap two tickets)",
       "UPDATE passes SET ticket = 'X' WHERE id = 8; UPDATE passes SET ticket = 'A-1002' "
       "WHERE id = 9; UPDATE passes SET ticket = 'A-1003' WHERE id = 8;",
       "passes", 8, "A-1003", "does not match"},
      {"reorder (swap positions)",
       "UPDATE sessions SET seq = 60 WHERE id = 1; UPDATE scales SET seq = 6 WHERE id = 1; "
       "UPDATE sessions SET seq = 1 WHERE id = 1;",
       "sessions", 1, std::nullopt, "does not match"},
      {"a row slipped in before the chain's start", "UPDATE passes SET id = -5 WHERE id = 9",
       "passes", -5, "A-1003", "outside the chain"},
      {"forge a hash", "UPDATE passes SET hash = zeroblob(32) WHERE id = 8", "passes", 8,
       "A-1002", "does not match"},
      {"edit and recompute the row's own hash (the next row's link breaks)",
       "UPDATE passes SET hash = (SELECT hash FROM passes WHERE id = 7) WHERE id = 8", "passes",
       8, "A-1002", "does not match"},
      {"edit a time", "UPDATE passes SET weighed_at = '2026-11-03T09:15:00-06:00' WHERE id = 9",
       "passes", 9, "A-1003", "does not match"},
  };
  // Each case on the one-thread walk (0) and on the two-half walk (2: any chain of 2 rows or
  // more), which must fall back and name the same row in the same words.
  for (long long parallel : {0LL, 2LL})
  for (const Row& r : rows) {
    std::string what = r.what;
    CAPTURE(what);
    CAPTURE(parallel);
    TempStore ts(parallel);
    long long s = seed_session(*ts.store);
    add_demo_passes(*ts.store, s);
    auto clean = ts.store->check_chain({});
    REQUIRE(clean.ok);
    CHECK(clean.rows == 9);
    CHECK(clean.head == ts.store->head_hash());
    REQUIRE(ts.raw(kDropTriggers) == "");
    REQUIRE(ts.raw(r.sql) == "");
    auto c = ts.store->check_chain({});
    CHECK_FALSE(c.ok);
    CHECK(c.table == r.table);
    CHECK(c.id == r.id);
    CHECK(c.ticket == r.ticket);
    CHECK(c.problem.find(r.problem) != std::string::npos);
    CHECK(c.walkers == 1);  // findings always come from the one-thread walk
  }
}

// A value of the wrong storage type can only come from editing below SQL (the tables are
// STRICT, which refuses one: sqlite.org/stricttables.html); here the schema text is edited to drop STRICT, as a raw file edit could. The finding
// must name the column and both types, on the one-thread walk and through the two-half walk's
// fallback alike.
TEST_CASE("check_chain names a column holding the wrong storage type") {
  for (long long parallel : {0LL, 2LL}) {
    CAPTURE(parallel);
    TempStore ts(parallel);
    long long s = seed_session(*ts.store);
    add_demo_passes(*ts.store, s);
    REQUIRE(ts.store->check_chain({}).ok);
    REQUIRE(ts.raw(kDropTriggers) == "");
    // 1000: above any schema cookie of a fresh store, so every connection reloads the schema.
    REQUIRE(ts.raw("PRAGMA writable_schema = ON; UPDATE sqlite_schema SET sql = "
                   "replace(sql, ') STRICT', ')') WHERE name = 'passes'; "
                   "PRAGMA schema_version = 1000;") == "");
    REQUIRE(ts.raw("UPDATE passes SET drive = 'heavy' WHERE id = 8") == "");
    auto c = ts.store->check_chain({});
    CHECK_FALSE(c.ok);
    CHECK(c.table == "passes");
    CHECK(c.id == 8);
    CHECK(c.seq == 8);
    CHECK(c.ticket == std::optional<std::string>("A-1002"));
    CHECK(c.problem == "column drive holds TEXT where REAL was stored");
    CHECK(c.rows == 7);
    CHECK(c.walkers == 1);
  }
}

TEST_CASE("a forged hash that fits its own row breaks the next row's link") {
  TempStore ts;
  long long s = seed_session(*ts.store);
  add_demo_passes(*ts.store, s);
  // Edit pass 8 and give it the hash the tool would have computed for the edited content:
  // build it by appending the edited pass to a second store seeded identically.
  TempStore twin;
  long long s2 = seed_session(*twin.store);
  twin.store->begin_write();
  twin.store->add_pass(s2, make_pass(PassKind::unhitched, "A-1001", 4600, 3900));
  Pass edited = make_pass(PassKind::hitched, "A-1002", 4340, 4780, 6200);
  // entered_at must match too: copy the original's.
  edited.entered_at = ts.store->load_session(s).passes[1].entered_at;
  twin.store->add_pass(s2, edited);
  twin.store->commit();
  std::string forged = twin.store->head_hash();
  REQUIRE(ts.raw(kDropTriggers) == "");
  // Same timestamps needed for the first pass too; only proceed when the twin's first seven
  // rows equal ours (same second), else the test would not be about a valid forgery.
  auto ours = ts.store->check_chain({});
  REQUIRE(ours.ok);
  REQUIRE(ts.raw("UPDATE passes SET drive = 4780, hash = X'" + forged + "' WHERE id = 8") == "");
  auto c = ts.store->check_chain({});
  CHECK_FALSE(c.ok);
  // Either row 8 (when the twin's earlier rows differ in time) or row 9 (a true forgery).
  CHECK(c.table == "passes");
  CHECK((c.id == 8 || c.id == 9));
  if (c.id == 9) CHECK(c.problem.find("previous row") != std::string::npos);
}

// Guards the two-half walk of check_chain: on an intact chain it reports what the one-thread
// walk reports (rows and head), for chains of odd and even length.
TEST_CASE("check_chain in two halves agrees with one walk") {
  for (int extra : {0, 1}) {
    CAPTURE(extra);
    TempStore ts(2);
    long long s = seed_session(*ts.store);
    add_demo_passes(*ts.store, s);
    if (extra != 0) {
      ts.store->begin_write();
      ts.store->add_pass(s, make_pass(PassKind::tensioned, "A-1004", 4480, 4740, 6280, "5"));
      ts.store->commit();
    }
    Options one;
    one.parallel_check_rows = 0;
    auto single = open_sqlite_store(ts.path, one);
    ChainCheck a = ts.store->check_chain({});
    ChainCheck b = single->check_chain({});
    CHECK(a.ok);
    CHECK(b.ok);
    CHECK(a.rows == b.rows);
    CHECK(a.rows == 9 + extra);
    CHECK(a.head == b.head);
    CHECK(a.head == ts.store->head_hash());
    CHECK(a.walkers == 2);  // the two-half walk answered, not its fallback
    CHECK(b.walkers == 1);
  }
}
