// The signature inside the PDF (report/pdf_signature.h, report/cms_signature.h): made
// deterministically, checked byte for byte, and a table of tampered files, each failing with
// its own message. Sources: ISO 32000-1 §12.8 (ByteRange, Contents), RFC 5652 §5.4 (what the
// signature covers), RFC 8419 §3 (Ed25519 with SHA-512 signed attributes).
#include <doctest/doctest.h>

#include <functional>

#include "report/cms_signature.h"
#include "report/issue.h"
#include "report/pdf_extract.h"
#include "report/pdf_signature.h"
#include "report/verify.h"
#include "unit/report_fixture.h"

using namespace sp::report;
using nlohmann::json;

namespace {

const Signer& station() {
  static auto s = signer_from_seed(std::string(32, '\x2a'));
  return *s;
}
const Signer& stranger() {
  static auto s = signer_from_seed(std::string(32, '\x2b'));
  return *s;
}

IssuedReport issue_with(const Signer& signer,
                        std::optional<std::string> at = "2026-10-14T10:30:00-05:00") {
  IssueOptions o;
  o.software = "scaleproof test";
  o.issued_at = at;
  static const sp::Session s = sp::test::fixture_session();
  static const sp::ReconcileResult r = sp::test::fixture_result();
  return issue_report(s, r, sp::test::fixture_session_json(), sp::test::fixture_results_json(),
                      signer, o);
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

TEST_CASE("CMS signature: deterministic, holds over its content, fails over any other") {
  auto t = iso_utc_seconds("2026-10-14T10:30:00-05:00");
  REQUIRE(t.has_value());
  CHECK(*t == 1791991800);  // 2026-10-14T15:30:00Z (date(1) -d @1791991800 -u)
  std::string a = make_cms_signature("content", station(), t);
  CHECK(a == make_cms_signature("content", station(), t));
  CHECK(a != make_cms_signature("content", station(), std::nullopt));
  CHECK(a.size() < kSignatureReserve);
  CmsCheck ok = check_cms_signature(a + std::string(40, '\0'), "content");
  CAPTURE(ok.problem);
  CHECK(ok.valid());
  CHECK(ok.signer_key == station().public_key());
  CHECK(ok.signing_time == t);
  CHECK_FALSE(check_cms_signature(a, "Content").valid());
  CHECK_FALSE(check_cms_signature(a + "x", "content").valid());  // non-zero padding
  for (std::size_t i = 0; i < a.size(); i += 7) {
    std::string bad = a;
    bad[i] = static_cast<char>(bad[i] ^ 0x01);
    CAPTURE(i);
    CHECK_FALSE(check_cms_signature(bad, "content").valid());
  }
  CHECK_FALSE(check_cms_signature("", "content").valid());
}

TEST_CASE("a report carries an in-file signature over every byte but its own value") {
  IssuedReport rep = issue_with(station());
  CHECK(rep.pdf == issue_with(station()).pdf);
  PdfContents c = read_pdf(rep.pdf);
  REQUIRE(c.parsed);
  REQUIRE(c.signatures.size() == 1);
  PdfSignatureCheck s = check_pdf_signature(rep.pdf, c.signatures[0]);
  CAPTURE(s.problem);
  CHECK(s.valid);
  CHECK(s.whole_file);
  CHECK(s.covered_end == static_cast<long long>(rep.pdf.size()));
  CHECK(s.signer_key == station().public_key());
  CHECK(rep.pdf[static_cast<std::size_t>(s.gap_start)] == '<');
  CHECK(rep.pdf[static_cast<std::size_t>(s.gap_end) - 1] == '>');
  // Without an issue time: no signing-time attribute, no /M.
  IssuedReport undated = issue_with(station(), std::nullopt);
  PdfContents u = read_pdf(undated.pdf);
  REQUIRE(u.signatures.size() == 1);
  CHECK_FALSE(check_pdf_signature(undated.pdf, u.signatures[0]).signing_time.has_value());
}

TEST_CASE("one signed PDF without its .sig verifies: pages covered by the in-file signature") {
  IssuedReport rep = issue_with(station());
  auto key = verifier_from_raw(station().public_key());
  VerifyOptions o;
  o.station_key = key.get();
  VerifyResult r = verify_report_bytes(rep.pdf, o);
  CHECK(r.all_hold());
  CHECK(r.pages_verified);
  CHECK(find(r, "in-file signature").status == CheckStatus::passed);
  CHECK(find(r, "detached signature").status == CheckStatus::skipped);
  CHECK(r.verdict().rfind("all checks hold: ", 0) == 0);
}

TEST_CASE("tampered files: each fails with its own message") {
  const IssuedReport rep = issue_with(station());
  const IssuedReport other = issue_with(stranger());
  auto key = verifier_from_raw(station().public_key());
  const PdfContents parsed = read_pdf(rep.pdf);
  REQUIRE(parsed.signatures.size() == 1);
  const PdfSignatureCheck good = check_pdf_signature(rep.pdf, parsed.signatures[0]);
  struct Case {
    const char* what;
    std::function<std::string()> make;
    bool with_sig;        // the report's own .sig beside it
    const char* check;    // the check that must fail ("" : none, but pages not verified)
    const char* message;  // in that check's detail, or in the verdict
  };
  const std::string n = std::to_string(rep.pdf.size());
  const std::vector<Case> cases = {
      {"appended bytes", [&] { return rep.pdf + "\n% appended\n"; }, false, "in-file signature",
       "were added after signing"},
      {"incremental update changing page text",
       [&] {
         // A new revision replacing page 1's content stream (ISO 32000-1 §7.5.6).
         return rep.pdf +
                "\n9999 0 obj\n<< /Length 44 >>\nstream\nBT /F1 12 Tf 72 720 Td (ALL CLEAR) Tj "
                "ET\nendstream\nendobj\n"
                "xref\n9999 1\n0000000000 00000 n \ntrailer\n<< /Size 10000 /Prev 0 "
                ">>\nstartxref\n0\n%%EOF\n";
       },
       false, "in-file signature", "bytes from offset"},
      {"swapped attachment signed by another key",
       [&] {
         // Another key's record and its valid record signature in place of ours (same lengths).
         std::string bad = rep.pdf;
         REQUIRE(other.record_text.size() == rep.record_text.size());
         std::size_t at = bad.find(rep.record_text);
         REQUIRE(at != std::string::npos);
         bad.replace(at, rep.record_text.size(), other.record_text);
         at = bad.find(rep.record_signature);
         REQUIRE(at != std::string::npos);
         bad.replace(at, kSignatureSize, other.record_signature);
         return bad;
       },
       false, "in-file signature", "changed after signing"},
      {"removed .sig, in-file signature intact", [&] { return rep.pdf; }, false, "", ""},
      // Cut short: qpdf cannot recover a file without its trailer, so it is not a readable
      // report at all (exit 65).
      {"truncated file", [&] { return rep.pdf.substr(0, rep.pdf.size() - 300); }, false,
       "not a report", "not a readable PDF"},
      {"signature over a shorter range",
       [&] {
         // The /ByteRange rewritten (same width) to leave the last 100 bytes out.
         std::string bad = rep.pdf;
         std::string from = "[ 0 " + std::to_string(good.gap_start) + " " +
                            std::to_string(good.gap_end) + " " +
                            std::to_string(good.covered_end - good.gap_end);
         std::string to = "[ 0 " + std::to_string(good.gap_start) + " " +
                          std::to_string(good.gap_end) + " " +
                          std::to_string(good.covered_end - good.gap_end - 100);
         to.resize(from.size(), ' ');
         std::size_t at = bad.find(from);
         REQUIRE(at != std::string::npos);
         bad.replace(at, from.size(), to);
         return bad;
       },
       false, "in-file signature", "does not hold even over them"},
      {"detached .sig of the original beside an appended file", [&] { return rep.pdf + " "; }, true,
       "detached signature", "does not match the file"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.what);
    VerifyOptions o;
    o.station_key = key.get();
    if (c.with_sig) o.detached_signature = rep.pdf_signature;
    const std::string bytes = c.make();
    VerifyResult r = verify_report_bytes(bytes, o);
    CAPTURE(r.verdict());
    if (std::string(c.check) == "not a report") {
      CHECK_FALSE(r.is_report);
      CHECK(r.not_report_reason.find(c.message) != std::string::npos);
      continue;
    }
    if (std::string(c.check).empty()) {
      CHECK(r.all_hold());  // the in-file signature alone covers the pages
      continue;
    }
    CHECK_FALSE(r.all_hold());
    CHECK(r.verdict().rfind("VERIFICATION FAILED", 0) == 0);
    const VerifyCheck& failed = find(r, c.check);
    CAPTURE(failed.detail);
    CHECK(failed.status == CheckStatus::failed);
    CHECK(failed.detail.find(c.message) != std::string::npos);
  }
}

TEST_CASE("a report with neither signature over its pages does not hold unless --record-only") {
  const IssuedReport rep = issue_with(station());
  // Strip the in-file signature: rename the field type so no signature field is found.
  std::string bad = rep.pdf;
  std::size_t at = bad.find("/FT /Sig");
  REQUIRE(at != std::string::npos);
  bad.replace(at, 8, "/FT /Xyz");
  auto key = verifier_from_raw(station().public_key());
  VerifyOptions o;
  o.station_key = key.get();
  VerifyResult r = verify_report_bytes(bad, o);
  CHECK_FALSE(r.all_hold());
  CHECK(r.verdict().rfind("PAGES NOT VERIFIED", 0) == 0);
  o.record_only = true;
  r = verify_report_bytes(bad, o);
  CHECK(r.all_hold());
  CHECK(r.verdict().rfind("record checks hold (--record-only", 0) == 0);
}
