// What the ledger proof reads from the store (sqlite_proof.cpp): the chain head a report
// records, stored hashes, checkpoint rows, and the schema compared with what the migrations make.
#include <doctest/doctest.h>

#include "store/chain.h"
#include "store_fixture.h"

using namespace storetest;

namespace {
Checkpoint unsigned_checkpoint(Store& st) {
  const ChainHead head = st.chain_head();
  Checkpoint c;
  c.rows = head.rows;
  c.head = head.head;
  c.public_key = std::string(64, '0');  // the store checks no signature (audit/ledger_proof.h does)
  c.key_fingerprint = "fp";
  c.signature = std::string(128, '0');
  c.signed_at = "2026-10-14T10:00:00Z";
  return c;
}
}  // namespace

TEST_CASE("chain_head names the rows and the last row's hash, as a report records them") {
  TempStore ts;
  CHECK(ts.store->chain_head().rows == 0);
  CHECK(ts.store->chain_head().head.empty());
  long long s = seed_session(*ts.store);
  add_demo_passes(*ts.store, s);
  const ChainHead h = ts.store->chain_head();
  CHECK(h.rows == ts.store->row_count());
  CHECK(h.head == ts.store->head_hash());
  CHECK(ts.store->stored_hash_at(h.rows) == h.head);
  CHECK_FALSE(ts.store->stored_hash_at(h.rows + 1).has_value());
}

TEST_CASE("a checkpoint is a chained row right after the head it states") {
  TempStore ts;
  long long s = seed_session(*ts.store);
  add_demo_passes(*ts.store, s);
  ts.store->begin_write();
  Checkpoint c = unsigned_checkpoint(*ts.store);
  ts.store->add_checkpoint(c);
  ts.store->commit();
  auto all = ts.store->list_checkpoints();
  REQUIRE(all.size() == 1);
  CHECK(all[0].seq == c.rows + 1);
  CHECK(all[0].head == c.head);
  CHECK(ts.store->latest_checkpoint()->seq == all[0].seq);
  CHECK(ts.store->check_chain({}).ok);
  // Stale: the chain moved since the head was read (regression: a checkpoint must sign its
  // predecessor exactly).
  ts.store->begin_write();
  CHECK_THROWS_AS(ts.store->add_checkpoint(c), sp::Error);
  ts.store->rollback();
}

TEST_CASE("the schema check finds nothing on a fresh store and names each change") {
  struct Case {
    const char* sql;
    const char* name;
    const char* problem;
  };
  const Case cases[] = {
      {"DROP TRIGGER passes_no_update", "passes_no_update", "is missing"},
      {"DROP INDEX sessions_by_rig", "sessions_by_rig", "is missing"},
      {"CREATE TABLE notes (x)", "notes", "was not made by migrations"},
      {"DROP TRIGGER checkpoints_no_delete; CREATE TRIGGER checkpoints_no_delete BEFORE DELETE ON "
       "checkpoints BEGIN SELECT 1; END;",
       "checkpoints_no_delete", "differs"},
      {"PRAGMA application_id = 7", "application_id", "is not scaleproof's"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.sql);
    TempStore ts;
    CHECK(ts.store->check_schema().empty());
    REQUIRE(ts.raw(c.sql).empty());
    auto d = ts.store->check_schema();
    REQUIRE(d.size() == 1);
    CHECK(d[0].name == c.name);
    CHECK(d[0].problem.find(c.problem) != std::string::npos);
  }
  // ANALYZE's statistics tables hold no data of the ledger (sqlite_stat1: SQLite docs, ANALYZE).
  TempStore ts;
  REQUIRE(ts.raw("ANALYZE").empty());
  CHECK(ts.store->check_schema().empty());
}
