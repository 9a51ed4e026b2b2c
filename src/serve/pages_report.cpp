// Issuing the signed report of a session (needs --key) and downloading it; verifying a report
// from its bytes, the same checks as `scaleproof verify` (report/verify.h).
#include <nlohmann/json.hpp>

#include "engine/reconcile.h"
#include "ops/issue_store.h"
#include "report/recompute.h"
#include "report/verify.h"
#include "serve/handlers.h"
#include "serve/html.h"

namespace sp::serve {

namespace {

// Issued reports kept in memory for download; a restarted console asks to issue again (the
// same session and key give the same report id).
constexpr std::size_t kMaxDownloads = 64;

std::string download_path(bool api, long long session, const std::string& report_id,
                          const char* suffix) {
  return std::string(api ? "/api" : "") + "/sessions/" + std::to_string(session) + "/reports/" +
         report_id + suffix;
}

std::string status_word(report::CheckStatus s) {
  return std::string(report::to_string(s));
}

}  // namespace

Response report_issue(const Call& c) {
  if (!c.st.config.signer) {
    throw Error(ExitCode::no_input,
                "report: this console was started without --key; no report "
                "can be signed here");
  }
  const long long id = c.id(0);
  auto db = c.st.open_store();
  Session s;
  report::IssueOptions opt;
  {
    store::Txn txn(*db, store::Txn::read);
    s = db->load_session(id);
    opt.ledger = ops::ledger_anchor(*db);
    txn.commit();
  }
  const ReconcileResult result = reconcile(s);
  opt.issued_at = store::now_utc();
  opt.signed_by = c.operator_name;  // as the CLI: only a named signer (--signed-by)
  opt.software = c.st.config.software;
  opt.pdf_name = "report-" + std::to_string(id) + ".pdf";
  report::IssuedReport rep;
  {
    std::lock_guard<std::mutex> lock(c.st.sign_mu);
    rep = report::issue_report(s, result, report::session_json(s), report::results_json(result),
                               *c.st.config.signer, opt);
  }
  {
    store::Txn txn(*db, store::Txn::write);
    ops::record_report_once(*db, ops::report_row(id, rep, opt.signed_by, *opt.issued_at));
    txn.commit();
  }
  {
    std::lock_guard<std::mutex> lock(c.st.reports_mu);
    if (!c.st.reports.count(rep.id)) c.st.report_order.push_back(rep.id);
    c.st.reports[rep.id] = Download{id, rep.pdf, rep.pdf_signature};
    while (c.st.report_order.size() > kMaxDownloads) {
      c.st.reports.erase(c.st.report_order.front());
      c.st.report_order.erase(c.st.report_order.begin());
    }
  }
  const std::string pdf = download_path(c.api, id, rep.id, ".pdf");
  const std::string sig = download_path(c.api, id, rep.id, ".pdf.sig");
  if (c.api) {
    return json_response(201,
                         nlohmann::ordered_json{{"verdict", std::string(to_string(result.verdict))},
                                                {"report_id", rep.id},
                                                {"fingerprint", rep.fingerprint},
                                                {"pdf", pdf},
                                                {"sig", sig}}
                             .dump(2));
  }
  std::string h = verdict_line(result.verdict, result.verdict_reason);
  h += "<h1>Report " + esc(rep.id) + " issued</h1>\n<p>Signed with key " + esc(rep.fingerprint) +
       ".</p>\n<ul class=\"downloads\"><li><a id=\"download-pdf\" href=\"" + esc(pdf) +
       "\" download>Download the PDF</a></li><li><a id=\"download-sig\" href=\"" + esc(sig) +
       "\" download>Download its signature (.sig)</a></li></ul>\n<p><a href=\"/sessions/" +
       std::to_string(id) + "\">Back to the desk</a></p>\n";
  return html_response(200, page(c, "Report " + rep.id, h));
}

Response report_download(const Call& c) {
  const long long id = c.id(0);
  std::string name = c.args.at(1);
  bool sig = false;
  auto ends = [&name](const std::string& suffix) {
    return name.size() > suffix.size() &&
           name.compare(name.size() - suffix.size(), suffix.size(), suffix) == 0;
  };
  if (ends(".pdf.sig")) {
    sig = true;
    name.resize(name.size() - 8);
  } else if (ends(".pdf")) {
    name.resize(name.size() - 4);
  } else {
    throw Error(ExitCode::no_input, "no such page: " + c.req.path);
  }
  Download d;
  {
    std::lock_guard<std::mutex> lock(c.st.reports_mu);
    auto it = c.st.reports.find(name);
    if (it == c.st.reports.end() || it->second.session != id) {
      throw Error(ExitCode::no_input, "report " + name +
                                          ": not issued by this console since it "
                                          "started; issue it again from the desk");
    }
    d = it->second;
  }
  Response r;
  const std::string file = "report-" + std::to_string(id) + (sig ? ".pdf.sig" : ".pdf");
  r.content_type = sig ? "application/octet-stream" : "application/pdf";
  r.body = sig ? d.sig : d.pdf;
  r.headers.emplace_back("Content-Disposition", "attachment; filename=\"" + file + "\"");
  return r;
}

Response verify_form(const Call& c) {
  std::string h =
      "<h1>Verify a weigh-report</h1>\n<p>The same checks as <code>scaleproof verify</code>. "
      "Nothing you upload is stored.</p>\n<form id=\"verify-form\" method=\"post\" "
      "enctype=\"multipart/form-data\" action=\"/verify\">" +
      csrf_input(c) +
      "\n<p><label for=\"report\">Report (PDF)</label> <input type=\"file\" id=\"report\" "
      "name=\"report\" accept=\"application/pdf\" required></p>\n<p><label for=\"sig\">Its "
      "signature (.sig, optional)</label> <input type=\"file\" id=\"sig\" name=\"sig\"></p>\n"
      "<p><label for=\"pubkey\">Station public key (.pub.pem, optional)</label> <input "
      "type=\"file\" id=\"pubkey\" name=\"pubkey\"></p>\n<p><button type=\"submit\" "
      "id=\"verify-submit\">Verify</button></p></form>\n";
  return html_response(200, page(c, "Verify a report", h));
}

Response verify_post(const Call& c) {
  auto file = [&c](const char* name) -> const UploadedFile* {
    auto it = c.req.files.find(name);
    return it == c.req.files.end() || it->second.content.empty() ? nullptr : &it->second;
  };
  const UploadedFile* pdf = file("report");
  if (pdf == nullptr) throw data_error("report: expected the report PDF as a file upload");
  std::unique_ptr<report::Verifier> station;
  if (const UploadedFile* k = file("pubkey"))
    station = report::verifier_from_pem(k->content, "pubkey");
  report::VerifyOptions opt;
  opt.station_key = station.get();
  if (const UploadedFile* s = file("sig")) opt.detached_signature = s->content;
  opt.recompute = report::recompute_results;
  const report::VerifyResult r = report::verify_report_bytes(pdf->content, opt);
  if (!r.is_report) throw data_error("report: " + r.not_report_reason);
  const bool ok = r.all_hold();
  if (c.api) {
    nlohmann::ordered_json j{{"ok", ok}, {"verdict", r.verdict()}, {"report_id", r.report_id}};
    j["checks"] = nlohmann::ordered_json::array();
    for (const auto& ch : r.checks) {
      j["checks"].push_back(
          {{"name", ch.name}, {"status", status_word(ch.status)}, {"detail", ch.detail}});
    }
    j["coverage"] = r.coverage();
    return json_response(200, j.dump(2));
  }
  std::string h = "<p id=\"verify-verdict\" data-ok=\"" + std::string(ok ? "true" : "false") +
                  "\" class=\"verify " + (ok ? "holds" : "fails") + "\"><strong>" +
                  esc(r.verdict()) + "</strong></p>\n<h1>Weigh-report " + esc(r.report_id) +
                  "</h1>\n<table id=\"verify-checks\"><thead><tr><th scope=\"col\">Check</th><th "
                  "scope=\"col\">Result</th><th scope=\"col\">Detail</th></tr></thead><tbody>\n";
  for (const auto& ch : r.checks) {
    h += "<tr data-check=\"" + esc(ch.name) + "\" data-status=\"" + status_word(ch.status) +
         "\"><td>" + esc(ch.name) + "</td><td class=\"" + status_word(ch.status) + "\">" +
         status_word(ch.status) + "</td><td>" + esc(ch.detail) + "</td></tr>\n";
  }
  h += "</tbody></table>\n<ul>";
  for (const auto& line : r.coverage()) h += "<li>" + esc(line) + "</li>";
  h += "</ul>\n<p><a href=\"/verify\">Verify another report</a></p>\n";
  return html_response(200, page(c, "Verification", h));
}

}  // namespace sp::serve
