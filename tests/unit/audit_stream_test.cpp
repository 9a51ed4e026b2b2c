// The streamed store audit: it keeps only the sessions that share a ticket with another one,
// and writes exactly what the in-memory audit writes (text, JSON and the summary PDF); its
// temporary files hold every field of an item, deflated.
#include <doctest/doctest.h>

#include <set>
#include <sstream>

#include "audit/item_codec.h"
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
  std::vector<std::string> pdf;
  std::size_t kept = 0, spilled = 0;
  AuditResult counts;
};

Streamed stream(const std::vector<AuditItem>& items, AuditStreamWriter::Format f, bool pdf = false,
                std::size_t pdf_pages = kAuditPdfPagesPerVolume, bool sink = false) {
  AuditStreamWriter w(f, false, 50, pdf, pdf_pages);
  std::vector<std::string> sunk;
  if (sink) {
    w.set_pdf_sink([&sunk](std::size_t k, std::size_t n, std::string bytes) {
      CHECK(k == sunk.size() + 1);
      CHECK(k <= n);
      sunk.push_back(std::move(bytes));
    });
  }
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
  s.pdf = sink ? sunk : w.take_pdf();
  if (sink) CHECK(w.take_pdf().empty());
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
      {"more clean items than the PDF lists", 450, 40, 0, true},
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
    // The summary PDF drawn from the same pass (`audit --all --pdf`), beside either output.
    const std::vector<std::string> pdf = audit_pdf(rep);
    CHECK(pdf.size() == 1);
    for (auto f : {AuditStreamWriter::Format::text, AuditStreamWriter::Format::json}) {
      CAPTURE(static_cast<int>(f));
      const Streamed s = stream(items, f, true);
      CHECK(s.pdf == pdf);
      CHECK(s.out == (f == AuditStreamWriter::Format::text ? audit_text(rep, false)
                                                           : audit_json(rep).dump(2)));
    }
  }
}

namespace {
std::size_t count_of(const std::string& hay, const std::string& needle) {
  std::size_t n = 0;
  for (auto at = hay.find(needle); at != std::string::npos; at = hay.find(needle, at + 1)) ++n;
  return n;
}
}  // namespace

// libharu holds at most 8 191 pages a document (HPDF_LIMIT_MAX_ARRAY, hpdf_consts.h of
// libharu 2.3.0), which a whole store's audit exceeds: the summary is split into volumes of a
// given page count, each a whole PDF opening with the same summary. Checked here at a small
// limit so that no 250 000-session store is needed.
TEST_CASE("audit summary PDF: volumes at a page limit, streamed and in memory alike") {
  const std::vector<AuditItem> items = mixed_items(240, 2, 0);
  const AuditReport rep = in_memory(items);
  const std::vector<std::string> whole = audit_pdf(rep);
  REQUIRE(whole.size() == 1);
  // "/Type /Page" counts page objects and the one page tree ("/Type /Pages").
  const std::size_t pages = count_of(whole[0], "/Type /Page") - count_of(whole[0], "/Type /Pages");
  CAPTURE(pages);
  REQUIRE(pages > 12);
  const std::size_t limit = 5;
  const std::vector<std::string> vols = audit_pdf(rep, limit);
  CHECK(vols.size() >= (pages + limit - 1) / limit);
  std::size_t total = 0;
  for (const auto& v : vols) {
    CHECK(v.rfind("%PDF-", 0) == 0);
    CHECK(v.find("%%EOF") != std::string::npos);
    const std::size_t n = count_of(v, "/Type /Page") - count_of(v, "/Type /Pages");
    CHECK(n >= 1);
    CHECK(n <= limit);
    total += n;
  }
  // Every volume repeats the summary, so the set has more pages than the single document.
  CHECK(total > pages);
  CHECK(audit_pdf(rep, limit) == vols);  // deterministic
  for (auto f : {AuditStreamWriter::Format::text, AuditStreamWriter::Format::json}) {
    CAPTURE(static_cast<int>(f));
    const Streamed s = stream(items, f, true, limit);
    CHECK(s.pdf == vols);
    // Each volume handed over as soon as it is drawn (what `audit --all --pdf` writes).
    CHECK(stream(items, f, true, limit, true).pdf == vols);
    CHECK(s.out == (f == AuditStreamWriter::Format::text ? audit_text(rep, false)
                                                         : audit_json(rep).dump(2)));
  }
  // A limit too small for the summary and a finding is refused, not looped on.
  CHECK_THROWS_AS(audit_pdf(rep, 1), Error);
}

