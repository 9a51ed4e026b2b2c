// Pass corrections (schema/002): a new chained row supersedes a pass and keeps its ticket;
// the engine's view takes the latest correction, the history shows every one, the chain
// covers them, refusals name the pass and change nothing, CSV carries them.
// The readings are invented demo values (store_fixture.h), multiples of the 20 lb division.
#include <doctest/doctest.h>

#include <functional>
#include <sstream>

#include "format/pass_csv.h"
#include "store/importers.h"
#include "store_fixture.h"

using namespace storetest;

namespace {

// Session 1 with the three demo passes (ids 7, 8, 9: A-1001..A-1003) and session 2 (chain
// position 10) with one pass (id 11, A-2001).
struct Fixture {
  TempStore ts;
  long long s1 = 0, s2 = 0;
  Fixture() {
    s1 = seed_session(*ts.store);
    add_demo_passes(*ts.store, s1);
    ts.store->begin_write();
    NewSession ns;
    ns.rig_id = 1;
    ns.scale_id = 1;
    s2 = ts.store->open_session(ns);
    ts.store->add_pass(s2, make_pass(PassKind::unhitched, "A-2001", 4620, 3880));
    ts.store->commit();
  }
  Pass pass(long long session, size_t k) {
    ts.store->begin_read();
    Pass p = ts.store->load_session(session).passes.at(k);
    ts.store->commit();
    return p;
  }
  long long correct(long long pass_id, const Pass& p, const std::string& reason,
                    std::optional<long long> in_session = std::nullopt) {
    ts.store->begin_write();
    try {
      long long id = ts.store->correct_pass(pass_id, in_session, p, reason, std::string("R. Quill"),
                                            "2026-11-05T10:00:00Z");
      ts.store->commit();
      return id;
    } catch (...) {
      ts.store->rollback();
      throw;
    }
  }
};

long long count(const TempStore& ts, const char* sql) {
  sqlite3* db = nullptr;
  sqlite3_open(ts.path.c_str(), &db);
  sqlite3_stmt* st = nullptr;
  long long n = -1;
  if (sqlite3_prepare_v2(db, sql, -1, &st, nullptr) == SQLITE_OK &&
      sqlite3_step(st) == SQLITE_ROW) {
    n = sqlite3_column_int64(st, 0);
  }
  sqlite3_finalize(st);
  sqlite3_close(db);
  return n;
}

}  // namespace

TEST_CASE("a correction supersedes the pass, keeps its ticket and the old values on record") {
  Fixture f;
  Pass p = f.pass(f.s1, 1);  // A-1002, hitched 4340 / 4960 / 6200
  REQUIRE(p.ticket == "A-1002");
  const std::string head = f.ts.store->head_hash();
  p.drive = 4980;
  f.correct(*p.id, p, "drive keyed 4960, ticket shows 4980");
  Pass q = f.pass(f.s1, 1);
  CHECK(q.id == p.id);
  CHECK(q.ticket == "A-1002");
  CHECK(q.drive == 4980);
  CHECK(q.steer == 4340);
  // Corrected again: the latest counts; both corrections stay, each with what it superseded.
  q.steer = 4360;
  q.drive = 4960;
  f.correct(*q.id, q, "steer keyed 4340; drive was right after all");
  Pass r = f.pass(f.s1, 1);
  CHECK(r.steer == 4360);
  CHECK(r.drive == 4960);
  f.ts.store->begin_read();
  auto h = f.ts.store->session_history(f.s1);
  f.ts.store->commit();
  REQUIRE(h.pass_corrections.size() == 2);
  CHECK(h.pass_corrections[0].ticket == "A-1002");
  CHECK(h.pass_corrections[0].was.drive == 4960);
  CHECK(h.pass_corrections[0].now.drive == 4980);
  CHECK(h.pass_corrections[1].was.drive == 4980);
  CHECK(h.pass_corrections[1].now.steer == 4360);
  CHECK(h.pass_corrections[1].made_by == "R. Quill");
  CHECK(h.pass_corrections[1].made_at == "2026-11-05T10:00:00Z");
  // The pass row itself is as first keyed; the chain covers the two new rows.
  auto c = f.ts.store->check_chain({});
  CHECK(c.ok);
  CHECK(c.rows == 13);
  CHECK(c.head != head);
  CHECK(count(f.ts, "SELECT count(*) FROM passes WHERE id = 8 AND drive = 4960 AND steer = 4340") ==
        1);
  // for_each_session (reconcile --all, audits) reads the same corrected view.
  std::vector<Session> all;
  f.ts.store->begin_read();
  f.ts.store->for_each_session([&](const Session& s) { all.push_back(s); });
  f.ts.store->commit();
  REQUIRE(all.size() == 2);
  REQUIRE(all[0].passes.size() == 3);
  CHECK(all[0].passes[1].steer == 4360);
  CHECK(all[0].passes[1].drive == 4960);
  CHECK(all[0].passes[0].steer == 4600);  // an uncorrected pass reads as stored
  // Tampering with a correction row is found at that row.
  REQUIRE(f.ts.raw("DROP TRIGGER pass_corrections_no_update") == "");
  REQUIRE(f.ts.raw("UPDATE pass_corrections SET drive = 4900 WHERE id = 1") == "");
  auto bad = f.ts.store->check_chain({});
  CHECK_FALSE(bad.ok);
  CHECK(bad.table == "pass_corrections");
  CHECK(bad.id == 1);
}

