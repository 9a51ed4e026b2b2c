// Append-only: every table refuses UPDATE, DELETE and INSERT OR REPLACE, both through a
// plain connection (like the sqlite3 shell) and through the store's own connection settings.
#include <doctest/doctest.h>

#include "store/chain.h"
#include "store_fixture.h"

using namespace storetest;

TEST_CASE("every chained table refuses update, delete and replace") {
  TempStore ts;
  long long s = seed_session(*ts.store);
  add_demo_passes(*ts.store, s);
  ts.store->begin_write();
  ts.store->void_pass(*ts.store->load_session(s).passes[0].id, "keyed twice",
                      std::string("R. Quill"), "");
  Pass fix = ts.store->load_session(s).passes[1];
  fix.drive = 4980;
  ts.store->correct_pass(*fix.id, s, fix, "drive keyed 4960, ticket shows 4980",
                         std::string("R. Quill"), "");
  Inspection in;
  in.scale_id = 1;
  in.inspected_on = "2026-09-01";
  in.seal = "SEAL-0042";
  ts.store->add_inspection(in);
  ts.store->close_session(s, std::string("R. Quill"), "");
  IssuedReport rep{0, s, "WR-0001", std::string(64, 'a'), "fp:1234", std::string("R. Quill"), ""};
  ts.store->record_report(rep);
  // A checkpoint row, so the checkpoints table has a row to refuse changing (the store does not
  // check signatures; an all-zero one does here).
  Checkpoint cp;
  const ChainHead head = ts.store->chain_head();
  cp.rows = head.rows;
  cp.head = head.head;
  cp.public_key = std::string(64, '0');
  cp.key_fingerprint = "fp:1234";
  cp.signature = std::string(128, '0');
  cp.signed_at = "2026-10-14T10:00:00Z";
  ts.store->add_checkpoint(cp);
  ts.store->commit();
  for (const auto& t : chained_tables()) {
    CAPTURE(t.name);
    std::string first = t.columns[0].name;
    std::string update = std::string("UPDATE ") + t.name + " SET hash = hash";
    std::string del = std::string("DELETE FROM ") + t.name;
    std::string cols, vals;
    std::string replace =
        std::string("INSERT OR REPLACE INTO ") + t.name + " SELECT * FROM " + t.name + " LIMIT 1";
    for (const std::string& sql : {update, del, replace}) {
      CAPTURE(sql);
      std::string err = ts.raw(sql);
      CHECK(err.find("append-only") != std::string::npos);
    }
  }
  CHECK(ts.store->check_chain({}).ok);
}

// `import` lifts the passes' and sessions' INSERT guards inside its own write transaction
// (Store::begin_bulk): whatever it commits or rolls back, the store keeps every guard, with
// the same SQL text (check_schema), and a stock connection's INSERT OR REPLACE is refused.
TEST_CASE("bulk import: the INSERT guards are back after commit and after rollback") {
  TempStore ts;
  long long s = seed_session(*ts.store);
  add_demo_passes(*ts.store, s);
  auto guards_and_refusal = [&ts] {
    ts.store->begin_read();
    CHECK(ts.store->check_schema().empty());
    ts.store->commit();
    for (const char* t : {"passes", "sessions"}) {
      CAPTURE(t);
      const std::string err =
          ts.raw(std::string("INSERT OR REPLACE INTO ") + t + " SELECT * FROM " + t + " LIMIT 1");
      CHECK(err.find("append-only") != std::string::npos);
    }
  };
  // Rolled back (a refused import): the drop is undone with everything else.
  ts.store->begin_write();
  ts.store->begin_bulk();
  ts.store->rollback();
  guards_and_refusal();
  // Committed: the guards are put back before COMMIT.
  ts.store->begin_write();
  ts.store->begin_bulk();
  Pass p = ts.store->load_session(s).passes[0];
  p.ticket = "T-bulk-1";
  p.id.reset();
  ts.store->add_passes(s, {p});
  ts.store->commit();
  guards_and_refusal();
  CHECK(ts.store->check_chain({}).ok);
  // Inside the bulk transaction the store's own plain INSERT still refuses a stored key.
  ts.store->begin_write();
  ts.store->begin_bulk();
  CHECK_THROWS_AS(ts.store->add_passes(s, {p}), Error);
  ts.store->rollback();
  guards_and_refusal();
}
