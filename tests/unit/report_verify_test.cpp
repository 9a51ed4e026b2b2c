// Issue a report from hand-built values, then verify it and tamper with it.
#include <doctest/doctest.h>

#include "report/issue.h"
#include "report/pdf_extract.h"
#include "report/record.h"
#include "report/report_pdf.h"
#include "report/verify.h"
#include "unit/report_fixture.h"

using namespace sp::report;
using nlohmann::json;

namespace {

const Signer& station() {
  static auto s = signer_from_seed(std::string(32, '\x2a'));
  return *s;
}

IssuedReport issue(const IssueOptions& opt = {}) {
  static const sp::Session s = sp::test::fixture_session();
  static const sp::ReconcileResult r = sp::test::fixture_result();
  IssueOptions o = opt;
  if (o.software.empty()) o.software = "scaleproof test";
  return issue_report(s, r, sp::test::fixture_session_json(), sp::test::fixture_results_json(), station(), o);
}

// Recomputes by returning what the fixture says: stands in for reconcile() in these tests.
json same_results(const json&) { return sp::test::fixture_results_json(); }

VerifyOptions options(const Verifier* key, const IssuedReport& rep, bool with_sig = true) {
  VerifyOptions o;
  o.station_key = key;
  if (with_sig) o.detached_signature = rep.pdf_signature;
  o.recompute = same_results;
  return o;
}

const VerifyCheck& find(const VerifyResult& r, const std::string& name) {
  for (const auto& c : r.checks) {
    if (c.name == name) return c;
  }
  FAIL("no check " << name);
  static VerifyCheck none;
  return none;
}

}  // namespace

TEST_CASE("same input and key give byte-identical report and signatures") {
  IssuedReport a = issue(), b = issue();
  CHECK(a.pdf == b.pdf);
  CHECK(a.pdf_signature == b.pdf_signature);
  CHECK(a.pdf.rfind("%PDF-", 0) == 0);
  CHECK(a.pdf.find("CreationDate") == std::string::npos);  // no clock unless --issued-at
  IssueOptions dated;
  dated.issued_at = "2026-10-14T10:30:00-05:00";
  IssuedReport c = issue(dated);
  CHECK(c.pdf != a.pdf);
  CHECK(c.pdf.find("CreationDate") != std::string::npos);
  CHECK(c.id != a.id);
}

TEST_CASE("embedded record and its signature come back out of the PDF") {
  IssuedReport rep = issue();
  CHECK(find_attachment(rep.pdf, kRecordAttachment) == rep.record_text);
  CHECK(find_attachment(rep.pdf, kRecordSigAttachment) == rep.record_signature);
  CHECK_FALSE(find_attachment(rep.pdf, "other.json").has_value());
  json record = json::parse(rep.record_text);
  CHECK(record["format"] == kRecordFormat);
  CHECK(record["report"]["id"] == rep.id);
}

TEST_CASE("a fresh report verifies: every check holds") {
  IssuedReport rep = issue();
  auto key = verifier_from_raw(station().public_key());
  VerifyResult r = verify_report_bytes(rep.pdf, options(key.get(), rep));
  CHECK(r.is_report);
  for (const auto& c : r.checks) {
    CAPTURE(c.name);
    CAPTURE(c.detail);
    CHECK(c.status == CheckStatus::passed);
  }
  CHECK(r.all_hold());
  CHECK(r.report_id == rep.id);
}

TEST_CASE("without a station key the record's own key is used and the key check is skipped") {
  IssuedReport rep = issue();
  VerifyResult r = verify_report_bytes(rep.pdf, options(nullptr, rep));
  CHECK(r.all_hold());
  CHECK(find(r, "station key").status == CheckStatus::skipped);
  CHECK(find(r, "record signature").detail.find("--pubkey") != std::string::npos);
}

TEST_CASE("a report signed with another key fails against the station key") {
  IssuedReport rep = issue();
  auto other = verifier_from_raw(signer_from_seed(std::string(32, '\x2b'))->public_key());
  VerifyResult r = verify_report_bytes(rep.pdf, options(other.get(), rep));
  CHECK_FALSE(r.all_hold());
  CHECK(find(r, "record signature").status == CheckStatus::failed);
  CHECK(find(r, "station key").status == CheckStatus::failed);
  CHECK(find(r, "detached signature").status == CheckStatus::failed);
}

