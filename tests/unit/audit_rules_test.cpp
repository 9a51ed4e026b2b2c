// The per-item audit rules on built structs: each case changes one thing in a clean weighing
// and must raise exactly the expected findings (and the clean one none).
#include <doctest/doctest.h>

#include <functional>

#include "unit/audit_fixture.h"

using namespace sp;
using namespace sp::audit;
using namespace sp::audit::test;

namespace {

struct Case {
  const char* name;
  std::function<void(AuditItem&, AuditOptions&)> change;
  std::vector<std::string> codes;  // expected, in order of the sorted findings
};

Pass& pass(AuditItem& it, std::size_t i) { return it.session.passes.at(i); }

std::vector<std::string> sorted_codes(const AuditItem& it, const AuditOptions& o) {
  AuditResult r = run_audit({it}, o);
  REQUIRE(r.items.size() == 1);
  return codes_of(r.items[0].findings);
}

}  // namespace

TEST_CASE("audit rules: each planted problem gives exactly its finding") {
  const std::vector<Case> cases = {
      {"clean", [](AuditItem&, AuditOptions&) {}, {}},
      // A digital scale indicates in whole divisions (common practice): 4025 is not k x 20.
      {"off-division", [](AuditItem& it, AuditOptions&) { pass(it, 2).steer = 4025; },
       {"off-division"}},
      // Printed gross = sum of platforms (common practice): 16980 vs 16960.
      {"gross-mismatch", [](AuditItem& it, AuditOptions&) { pass(it, 1).gross = 16980; },
       {"gross-mismatch"}},
      {"mixed-scale", [](AuditItem& it, AuditOptions&) { pass(it, 2).scale_id = "ST-4"; },
       {"mixed-scale"}},
      {"mixed-scale not raised when the pass names the session's own scale",
       [](AuditItem& it, AuditOptions&) { pass(it, 2).scale_id = "ST-3"; }, {}},
      {"passes-span 61 min",
       [](AuditItem& it, AuditOptions&) { pass(it, 2).weighed_at = "2026-10-14T10:13:00-05:00"; },
       {"passes-span"}},
      // Offsets are honoured: 15:12Z is 10:12-05:00, exactly 60 min after the first pass.
      {"passes-span across offsets, exactly 60 min",
       [](AuditItem& it, AuditOptions&) { pass(it, 2).weighed_at = "2026-10-14T15:12:00Z"; }, {}},
      // Audit clock 14:21Z; A-1003 at 14:28Z is 7 min ahead, beyond the 5 min clock drift.
      {"future-time",
       [](AuditItem& it, AuditOptions& o) {
         o.now = 1791987660;
         it.session.scale.last_inspected = "2026-04-02";
       },
       {"future-time"}},
      {"duplicate-pass: one weighing under two tickets",
       [](AuditItem& it, AuditOptions&) {
         Pass copy = pass(it, 2);
         copy.ticket = "A-1004";
         it.session.passes.push_back(copy);
       },
       {"duplicate-pass"}},
      {"duplicate-pass: the same ticket entered twice",
       [](AuditItem& it, AuditOptions&) {
         Pass copy = pass(it, 2);
         copy.weighed_at = "2026-10-14T09:30:00-05:00";
         it.session.passes.push_back(copy);
       },
       {"duplicate-pass"}},
      {"a voided duplicate is a correction already made, not a finding",
       [](AuditItem& it, AuditOptions&) {
         Pass copy = pass(it, 2);
         copy.ticket = "A-1004";
         copy.voided = true;
         it.session.passes.push_back(copy);
       },
       {}},
      {"inspection-lapsed: never inspected",
       [](AuditItem& it, AuditOptions&) { it.session.scale.last_inspected.reset(); },
       {"inspection-lapsed"}},
      {"inspection-lapsed: only inspected after the weighing",
       [](AuditItem& it, AuditOptions&) { it.session.scale.last_inspected = "2026-10-20"; },
       {"inspection-lapsed"}},
      {"inspection history from the store overrides last_inspected",
       [](AuditItem& it, AuditOptions&) {
         it.session.scale.last_inspected.reset();
         it.inspections = std::vector<Inspection>{{"2024-05-01", "S-771"}, {"2026-01-15", "S-902"}};
       },
       {}},
      // NIST HB 44 Table 3, Class III L: 2 000..10 000 divisions; 300 000 / 20 = 15 000 d.
      {"division-implausible: too many divisions",
       [](AuditItem& it, AuditOptions&) { it.session.scale.capacity = 300000; },
       {"division-implausible"}},
      // NIST HB 44 Table 3, Class III L: d >= 5 lb; readings stay whole multiples of 2 lb.
      {"division-implausible: division below 5 lb",
       [](AuditItem& it, AuditOptions&) {
         it.session.scale.division = 2;
         it.session.scale.capacity = 18000;  // 9 000 d: the count alone would pass
       },
       {"division-implausible"}},
      {"class-unknown",
       [](AuditItem& it, AuditOptions&) { it.session.scale.accuracy_class = "IIII"; },
       {"class-unknown"}},
      {"unreadable-time",
       [](AuditItem& it, AuditOptions&) { pass(it, 1).weighed_at = "2026-10-14 09:20"; },
       {"unreadable-time"}},
      {"no-passes", [](AuditItem& it, AuditOptions&) { it.session.passes.clear(); },
       {"no-passes"}},
      {"weight-drift: 100 lb more on the tensioned pass",
       [](AuditItem& it, AuditOptions&) { *pass(it, 2).trailer = 8340; }, {"weight-drift"}},
      {"stale-weighing",
       [](AuditItem&, AuditOptions& o) { o.claim_date = "2027-06-01"; }, {"stale-weighing"}},
      {"weighed-after-claim",
       [](AuditItem&, AuditOptions& o) { o.claim_date = "2026-10-01"; }, {"weighed-after-claim"}},
      {"no claim date: no timing rule",
       [](AuditItem&, AuditOptions& o) { o.claim_date.reset(); }, {}},
  };
  for (const auto& c : cases) {
    CAPTURE(c.name);
    AuditItem it = clean_item();
    AuditOptions o = clean_options();
    c.change(it, o);
    std::vector<std::string> got;
    for (const auto& code : sorted_codes(it, o)) got.push_back(code);
    // Several findings of one code are fine (e.g. two off-division readings): compare codes.
    std::vector<std::string> distinct;
    for (const auto& g : got) {
      if (distinct.empty() || distinct.back() != g) distinct.push_back(g);
    }
    CHECK(distinct == c.codes);
  }
}

