// CSV of passes: every error class gives "file:line: column: what was expected" and leaves
// the store unchanged (same head hash); a valid file imports, opens sessions, and round trips.
#include <doctest/doctest.h>

#include <sstream>

#include "format/pass_csv.h"
#include "store/importers.h"
#include "store_fixture.h"

using namespace storetest;

namespace {
const char* kHeader =
    "session,scale,rig,kind,setting,ticket,weighed_at,steer,drive,trailer,gross\n";
const char* kGood =
    "K-1,ST-3,heron-wren,unhitched,,A-1001,2026-11-03T09:14:00-06:00,4600,3900,,8500\n"
    "K-1,ST-3,heron-wren,hitched,,A-1002,2026-11-03T09:21:00-06:00,4340,4960,6200,15500\n"
    "K-1,ST-3,heron-wren,tensioned,4,A-1003,2026-11-03T09:30:00-06:00,4460,4760,6280,15500\n";
}  // namespace

TEST_CASE("CSV import errors name file, line and column and write nothing") {
  struct Row {
    const char* what;
    std::string text;
    const char* message;
  };
  std::string h = kHeader;
  std::string g = h + kGood;
  const Row rows[] = {
      {"empty file", "", "in.csv:0: header: expected a header line"},
      {"unknown column", "session,kind,ticket,weighed_at,steer,drive,colour\n",
       "in.csv:1: header: column 7: unknown column \"colour\""},
      {"missing column", "session,kind,ticket,steer,drive\n", "missing column weighed_at"},
      {"repeated column", "session,kind,kind,ticket,weighed_at,steer,drive\n", "appears twice"},
      {"only a header", h, "no passes"},
      {"short row", h + "K-1,ST-3,heron-wren,unhitched\n", "in.csv:2: record: expected 11 fields"},
      {"bad kind", h + "K-1,ST-3,heron-wren,parked,,A-1,2026-11-03T09:14:00-06:00,4600,3900,,\n",
       "in.csv:2: kind: expected unhitched, hitched or tensioned, got \"parked\""},
      {"bad number",
       g + "K-1,ST-3,heron-wren,unhitched,,A-9,2026-11-03T09:14:00-06:00,4,600,3900,,\n",
       "in.csv:5: record: expected 11 fields"},
      {"text weight",
       h + "K-1,ST-3,heron-wren,unhitched,,A-1,2026-11-03T09:14:00-06:00,abc,3900,,\n",
       "in.csv:2: steer: expected a number, got \"abc\""},
      {"negative weight",
       h + "K-1,ST-3,heron-wren,unhitched,,A-1,2026-11-03T09:14:00-06:00,-20,3900,,\n",
       "in.csv:2: steer: expected a weight between 0 and 200000 lb, got -20"},
      {"huge weight",
       h + "K-1,ST-3,heron-wren,unhitched,,A-1,2026-11-03T09:14:00-06:00,1e400,3900,,\n",
       "in.csv:2: steer: expected a number, got \"1e400\""},
      {"time without offset",
       h + "K-1,ST-3,heron-wren,unhitched,,A-1,2026-11-03T09:14:00,4600,3900,,\n",
       "in.csv:2: weighed_at: missing the UTC offset"},
      {"division",
       g + "K-1,ST-3,heron-wren,tensioned,6,B-1042,2026-11-03T09:40:00-06:00,4460,4705,6280,\n",
       "in.csv:5: ticket B-1042, pass tensioned: drive: reading 4705 lb is not a multiple"},
      {"gross",
       h + "K-1,ST-3,heron-wren,unhitched,,A-1,2026-11-03T09:14:00-06:00,4600,3900,,8520\n",
       "in.csv:2: ticket A-1, pass unhitched: gross: printed gross 8520 lb is not the sum"},
      {"duplicate ticket",
       g + "K-1,ST-3,heron-wren,unhitched,,A-1001,2026-11-03T09:44:00-06:00,4600,3900,,\n",
       "in.csv:5: ticket A-1001: already in session"},
      {"unknown scale",
       h + "K-1,ST-8,heron-wren,unhitched,,A-1,2026-11-03T09:14:00-06:00,4600,3900,,\n",
       "in.csv:2: scale: ST-8 is not in the store"},
      {"unknown rig", h + "K-1,ST-3,gull,unhitched,,A-1,2026-11-03T09:14:00-06:00,4600,3900,,\n",
       "in.csv:2: rig: gull is not in the store"},
      {"no scale for new session",
       h + "K-1,,heron-wren,unhitched,,A-1,2026-11-03T09:14:00-06:00,4600,3900,,\n",
       "in.csv:2: scale: expected the scale id"},
      {"unterminated quote", h + "\"K-1,ST-3\n", "unterminated quoted field"},
      {"bad UTF-8",
       h + "K-1,ST-3,heron-wren,unhitched,,A-\xff,2026-11-03T09:14:00-06:00,4600,3900,,\n",
       "in.csv:2: ticket: expected UTF-8 text"},
      {"very long ticket",
       h + "K-1,ST-3,heron-wren,unhitched,," + std::string(300, 'x') +
           ",2026-11-03T09:14:00-06:00,4600,3900,,\n",
       "in.csv:2: ticket: expected at most 64 characters, got 300"},
      {"SQL-looking text is just text, but a bad row later still rejects the file",
       h + "K-1,ST-3,heron-wren,unhitched,,'); DROP TABLE "
           "passes;--,2026-11-03T09:14:00-06:00,4600,3900,,\n"
           "K-1,ST-3,heron-wren,unhitched,,A-2,2026-11-03T09:14:00-06:00,4601,3900,,\n",
       "in.csv:3: ticket A-2, pass unhitched: steer: reading 4601 lb"},
  };
  TempStore ts;
  seed_session(*ts.store);
  std::string head = ts.store->head_hash();
  long long rows_before = ts.store->row_count();
  for (const Row& r : rows) {
    std::string what = r.what;
    CAPTURE(what);
    std::istringstream in(r.text);
    ts.store->begin_write();
    try {
      import_pass_csv(*ts.store, in, "in.csv", std::nullopt);
      FAIL("expected an error");
    } catch (const Error& e) {
      std::string msg = e.what();
      CAPTURE(msg);
      CHECK(e.code() == ExitCode::data_error);
      CHECK(std::string(e.what()).find(r.message) != std::string::npos);
    }
    ts.store->rollback();
    CHECK(ts.store->head_hash() == head);
    CHECK(ts.store->row_count() == rows_before);
  }
}

