// Logging passes: the checks each pass must meet, corrections (voids) and the corrected view
// the engine gets, closed sessions, issued reports, streaming over all sessions.
#include <doctest/doctest.h>

#include "engine/reconcile.h"
#include "store/pass_rules.h"
#include "store_fixture.h"

using namespace storetest;

TEST_CASE("add_pass refuses passes that break the rules, naming ticket and platform") {
  struct Row {
    const char* what;
    Pass pass;
    const char* message;
  };
  Pass gross_bad = make_pass(PassKind::hitched, "B-2", 4340, 4960, 6200);
  gross_bad.gross = 15520;
  Pass gross_ok = make_pass(PassKind::hitched, "B-3", 4340, 4960, 6200);
  gross_ok.gross = 15500;
  const Row rows[] = {
      // A scale indicates in whole divisions (NIST Handbook 44 §2.20; d = 20 lb here).
      {"not a multiple of d", make_pass(PassKind::tensioned, "B-1042", 4460, 4705, 6280, "4"),
       "ticket B-1042, pass tensioned: drive: reading 4705 lb is not a multiple of the "
       "scale division 20 lb"},
      {"negative", make_pass(PassKind::unhitched, "B-1", -20, 3900),
       "steer: expected a weight between 0 and 200000 lb, got -20"},
      {"above capacity", make_pass(PassKind::unhitched, "B-1", 4600, 60020),
       "above the scale capacity of 60000 lb"},
      // The printed gross of a three-platform ticket is the sum (common practice).
      {"gross not the sum", gross_bad, "is not the sum of the platforms"},
      {"trailer on unhitched", make_pass(PassKind::unhitched, "B-4", 4600, 3900, 20),
       "trailer: expected no trailer reading (or 0) on an unhitched pass"},
      {"no trailer on hitched", make_pass(PassKind::hitched, "B-5", 4340, 4960),
       "trailer: missing required field 'trailer': a hitched pass needs"},
      {"tensioned without setting", make_pass(PassKind::tensioned, "B-6", 4460, 4760, 6280),
       "setting: missing required field 'setting': a tensioned pass needs"},
      {"setting on hitched", make_pass(PassKind::hitched, "B-7", 4340, 4960, 6200, "2"),
       "setting: a bar setting belongs only on a tensioned pass"},
      {"duplicate ticket", make_pass(PassKind::unhitched, "A-1001", 4600, 3900),
       "ticket A-1001: already in session 1"},
  };
  TempStore ts;
  long long s = seed_session(*ts.store);
  add_demo_passes(*ts.store, s);
  std::string head = ts.store->head_hash();
  for (const Row& r : rows) {
    std::string what = r.what;
    CAPTURE(what);
    ts.store->begin_write();
    try {
      ts.store->add_pass(s, r.pass);
      FAIL("expected a refusal");
    } catch (const Error& e) {
      CHECK(e.code() == ExitCode::data_error);
      std::string msg = e.what();
      CAPTURE(msg);
      CHECK(std::string(e.what()).find(r.message) != std::string::npos);
    }
    ts.store->rollback();
    CHECK(ts.store->head_hash() == head);
  }
  ts.store->begin_write();
  CHECK(ts.store->add_pass(s, gross_ok) == 10);
  ts.store->commit();
}

TEST_CASE("a void changes the reconciled result and keeps the history") {
  TempStore ts;
  long long s = seed_session(*ts.store);
  add_demo_passes(*ts.store, s);
  // A second tensioned pass keyed with a wrong drive reading (4960 for 4760).
  ts.store->begin_write();
  long long bad = ts.store->add_pass(
      s, make_pass(PassKind::tensioned, "A-1004", 4460, 4960, 6280, "4b"));
  ts.store->commit();
  Session before = ts.store->load_session(s);
  REQUIRE(before.passes.size() == 4);
  ReconcileResult r1 = reconcile(before);
  ts.store->begin_write();
  ts.store->void_pass(bad, "drive reading keyed wrong; ticket shows 4760",
                      std::string("R. Quill"), "2026-11-03T10:00:00-06:00");
  ts.store->commit();
  Session after = ts.store->load_session(s);
  REQUIRE(after.passes.size() == 4);  // the voided pass stays in the record
  CHECK(after.passes[3].voided);
  CHECK(after.passes[3].void_reason == "drive reading keyed wrong; ticket shows 4760");
  ReconcileResult r2 = reconcile(after);
  CHECK(r1.tensioned.size() == 2);
  CHECK(r2.tensioned.size() == 1);
  REQUIRE(r1.fit);
  REQUIRE(r2.fit);
  CHECK(r2.fit->chi_square < r1.fit->chi_square);
  auto h = ts.store->session_history(s);
  REQUIRE(h.corrections.size() == 1);
  CHECK(h.corrections[0].ticket == "A-1004");
  CHECK(h.corrections[0].made_at == "2026-11-03T10:00:00-06:00");
  // Voiding twice is refused; the chain stays intact.
  ts.store->begin_write();
  CHECK_THROWS_WITH_AS(ts.store->void_pass(bad, "again", std::nullopt, ""),
                       doctest::Contains("already voided"), Error);
  ts.store->rollback();
  CHECK(ts.store->check_chain({}).ok);
}

