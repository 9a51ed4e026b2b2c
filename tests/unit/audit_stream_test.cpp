// The streamed store audit: it keeps only the sessions that share a ticket with another one,
// and writes exactly what the in-memory audit writes (text and JSON).
#include <doctest/doctest.h>

#include <set>
#include <sstream>

#include "audit/load.h"
#include "audit/output_stream.h"
#include "unit/audit_fixture.h"
#include "unit/store_fixture.h"

using namespace sp;
using namespace sp::audit;
using namespace sp::audit::test;

namespace {

// `n` items with tickets of their own; every `bad`-th one has an off-division reading (error),
// every `warn`-th one no inspection (warning); the others are clean.
std::vector<AuditItem> mixed_items(int n, int bad, int warn) {
  std::vector<AuditItem> items;
  for (int k = 0; k < n; ++k) {
    AuditItem it = clean_item("s" + std::to_string(k) + ".json", "claim-" + std::to_string(k % 3));
    for (auto& p : it.session.passes) p.ticket = "K" + std::to_string(k) + "-" + p.ticket;
    if (bad > 0 && k % bad == 0) it.session.passes[2].steer = 4025;
    if (warn > 0 && k % warn == 1) it.session.scale.last_inspected.reset();
    items.push_back(std::move(it));
  }
  return items;
}

// Tickets held by more than one item (what Store::shared_tickets gives for a store).
std::vector<std::string> shared(const std::vector<AuditItem>& items) {
  std::set<std::string> seen, twice;
  for (const auto& it : items) {
    for (const auto& p : it.session.passes) {
      if (!seen.insert(p.ticket).second) twice.insert(p.ticket);
    }
  }
  return {twice.begin(), twice.end()};
}

struct Streamed {
  std::string out;
  std::size_t kept = 0, spilled = 0;
  AuditResult counts;
};

Streamed stream(const std::vector<AuditItem>& items, AuditStreamWriter::Format f) {
  AuditStreamWriter w(f, false);
  Auditor a(clean_options());
  a.on_final([&](ItemAudit&& ia) { w.add(std::move(ia)); });
  a.limit_reuse_to(shared(items));
  for (const auto& i : items) a.add(i);
  AuditReport rep;
  rep.options = clean_options();
  rep.trusted_keys = {"d75a 9801 82b1 0ab7"};
  rep.result = a.finish();
  Streamed s;
  s.kept = rep.result.items.size();
  s.spilled = w.spilled();
  std::ostringstream os;
  w.finish(rep, os);
  s.out = os.str();
  s.counts = rep.result;
  return s;
}

AuditReport in_memory(const std::vector<AuditItem>& items) {
  AuditReport rep;
  rep.options = clean_options();
  rep.trusted_keys = {"d75a 9801 82b1 0ab7"};
  rep.result = run_audit(items, clean_options());
  return rep;
}

}  // namespace

TEST_CASE("store audit keeps only the sessions that share a ticket (memory stays flat)") {
  std::vector<AuditItem> items = mixed_items(300, 7, 5);
  // Items 10 and 200 share one ticket: only they may still get a ticket-reuse finding.
  items[200].session.passes[0].ticket = items[10].session.passes[0].ticket;
  Streamed s = stream(items, AuditStreamWriter::Format::text);
  CHECK(s.kept == 2);
  CHECK(s.counts.total_items == 300);
  CHECK(s.counts.claims == 3);
  AuditResult whole = run_audit(items, clean_options());
  CHECK(s.counts.errors == whole.errors);
  CHECK(s.counts.warnings == whole.warnings);
  CHECK(s.counts.notes == whole.notes);
  CHECK(s.counts.clean_items == whole.clean_items);
}

TEST_CASE("streamed audit output equals the in-memory audit, byte for byte") {
  struct C {
    const char* name;
    int n, bad, warn;
    bool reuse;
  };
  const std::vector<C> cases = {
      {"few clean items, listed", 20, 4, 3, false},
      {"more clean items than listed", 200, 9, 7, true},
      {"all clean", 60, 0, 0, false},
      {"reuse between a clean and a bad item", 30, 5, 0, true},
      {"no items", 0, 0, 0, false},
  };
  for (const auto& c : cases) {
    CAPTURE(c.name);
    std::vector<AuditItem> items = mixed_items(c.n, c.bad, c.warn);
    if (c.reuse) {
      items[c.n - 2].session.passes[1].ticket = items[2].session.passes[1].ticket;
      items[c.n - 1].session.passes = items[3].session.passes;  // the whole weighing again
    }
    const AuditReport rep = in_memory(items);
    CHECK(stream(items, AuditStreamWriter::Format::text).out == audit_text(rep, false));
    CHECK(stream(items, AuditStreamWriter::Format::json).out == audit_json(rep).dump(2));
  }
}

TEST_CASE("store: shared_tickets names the shared tickets, streamed output equals in memory") {
  using namespace storetest;
  TempStore ts;
  const long long s1 = seed_session(*ts.store);
  add_demo_passes(*ts.store, s1);
  ts.store->begin_write();
  for (int k = 0; k < 3; ++k) {
    NewSession ns;
    ns.rig_id = 1;
    ns.scale_id = 1;
    const long long id = ts.store->open_session(ns);
    // Session 3 reuses ticket A-1002 of session 1; the others have tickets of their own.
    const std::string t2 = k == 1 ? "A-1002" : "B-" + std::to_string(k) + "2";
    ts.store->add_pass(id, make_pass(PassKind::unhitched, "B-" + std::to_string(k) + "1", 4600,
                                     3900));
    ts.store->add_pass(id, make_pass(PassKind::hitched, t2, 4340, 4960, 6200));
  }
  ts.store->commit();
  ts.store->begin_read();
  CHECK(ts.store->shared_tickets() == std::vector<std::string>{"A-1002"});
  ts.store->commit();

  for (auto f : {AuditStreamWriter::Format::text, AuditStreamWriter::Format::json}) {
    for (std::optional<long long> one : {std::optional<long long>{}, std::optional<long long>{3}}) {
      CAPTURE(static_cast<int>(f));
      CAPTURE(one.value_or(0));
      AuditReport rep = audit_store(*ts.store, "store.db", one, clean_options());
      rep.trusted_keys = {"d75a 9801 82b1 0ab7"};
      const std::string want = f == AuditStreamWriter::Format::text ? audit_text(rep, false)
                                                                    : audit_json(rep).dump(2);
      AuditStreamWriter w(f, false);
      std::ostringstream os;
      AuditResult counts = audit_store_streamed(*ts.store, "store.db", one, clean_options(),
                                                {"d75a 9801 82b1 0ab7"}, w, os);
      CHECK(os.str() == want);
      CHECK(counts.errors == rep.result.errors);
      CHECK(counts.total_items == rep.result.items.size());
      if (!one) {
        CHECK(want.find("ticket-reuse") != std::string::npos);
        CHECK(w.spilled() == 2);  // sessions 2 and 4: no shared ticket, written at once
      }
    }
  }
}