TEST_CASE("audit rules: signed-report facts") {
  struct RCase {
    const char* name;
    std::function<void(VerificationFacts&, AuditOptions&)> change;
    std::vector<std::string> codes;
  };
  const std::vector<RCase> cases = {
      {"clean report", [](VerificationFacts&, AuditOptions&) {}, {}},
      {"signature-invalid",
       [](VerificationFacts& v, AuditOptions&) { v.record_signature_ok = false; },
       {"signature-invalid"}},
      {"key-untrusted",
       [](VerificationFacts& v, AuditOptions&) { v.key_trusted = false; },
       {"key-untrusted"}},
      {"record-mismatch",
       [](VerificationFacts& v, AuditOptions&) {
         v.record_matches = false;
         v.mismatches = {"tongue_load: stated 1100 lb, recomputed 996 lb"};
       },
       {"record-mismatch"}},
      {"file-altered",
       [](VerificationFacts& v, AuditOptions&) { v.detached_ok = false; },
       {"file-altered"}},
      {"pages-unsigned (no in-file signature, no .sig)",
       [](VerificationFacts& v, AuditOptions&) {
         v.detached_present = false;
         v.detached_ok = false;
       },
       {"pages-unsigned"}},
      {"in-file signature alone covers the pages",
       [](VerificationFacts& v, AuditOptions&) {
         v.detached_present = false;
         v.in_file_present = v.in_file_ok = true;
       },
       {}},
      {"in-file signature fails",
       [](VerificationFacts& v, AuditOptions&) { v.in_file_present = true; },
       {"file-altered"}},
      {"signature-incomplete: bytes appended after the signed range (one finding, not two)",
       [](VerificationFacts& v, AuditOptions&) {
         v.in_file_present = true;
         v.in_file_covered_end = 56073;
         v.file_size = 56400;
         v.detached_ok = false;
       },
       {"signature-incomplete"}},
      {"key-outside-validity",
       [](VerificationFacts& v, AuditOptions&) {
         v.key_in_validity = false;
         v.key_validity_detail =
             "issued at 2026-11-14T10:30:00-05:00, after the key ceased to be valid";
       },
       {"key-outside-validity"}},
  };
  for (const auto& c : cases) {
    CAPTURE(c.name);
    AuditItem it = clean_item("claim-1/report.pdf");
    it.kind = ItemKind::report;
    it.verification = good_verification();
    AuditOptions o = clean_options();
    c.change(*it.verification, o);
    CHECK(sorted_codes(it, o) == c.codes);
  }
}

