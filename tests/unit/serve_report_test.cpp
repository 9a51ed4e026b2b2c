// Issuing a signed report from the console and verifying it, in process: the download is the
// PDF and its .sig as `scaleproof report` writes them, and the verify page runs the checks of
// `scaleproof verify` (report/verify.h), failing on a flipped byte.
#include <nlohmann/json.hpp>

#include "report/signer.h"
#include "unit/serve_fixture.h"

using namespace servetest;

namespace {

Request upload(const std::string& path, const std::map<std::string, std::string>& files) {
  Request r;
  r.method = "POST";
  r.path = path;
  r.headers["content-type"] = "multipart/form-data; boundary=x";
  for (const auto& [k, v] : files) r.files[k] = UploadedFile{k + ".bin", "", v};
  return r;
}

}  // namespace

TEST_CASE("issue a signed report, download it, verify it; a flipped byte fails") {
  storetest::TempStore ts;
  load_demo(*ts.store);
  Config cfg;
  cfg.db_path = ts.path;
  std::shared_ptr<report::Signer> signer = report::signer_from_seed(std::string(32, '\x07'));
  cfg.signer = signer;
  cfg.software = "scaleproof test";
  Console console(cfg);
  Client cl{console, {}, ""};
  REQUIRE(cl.get("/sessions/1").body.find("id=\"issue-report\"") != std::string::npos);
  const long long before = rows(*ts.store);
  const Response page = cl.post("/sessions/1/report", {});
  REQUIRE(page.status == 200);
  CHECK(page.body.find("<p id=\"verdict\" data-verdict=\"not-proven\"") != std::string::npos);
  CHECK(rows(*ts.store) == before + 1);  // the report's row in the ledger
  const auto link = [&page](const char* id) {
    const std::size_t at = page.body.find(std::string("id=\"") + id + "\" href=\"");
    REQUIRE(at != std::string::npos);
    const std::size_t from = page.body.find("href=\"", at) + 6;
    return page.body.substr(from, page.body.find('"', from) - from);
  };
  const Response pdf = cl.get(link("download-pdf"));
  const Response sig = cl.get(link("download-sig"));
  REQUIRE(pdf.status == 200);
  REQUIRE(sig.status == 200);
  CHECK(pdf.content_type == "application/pdf");
  CHECK(pdf.header("Content-Disposition") == "attachment; filename=\"report-1.pdf\"");
  CHECK(sig.header("Content-Disposition") == "attachment; filename=\"report-1.pdf.sig\"");
  CHECK(pdf.body.rfind("%PDF-", 0) == 0);
  CHECK(sig.body.size() == 64);

  const std::string pub = report::public_key_pem(signer->public_key());
  const auto verify = [&](const std::string& bytes) {
    return nlohmann::json::parse(
        cl.send(upload("/api/verify", {{"report", bytes}, {"sig", sig.body}, {"pubkey", pub}}))
            .body);
  };
  const auto good = verify(pdf.body);
  CAPTURE(good.dump());
  CHECK(good.at("ok") == true);
  CHECK(good.at("verdict").get<std::string>().rfind("all checks hold", 0) == 0);
  std::string flipped = pdf.body;
  flipped[flipped.size() / 2] = static_cast<char>(flipped[flipped.size() / 2] ^ 1);
  const auto bad = verify(flipped);
  CAPTURE(bad.dump());
  CHECK(bad.value("ok", true) == false);

  // The HTML page shows the same checks.
  auto form = upload("/verify", {{"report", pdf.body}, {"sig", sig.body}, {"pubkey", pub}});
  form.form["csrf"] = cl.csrf;
  const Response html = cl.send(form);
  CHECK(html.body.find("<p id=\"verify-verdict\" data-ok=\"true\"") != std::string::npos);
  CHECK(html.body.find("<table id=\"verify-checks\">") != std::string::npos);
  // A download the console did not issue is not found.
  CHECK(cl.get("/sessions/1/reports/SP-nothing.pdf").status == 404);
}