TEST_CASE("every sampled single-byte change of the PDF fails verification") {
  IssuedReport rep = issue();
  auto key = verifier_from_raw(station().public_key());
  const std::size_t n = rep.pdf.size(), samples = 200;
  std::size_t failed = 0;
  for (std::size_t k = 0; k < samples; ++k) {
    std::size_t pos = k * (n - 1) / (samples - 1);  // spread over the whole file, ends included
    std::string bad = rep.pdf;
    bad[pos] = static_cast<char>(bad[pos] ^ 0x20);
    VerifyResult r = verify_report_bytes(bad, options(key.get(), rep));
    CAPTURE(pos);
    CHECK_FALSE(r.all_hold());
    failed += r.all_hold() ? 0 : 1;
  }
  CHECK(failed == samples);
}

TEST_CASE("tampering with the record is caught by the record signature") {
  IssuedReport rep = issue();
  auto key = verifier_from_raw(station().public_key());
  std::string bad = rep.pdf;
  std::size_t at = bad.find("\"value\":1000");
  REQUIRE(at != std::string::npos);
  bad[at + 8] = '2';  // 1000 -> 2000, same length so the PDF still parses
  VerifyResult r = verify_report_bytes(bad, options(key.get(), rep, false));
  CHECK(r.is_report);
  CHECK(find(r, "record signature").status == CheckStatus::failed);
  CHECK(find(r, "results").status == CheckStatus::failed);  // recomputed 1000 != 2000
  CHECK(find(r, "detached signature").status == CheckStatus::skipped);
}

TEST_CASE("recomputed results that differ fail the results check") {
  IssuedReport rep = issue();
  auto key = verifier_from_raw(station().public_key());
  VerifyOptions o = options(key.get(), rep);
  o.recompute = [](const json&) {
    json j = sp::test::fixture_results_json();
    j["tongue_load"]["value"] = 1100.0;
    return j;
  };
  VerifyResult r = verify_report_bytes(rep.pdf, o);
  CHECK(find(r, "results").status == CheckStatus::failed);
  CHECK(find(r, "results").detail.find("$.tongue_load.value") != std::string::npos);
}

TEST_CASE("arbitrary bytes are not a report and never crash") {
  IssuedReport rep = issue();
  struct Case {
    const char* what;
    std::string bytes;
  };
  std::vector<Case> cases = {
      {"empty", ""},
      {"text", "hello"},
      {"pdf header only", "%PDF-1.4\n%%EOF"},
      {"truncated report", rep.pdf.substr(0, rep.pdf.size() / 2)},
      {"deep nesting record", "%PDF-1.4\n1 0 obj\n<< /Type /Filespec /F (weigh-record.json) /EF << /F 2 0 R >> >>\nendobj\n"
                               "2 0 obj\n<< /Length 20000 >>\nstream\n" + std::string(20000, '[') + "\nendstream\n%%EOF"},
      {"length past end", "%PDF-1.4\n1 0 obj\n<< /F (weigh-record.json) /EF << /F 2 0 R >> >>\nendobj\n"
                           "2 0 obj\n<< /Length 999999 >>\nstream\n{}\nendstream\n%%EOF"},
      {"self reference", "%PDF-1.4\n1 0 obj\n<< /F (weigh-record.json) /EF << /F 1 0 R >> >>\nendobj\n%%EOF"},
  };
  for (std::size_t cut = 0; cut < rep.pdf.size(); cut += rep.pdf.size() / 50) {
    cases.push_back({"prefix", rep.pdf.substr(0, cut)});
  }
  for (const Case& c : cases) {
    CAPTURE(c.what);
    VerifyResult r = verify_report_bytes(c.bytes, VerifyOptions{});
    CHECK_FALSE(r.all_hold());
  }
}

TEST_CASE("json_depth counts nesting outside strings") {
  CHECK(json_depth("{}") == 1);
  CHECK(json_depth(R"({"a":[[1]]})") == 3);
  CHECK(json_depth(R"({"a":"[[[["})") == 1);
  CHECK(json_depth(R"({"a":"\"[[["})") == 1);
}