TEST_CASE("audit rules: an unknown key is an error with a trust list, a warning without") {
  AuditItem it = clean_item("claim-1/report.pdf");
  it.kind = ItemKind::report;
  it.verification = good_verification();
  it.verification->key_trusted = false;
  for (bool given : {true, false}) {
    CAPTURE(given);
    AuditOptions o = clean_options();
    o.trust_list_given = given;
    auto fs = audit_item(it, o);
    REQUIRE(fs.size() == 1);
    CHECK(fs[0].code == "key-untrusted");
    CHECK(fs[0].severity == (given ? Severity::error : Severity::warning));
    CHECK(fs[0].values.at(0).text == "d75a 9801 82b1 0ab7");
  }
}

TEST_CASE("audit rules: engine flags, compliance and unsolved lines pass through") {
  AuditItem it = clean_item();
  ReconcileResult r;
  r.units = it.session.units;
  r.travel_pass = "A-1003";
  Flag bad;
  bad.code = "inconsistent-reading";
  bad.severity = Severity::error;
  bad.message = "ticket A-1003 drive reading 4700 lb does not fit";
  bad.ticket = "A-1003";
  bad.platform = "drive";
  bad.needed = 4760;
  Flag dup;  // the engine's own off-division flag: the audit rates tickets itself
  dup.code = "off-division";
  r.flags = {bad, dup};
  ComplianceRow over{"front_gawr", "Steer axle vs front GAWR", 4000, 4100, 20, -100,
                     ComplianceStatus::over};
  ComplianceRow close{"gvwr", "Tow vehicle vs GVWR", 8760, 8720, 30, 40,
                      ComplianceStatus::undecided};
  ComplianceRow fine{"rear_gawr", "Drive axle vs rear GAWR", 6000, 4700, 20, 1300,
                     ComplianceStatus::within};
  r.compliance = {over, close, fine};
  r.unsolved = {"setting for the target: only one numeric setting; weigh a second setting"};
  it.result = r;
  AuditResult res = run_audit({it}, clean_options());
  REQUIRE(res.items.size() == 1);
  const auto& fs = res.items[0].findings;
  CHECK(codes_of(fs) == std::vector<std::string>{"inconsistent-reading", "compliance-over",
                                                 "compliance-undecided", "not-solved"});
  CHECK(fs[0].ticket == std::optional<std::string>("A-1003"));
  CHECK(fs[0].values.at(0).text == "4760 lb");
  CHECK(fs[1].severity == Severity::error);
  CHECK(fs[2].severity == Severity::warning);
  CHECK(fs[3].severity == Severity::note);
  CHECK(res.errors == 2);
  CHECK(res.warnings == 1);
  CHECK(res.notes == 1);
}

TEST_CASE("audit rules: a session the engine could not solve is an error") {
  AuditItem it = clean_item();
  it.reconcile_error = "tow_vehicle.wheelbase: expected a length > 0";
  auto fs = audit_item(it, clean_options());
  REQUIRE(fs.size() == 1);
  CHECK(fs[0].code == "unsolvable");
  CHECK(fs[0].severity == Severity::error);
}