TEST_CASE("refused corrections name the pass and store nothing") {
  struct Row {
    const char* what;
    long long pass_id;
    std::optional<long long> in_session;
    std::function<void(Pass&)> edit;
    const char* reason;
    ExitCode code;
    const char* message;
  };
  auto drive = [](Pass& p) { p.drive += 20; };
  const Row rows[] = {
      {"no such pass", 99, std::nullopt, drive, "x", ExitCode::no_input,
       "pass 99: not in the store"},
      {"another session's pass", 11, 1, drive, "x", ExitCode::data_error,
       "pass 11 (ticket A-2001): it is in session 2, not session 1"},
      {"a voided pass", 9, std::nullopt, drive, "x", ExitCode::data_error,
       "pass 9 (ticket A-1003): it is voided (keyed twice); a voided pass cannot be corrected"},
      {"an empty reason", 7, std::nullopt, drive, "", ExitCode::data_error,
       "pass 7 (ticket A-1001): a correction needs a reason"},
      {"another ticket", 7, std::nullopt, [](Pass& p) { p.ticket = "A-1009"; }, "x",
       ExitCode::data_error, "a correction keeps the ticket number, got ticket A-1009"},
      {"nothing changes", 7, std::nullopt, [](Pass&) {}, "x", ExitCode::data_error,
       "the correction changes nothing"},
      {"not a multiple of the division", 7, std::nullopt, [](Pass& p) { p.drive = 3910; }, "x",
       ExitCode::data_error,
       "correction of pass 7: ticket A-1001, pass unhitched: drive: reading 3910 lb is "
       "not a multiple of the scale division 20 lb"},
      {"gross no longer the sum", 7, std::nullopt,
       [](Pass& p) {
         p.gross = 8500;
         p.steer = 4620;
       },
       "x", ExitCode::data_error, "printed gross 8500 lb is not the sum"},
      {"unhitched with a trailer reading", 7, std::nullopt, [](Pass& p) { p.trailer = 200; }, "x",
       ExitCode::data_error, "expected no trailer reading (or 0) on an unhitched pass"},
      {"a closed session", 11, std::nullopt, drive, "x", ExitCode::data_error,
       "session 2 is closed; its passes can no longer be corrected"},
  };
  for (const Row& r : rows) {
    std::string what = r.what;
    CAPTURE(what);
    Fixture f;
    f.ts.store->begin_write();
    f.ts.store->void_pass(9, "keyed twice", std::nullopt, "");
    f.ts.store->close_session(f.s2, std::nullopt, "");
    f.ts.store->commit();
    Pass p;
    if (r.pass_id == 11) {
      p = f.pass(f.s2, 0);
    } else if (r.pass_id >= 7 && r.pass_id <= 9) {
      p = f.pass(f.s1, static_cast<size_t>(r.pass_id - 7));
    } else {
      p = f.pass(f.s1, 0);
    }
    r.edit(p);
    const std::string head = f.ts.store->head_hash();
    try {
      f.correct(r.pass_id, p, r.reason, r.in_session);
      FAIL("expected a refusal");
    } catch (const Error& e) {
      CAPTURE(e.what());
      CHECK(e.code() == r.code);
      CHECK(std::string(e.what()).find(r.message) != std::string::npos);
    }
    CHECK(f.ts.store->head_hash() == head);
  }
}

