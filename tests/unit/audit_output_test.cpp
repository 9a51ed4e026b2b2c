// The audit's renderings: text grouped by item with evidence and rule, the JSON document's
// keys, and the summary PDF's basic form.
#include <doctest/doctest.h>

#include "audit/output.h"
#include "unit/audit_fixture.h"

using namespace sp;
using namespace sp::audit;
using namespace sp::audit::test;

namespace {

AuditReport sample_report() {
  AuditItem good = clean_item("claim-1/good.json", "claim-1");
  AuditItem bad = clean_item("claim-1/bad.json", "claim-1");
  for (auto& p : bad.session.passes) p.ticket = "B-" + p.ticket;
  bad.session.passes[2].steer = 4025;  // off-division
  AuditReport rep;
  rep.options = clean_options();
  rep.result = run_audit({good, bad}, rep.options);
  rep.unreadable.push_back({"claim-1/broken.pdf", "claim-1/broken.pdf: not a PDF file"});
  rep.trusted_keys = {"d75a 9801 82b1 0ab7"};
  return rep;
}

}  // namespace

TEST_CASE("audit output: text groups findings by item with evidence and rule") {
  const std::string t = audit_text(sample_report(), false);
  CAPTURE(t);
  CHECK(t.find("Claim-file audit: 2 items in 1 claim; 1 error, 0 warnings, 0 notes") == 0);
  CHECK(t.find("== claim-1/bad.json (session)") != std::string::npos);
  CHECK(t.find("off-division") != std::string::npos);
  CHECK(t.find("evidence: reading 4025 lb; division 20 lb") != std::string::npos);
  CHECK(t.find("rule: a digital scale indicates in whole steps") != std::string::npos);
  CHECK(t.find("Could not read 1 input:") != std::string::npos);
  CHECK(t.find("No findings (1):") != std::string::npos);
  CHECK(t.find("claim-1/good.json (session)") != std::string::npos);
  CHECK(t.find("does not replace") != std::string::npos);
  CHECK(t.find("\033[") == std::string::npos);  // no colour unless asked
  for (std::size_t start = 0, end; start < t.size(); start = end + 1) {
    end = t.find('\n', start);
    if (end == std::string::npos) end = t.size();
    CHECK(end - start <= 104);  // ~100 columns (DEVELOPERS.md); ± and § count two bytes
  }
}

TEST_CASE("audit output: many clean items are counted, not listed") {
  AuditReport rep = sample_report();
  const std::string t = audit_text(rep, false, 0);
  CHECK(t.find("1 items, not listed one by one") != std::string::npos);
}

TEST_CASE("audit output: JSON document") {
  auto j = audit_json(sample_report());
  CHECK(j["format"] == "scaleproof-audit/1");
  CHECK(j["audited_at"] == "2026-12-01T00:00:00Z");
  CHECK(j["claim_date"] == "2026-11-01");
  CHECK(j["limits"]["max_span_minutes"] == 60);
  CHECK(j["limits"]["inspection_months"] == 12);
  CHECK(j["limits"]["stale_days"] == 180);
  CHECK(j["summary"]["items"] == 2);
  CHECK(j["summary"]["errors"] == 1);
  CHECK(j["summary"]["unreadable"] == 1);
  REQUIRE(j["items"].size() == 2);
  const auto& bad = j["items"][0];
  CHECK(bad["source"] == "claim-1/bad.json");
  CHECK(bad["worst"] == "error");
  const auto& f = bad["findings"][0];
  CHECK(f["code"] == "off-division");
  CHECK(f["severity"] == "error");
  CHECK(f["ticket"] == "B-A-1003");
  CHECK(f["platform"] == "steer");
  CHECK(f["evidence"][0]["value"] == 4025.0);
  CHECK(f["evidence"][0]["unit"] == "lb");
  CHECK(j["items"][1]["worst"].is_null());
  CHECK(j["unreadable"][0]["source"] == "claim-1/broken.pdf");
  CHECK(j["cautions"].size() >= 1);
}

TEST_CASE("audit output: summary PDF is a PDF and deterministic") {
  const AuditReport rep = sample_report();
  const std::vector<std::string> va = audit_pdf(rep);
  REQUIRE(va.size() == 1);
  const std::string& a = va[0];
  const std::string b = audit_pdf(rep).at(0);
  CHECK(a.rfind("%PDF-", 0) == 0);
  CHECK(a.find("%%EOF") != std::string::npos);
  CHECK(a == b);
}
