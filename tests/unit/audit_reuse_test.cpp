// ticket-reuse across items and claims, and the ordering of the audit result.
#include <doctest/doctest.h>

#include "unit/audit_fixture.h"

using namespace sp;
using namespace sp::audit;
using namespace sp::audit::test;

namespace {

int count_code(const ItemAudit& ia, const std::string& code) {
  int n = 0;
  for (const auto& f : ia.findings) n += f.code == code ? 1 : 0;
  return n;
}

const ItemAudit& by_source(const AuditResult& r, const std::string& source) {
  for (const auto& i : r.items) {
    if (i.source == source) return i;
  }
  FAIL("no item " << source);
  return r.items.front();
}

}  // namespace

TEST_CASE("ticket-reuse: the cases") {
  struct C {
    const char* name;
    const char* claim_b;
    ItemKind kind_a, kind_b;
    bool change_readings;
    const char* station_b;  // nullptr: same station as a
    int reuse_per_item;     // ticket-reuse findings expected on each item (one per pair)
  };
  const std::vector<C> cases = {
      // One weighing in two claims: the fraud the rule is for (all three tickets reused).
      {"same weighing in two claims", "claim-2", ItemKind::session, ItemKind::session, false,
       nullptr, 1},
      // A report and its own session file in one claim: one weighing documented twice.
      {"report and session of one weighing", "claim-1", ItemKind::report, ItemKind::session,
       false, nullptr, 0},
      // Two store sessions holding the same tickets: reuse even when identical.
      {"two store sessions", "store.db", ItemKind::store, ItemKind::store, false, nullptr, 1},
      {"same tickets, other readings, one claim", "claim-1", ItemKind::session,
       ItemKind::session, true, nullptr, 1},
      {"same scale id at another station", "claim-2", ItemKind::session, ItemKind::session,
       false, "Cedar Bend scale house", 0},
  };
  for (const auto& c : cases) {
    CAPTURE(c.name);
    AuditItem a = clean_item("a.json", c.kind_a == ItemKind::store ? "store.db" : "claim-1");
    a.kind = c.kind_a;
    AuditItem b = clean_item("b.json", c.claim_b);
    b.kind = c.kind_b;
    if (c.change_readings) {
      for (auto& p : b.session.passes) {
        p.steer += 40;
        p.weighed_at = "2026-10-20T11:00:00-05:00";
      }
      b.session.passes[1].gross = 17000;
    }
    if (c.station_b) b.session.station = c.station_b;
    AuditResult r = run_audit({a, b}, clean_options());
    CHECK(count_code(by_source(r, "a.json"), "ticket-reuse") == c.reuse_per_item);
    CHECK(count_code(by_source(r, "b.json"), "ticket-reuse") == c.reuse_per_item);
  }
}

TEST_CASE("ticket-reuse: evidence names the ticket, the scale and the other file") {
  AuditItem a = clean_item("claim-1/session.json", "claim-1");
  AuditItem b = clean_item("claim-2/session.json", "claim-2");
  b.session.passes.erase(b.session.passes.begin(), b.session.passes.begin() + 2);  // A-1003 only
  AuditResult r = run_audit({a, b}, clean_options());
  const ItemAudit& ib = by_source(r, "claim-2/session.json");
  REQUIRE(ib.findings.size() >= 1);
  const Finding& f = ib.findings[0];
  CHECK(f.code == "ticket-reuse");
  CHECK(f.severity == Severity::error);
  CHECK(f.ticket == std::optional<std::string>("A-1003"));
  CHECK(f.message.find("claim-1/session.json") != std::string::npos);
  CHECK(f.message.find("claim claim-1") != std::string::npos);
  CHECK(count_code(by_source(r, "claim-1/session.json"), "ticket-reuse") == 1);
}

TEST_CASE("ticket-reuse: all reused tickets of a pair in one finding, a third item its own") {
  AuditItem a = clean_item("a.json", "claim-1");
  AuditItem b = clean_item("b.json", "claim-2");
  AuditItem c = clean_item("c.json", "claim-3");
  AuditResult r = run_audit({a, b, c}, clean_options());
  const ItemAudit& ia = by_source(r, "a.json");
  REQUIRE(count_code(ia, "ticket-reuse") == 2);  // with b and with c
  CHECK(ia.findings[0].values.at(0).text == "A-1001, A-1002, A-1003");
  CHECK(ia.findings[0].message.find("Tickets A-1001, A-1002, A-1003 of scale ST-3 also appear in "
                                    "b.json (claim claim-2), with the same times and readings") ==
        0);
  CHECK(count_code(by_source(r, "b.json"), "ticket-reuse") == 1);
  CHECK(count_code(by_source(r, "c.json"), "ticket-reuse") == 1);
  CHECK(r.errors == 4);
}

TEST_CASE("audit result: items worst first, findings worst first, counts") {
  AuditItem clean = clean_item("clean.json", "claim-1");
  AuditItem warn = clean_item("warn.json", "claim-1");
  for (auto& p : warn.session.passes) p.ticket = "W-" + p.ticket;
  warn.session.scale.last_inspected.reset();  // inspection-lapsed: warning
  AuditItem bad = clean_item("bad.json", "claim-1");
  for (auto& p : bad.session.passes) p.ticket = "B-" + p.ticket;
  bad.session.scale.last_inspected.reset();
  bad.session.passes[2].steer = 4025;  // off-division: error
  AuditResult r = run_audit({clean, warn, bad}, clean_options());
  REQUIRE(r.items.size() == 3);
  CHECK(r.items[0].source == "bad.json");
  CHECK(r.items[1].source == "warn.json");
  CHECK(r.items[2].source == "clean.json");
  CHECK(r.items[0].findings[0].severity == Severity::error);
  CHECK(r.items[0].findings[1].severity == Severity::warning);
  CHECK(r.errors == 1);
  CHECK(r.warnings == 2);
  CHECK(r.clean_items == 1);
}