TEST_CASE("CSV carries corrections: import, export rows, import again, same view") {
  Fixture f;
  const std::string text =
      "session,scale,rig,kind,setting,ticket,weighed_at,steer,drive,trailer,gross,entered_by,"
      "entered_at,void_reason,correction_reason\n"
      "K-9,ST-3,heron-wren,unhitched,,B-1,2026-11-06T09:00:00-06:00,4600,3900,,8500,,,,\n"
      "K-9,ST-3,heron-wren,hitched,,B-2,2026-11-06T09:10:00-06:00,4340,4960,6200,15500,,,,\n"
      "K-9,,,hitched,,B-2,2026-11-06T09:10:00-06:00,4340,4980,6200,15520,T. Ashdown,"
      "2026-11-06T10:00:00-06:00,,\"drive keyed 4960, ticket 4980\"\n"
      "K-9,,,hitched,,B-2,2026-11-06T09:10:00-06:00,4360,4980,6200,15540,T. Ashdown,"
      "2026-11-06T10:05:00-06:00,truck off the steer platform,steer keyed 4340\n"
      "K-9,,,tensioned,4,B-3,2026-11-06T09:20:00-06:00,4460,4760,6280,15500,,,,\n";
  std::istringstream in(text);
  f.ts.store->begin_write();
  auto st = import_pass_csv(*f.ts.store, in, "in.csv", std::string("importer"));
  f.ts.store->commit();
  CHECK(st.passes == 3);
  CHECK(st.corrected == 2);
  CHECK(st.voided == 1);
  auto id = f.ts.store->find_session_by_ref("K-9");
  REQUIRE(id);
  f.ts.store->begin_read();
  auto h = f.ts.store->session_history(*id);
  f.ts.store->commit();
  REQUIRE(h.session.passes.size() == 3);
  CHECK(h.session.passes[1].steer == 4360);
  CHECK(h.session.passes[1].voided);
  REQUIRE(h.pass_corrections.size() == 2);
  CHECK(h.pass_corrections[0].made_by == "T. Ashdown");
  CHECK(h.pass_corrections[0].reason == "drive keyed 4960, ticket 4980");
  // Export as `export --format csv` does, into a fresh store, and compare.
  const std::string out = export_pass_csv(h);
  CHECK(out.find("\"drive keyed 4960, ticket 4980\"") != std::string::npos);
  Fixture g;
  std::istringstream back(out);
  g.ts.store->begin_write();
  auto st2 = import_pass_csv(*g.ts.store, back, "out.csv", std::string("importer"));
  g.ts.store->commit();
  CHECK(st2.corrected == 2);
  auto id2 = g.ts.store->find_session_by_ref("K-9");
  REQUIRE(id2);
  g.ts.store->begin_read();
  auto h2 = g.ts.store->session_history(*id2);
  g.ts.store->commit();
  REQUIRE(h2.session.passes.size() == 3);
  REQUIRE(h2.pass_corrections.size() == 2);
  for (size_t k = 0; k < 3; ++k) {
    CAPTURE(k);
    const Pass& a = h.session.passes[k];
    const Pass& b = h2.session.passes[k];
    CHECK(a.ticket == b.ticket);
    CHECK(a.steer == b.steer);
    CHECK(a.drive == b.drive);
    CHECK(a.gross == b.gross);
    CHECK(a.voided == b.voided);
    CHECK(a.void_reason == b.void_reason);
  }
  for (size_t k = 0; k < 2; ++k) {
    CAPTURE(k);
    CHECK(h.pass_corrections[k].reason == h2.pass_corrections[k].reason);
    CHECK(h.pass_corrections[k].made_by == h2.pass_corrections[k].made_by);
    CHECK(h.pass_corrections[k].made_at == h2.pass_corrections[k].made_at);
    CHECK(h.pass_corrections[k].was.steer == h2.pass_corrections[k].was.steer);
    CHECK(h.pass_corrections[k].now.drive == h2.pass_corrections[k].now.drive);
  }
  CHECK(g.ts.store->check_chain({}).ok);
}

TEST_CASE("a CSV correction row without its pass, or of a voided pass, names the line") {
  struct Row {
    const char* what;
    std::string body;
    const char* message;
  };
  const std::string h =
      "session,scale,rig,kind,ticket,weighed_at,steer,drive,void_reason,correction_reason\n";
  const std::string first =
      "K-9,ST-3,heron-wren,unhitched,B-1,2026-11-06T09:00:00-06:00,4600,3900,,\n";
  const Row rows[] = {
      {"no pass with the ticket",
       first + "K-9,,,unhitched,B-7,2026-11-06T09:00:00-06:00,4600,3920,,fix\n",
       "in.csv:3: correction_reason: ticket B-7 has no pass in session K-9 to correct"},
      {"a voided pass",
       "session,scale,rig,kind,ticket,weighed_at,steer,drive,void_reason,correction_reason\n"
       "K-9,ST-3,heron-wren,unhitched,B-1,2026-11-06T09:00:00-06:00,4600,3900,gone,\n"
       "K-9,,,unhitched,B-1,2026-11-06T09:00:00-06:00,4600,3920,,fix\n",
       "in.csv:3: pass 13 (ticket B-1): it is voided"},
      {"changes nothing", first + "K-9,,,unhitched,B-1,2026-11-06T09:00:00-06:00,4600,3900,,fix\n",
       "in.csv:3: pass 13 (ticket B-1): the correction changes nothing"},
  };
  for (const Row& r : rows) {
    std::string what = r.what;
    CAPTURE(what);
    Fixture f;
    const std::string head = f.ts.store->head_hash();
    std::istringstream in(r.body.rfind("session,", 0) == 0 ? r.body : h + r.body);
    f.ts.store->begin_write();
    try {
      import_pass_csv(*f.ts.store, in, "in.csv", std::nullopt);
      FAIL("expected a refusal");
    } catch (const Error& e) {
      CAPTURE(e.what());
      CHECK(e.code() == ExitCode::data_error);
      CHECK(std::string(e.what()).find(r.message) != std::string::npos);
    }
    f.ts.store->rollback();
    CHECK(f.ts.store->head_hash() == head);
  }
}