TEST_CASE("a closed session takes no more passes; reports are recorded and listed") {
  TempStore ts;
  long long s = seed_session(*ts.store);
  add_demo_passes(*ts.store, s);
  ts.store->begin_write();
  ts.store->close_session(s, std::string("R. Quill"), "");
  ts.store->commit();
  ts.store->begin_write();
  CHECK_THROWS_WITH_AS(ts.store->add_pass(s, make_pass(PassKind::unhitched, "A-2", 4600, 3900)),
                       doctest::Contains("is closed"), Error);
  ts.store->rollback();
  ts.store->begin_write();
  IssuedReport rep{0, s, "WR-2026-0001", std::string(64, 'c'), "ed25519:5f3a", std::string("R. Quill"),
                   "2026-11-03T11:00:00-06:00"};
  ts.store->record_report(rep);
  CHECK_THROWS_WITH_AS(ts.store->record_report(rep), doctest::Contains("already recorded"), Error);
  ts.store->commit();
  auto reps = ts.store->list_reports(s);
  REQUIRE(reps.size() == 1);
  CHECK(reps[0].report_id == "WR-2026-0001");
  CHECK(reps[0].issued_at == "2026-11-03T11:00:00-06:00");
  auto h = ts.store->session_history(s);
  CHECK(h.closed_at.has_value());
  CHECK(h.inspections.size() == 1);
  CHECK(h.inspections[0].inspected_on == "2026-03-14");
  CHECK(h.session.scale.last_inspected == "2026-03-14");
  auto list = ts.store->list_sessions();
  REQUIRE(list.size() == 1);
  CHECK(list[0].passes == 3);
  CHECK(list[0].closed_at.has_value());
}

TEST_CASE("for_each_session streams every session in id order") {
  TempStore ts;
  seed_session(*ts.store);
  ts.store->begin_write();
  for (int k = 0; k < 2100; ++k) {  // more than one page of 1024
    NewSession ns;
    ns.rig_id = 1;
    ns.scale_id = 1;
    ns.ref = "S-" + std::to_string(k);
    long long id = ts.store->open_session(ns);
    ts.store->add_pass(id, make_pass(PassKind::unhitched, "T-" + std::to_string(k), 4600, 3900));
  }
  ts.store->commit();
  ts.store->begin_read();
  long long n = 0, last = 0;
  ts.store->for_each_session([&](const Session& s) {
    ++n;
    CHECK(*s.session_id > last);
    last = *s.session_id;
  });
  ts.store->commit();
  CHECK(n == 2101);
  CHECK(ts.store->check_chain({}).rows == 6 + 2100 * 2);
}

TEST_CASE("sessions refuse a scale and rig in different weight units") {
  TempStore ts;
  seed_session(*ts.store);
  ts.store->begin_write();
  ScaleInfo kg = demo_scale("ST-9");
  kg.division = 10;
  kg.capacity.reset();
  long long sc = ts.store->add_scale(kg, WeightUnit::kg, std::nullopt, "");
  NewSession ns;
  ns.rig_id = 1;
  ns.scale_id = sc;
  CHECK_THROWS_WITH_AS(ts.store->open_session(ns), doctest::Contains("use one weight unit"), Error);
  ts.store->rollback();
}

// Guards the import's batched path (Store::add_passes, one INSERT for several rows): it must
// store exactly what add_pass would, chain included, and a batch that fails must leave no trace.
TEST_CASE("add_passes stores a batch like add_pass, and a failed batch leaves no trace") {
  TempStore ts;
  long long session = seed_session(*ts.store);
  std::vector<Pass> batch = {
      make_pass(PassKind::unhitched, "A-1001", 4600, 3900),
      make_pass(PassKind::hitched, "A-1002", 4340, 4960, 6200),
      make_pass(PassKind::tensioned, "A-1003", 4460, 4760, 6280, "4"),
  };
  ts.store->begin_write();
  std::vector<long long> ids = ts.store->add_passes(session, batch);
  ts.store->commit();
  REQUIRE(ids.size() == 3);
  CHECK(ids[1] == ids[0] + 1);
  CHECK(ids[2] == ids[0] + 2);
  ChainCheck c = ts.store->check_chain();
  CHECK(c.ok);
  Session s = ts.store->load_session(session);
  REQUIRE(s.passes.size() == 3);
  for (size_t k = 0; k < 3; ++k) {
    CAPTURE(k);
    CHECK(s.passes[k].ticket == batch[k].ticket);
    CHECK(s.passes[k].steer == batch[k].steer);
    CHECK(s.passes[k].trailer == batch[k].trailer);
    CHECK(s.passes[k].setting == batch[k].setting);
  }
  // One pass after a batch continues the same chain.
  ts.store->begin_write();
  long long next = ts.store->add_pass(session, make_pass(PassKind::tensioned, "A-1004", 4480,
                                                         4740, 6280, "5"));
  ts.store->commit();
  CHECK(next == ids[2] + 1);
  CHECK(ts.store->check_chain().ok);

  // A batch whose last row repeats a ticket: the statement fails as a whole.
  std::string head = ts.store->head_hash();
  std::vector<Pass> bad = {make_pass(PassKind::tensioned, "A-1005", 4480, 4740, 6280, "6"),
                           make_pass(PassKind::unhitched, "A-1001", 4600, 3900)};
  ts.store->begin_write();
  CHECK_THROWS_AS(ts.store->add_passes(session, bad), Error);
  // The store stays usable in the same transaction and the chain did not advance.
  long long after = ts.store->add_pass(session, bad.front());
  ts.store->commit();
  CHECK(after == next + 1);
  CHECK(ts.store->check_chain().ok);
  CHECK(ts.store->load_session(session).passes.size() == 5);
  CHECK(head != ts.store->head_hash());
}