TEST_CASE("CSV import opens sessions, voids, and round trips through the writer") {
  TempStore ts;
  seed_session(*ts.store);
  std::string text = std::string(kHeader) + kGood +
                     "K-2,ST-3,heron-wren,unhitched,,A-2001,2026-11-04T08:00:00-06:00,4620,3880,,\n"
                     "\"K-1\",ST-3,heron-wren,tensioned,\"6, tight\",A-1004,"
                     "2026-11-03T09:40:00-06:00,4500,4700,6300,\r\n"
                     "K-2,,,hitched,,A-2002,2026-11-04T08:10:00-06:00,4360,4940,6200,\n";
  std::istringstream in(text);
  ts.store->begin_write();
  auto st = import_pass_csv(*ts.store, in, "in.csv", std::string("importer"));
  ts.store->commit();
  CHECK(st.passes == 6);
  CHECK(st.sessions_opened == 2);
  auto k1 = ts.store->find_session_by_ref("K-1");
  REQUIRE(k1);
  Session s = ts.store->load_session(*k1);
  REQUIRE(s.passes.size() == 4);
  CHECK(s.passes[3].setting == "6, tight");
  CHECK(s.passes[3].entered_by == "importer");
  // Write the session back out and read it again: every field survives.
  std::string out = pass_csv_header();
  for (const Pass& p : s.passes) {
    CsvPassRow row;
    row.session = "K-1";
    row.scale = s.scale.id;
    row.pass = p;
    write_pass_csv_row(out, row);
  }
  std::istringstream back(out);
  PassCsvReader reader(back, "out.csv");
  CsvPassRow row;
  size_t k = 0;
  while (reader.next(row)) {
    REQUIRE(k < s.passes.size());
    const Pass& a = s.passes[k++];
    CAPTURE(a.ticket);
    CHECK(row.pass.ticket == a.ticket);
    CHECK(row.pass.kind == a.kind);
    CHECK(row.pass.setting == a.setting);
    CHECK(row.pass.weighed_at == a.weighed_at);
    CHECK(row.pass.steer == a.steer);
    CHECK(row.pass.drive == a.drive);
    CHECK(row.pass.trailer == a.trailer);
    CHECK(row.pass.gross == a.gross);
    CHECK(row.pass.entered_by == a.entered_by);
    CHECK(row.pass.entered_at == a.entered_at);
  }
  CHECK(k == 4);
  CHECK(ts.store->check_chain({}).ok);
}