TEST_CASE("streamed audit's temporary files hold every field and stay small") {
  // Every field of an item set, odd values included: the binary form must give them back.
  ItemAudit ia;
  ia.index = 4000000000u;
  ia.source = "store.db#12";
  ia.claim = std::string("claim \0 with a NUL", 19);
  ia.kind = ItemKind::report;
  ia.label = "session 12 at scale ST-3, 2026-10-14";
  ia.weight_unit = WeightUnit::kg;
  Finding f;
  f.code = "off-division";
  f.severity = Severity::note;
  f.message = std::string(70000, 'm');
  f.ticket = "A-1002";
  f.platform = std::nullopt;
  f.values = {{"steer", "4 025 lb", 4025.000000000001, "lb"}, {"why", "", std::nullopt, ""}};
  f.rule = "NIST HB 44 Table 3";
  ia.findings = {f, f};
  ia.findings[1].platform = "";
  ia.findings[1].ticket.reset();
  std::string rec;
  encode_item(ia, rec);
  const ItemAudit back = decode_item(rec);
  CHECK(audit_text_item(back, true) == audit_text_item(ia, true));
  CHECK(audit_json_item(back).dump() == audit_json_item(ia).dump());
  CHECK(back.index == ia.index);
  CHECK(back.claim == ia.claim);
  CHECK(back.weight_unit == ia.weight_unit);
  CHECK(back.findings[0].values[0].number == ia.findings[0].values[0].number);
  CHECK(!back.findings[1].ticket);
  CHECK(back.findings[1].platform == std::optional<std::string>(""));
  CHECK_THROWS_AS(decode_item(std::string_view(rec).substr(0, rec.size() - 1)), sp::Error);

  // Many items with findings: deflated, the files are a fraction of the records, and they read
  // back in order.
  std::vector<AuditItem> items = mixed_items(3000, 2, 3);
  AuditStreamWriter w(AuditStreamWriter::Format::json, false);
  Auditor a(clean_options());
  a.on_final([&](ItemAudit&& x) { w.add(std::move(x)); });
  a.limit_reuse_to({});
  for (const auto& i : items) a.add(i);
  AuditReport rep;
  rep.options = clean_options();
  rep.trusted_keys = {"d75a 9801 82b1 0ab7"};
  rep.result = a.finish();
  CAPTURE(w.temp_raw_bytes());
  CAPTURE(w.temp_bytes());
  CHECK(w.spilled() == 3000);
  std::ostringstream os;
  w.finish(rep, os);
  CHECK(w.temp_bytes() * 5 < w.temp_raw_bytes());
  CHECK(os.str() == audit_json(in_memory(items)).dump(2));
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
    ts.store->add_pass(id,
                       make_pass(PassKind::unhitched, "B-" + std::to_string(k) + "1", 4600, 3900));
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
      const std::string want =
          f == AuditStreamWriter::Format::text ? audit_text(rep, false) : audit_json(rep).dump(2);
      AuditStreamWriter w(f, false, 50, true);
      std::ostringstream os;
      AuditResult counts = audit_store_streamed(*ts.store, "store.db", one, clean_options(),
                                                {"d75a 9801 82b1 0ab7"}, w, os);
      CHECK(os.str() == want);
      CHECK(w.take_pdf() == audit_pdf(rep));
      CHECK(counts.errors == rep.result.errors);
      CHECK(counts.total_items == rep.result.items.size());
      if (!one) {
        CHECK(want.find("ticket-reuse") != std::string::npos);
        CHECK(w.spilled() == 2);  // sessions 2 and 4: no shared ticket, written at once
      }
    }
  }
}
