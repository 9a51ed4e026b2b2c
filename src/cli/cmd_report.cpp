// `scaleproof report FILE|--session N --key NAME.key --out report.pdf [--signed-by NAME]
//  [--paper a4|letter] [--issued-at ISO]`: the signed PDF weigh-report.
// Writes report.pdf and report.pdf.sig (raw 64-byte Ed25519 over the PDF's bytes); refuses to
// overwrite either (73). With --session the report is recorded in the store (which public key
// signed it, and the PDF's SHA-256); if recording fails, the files just written are removed.
// Same input, same key, same options -> byte-identical files (no clock unless --issued-at).
#include <unistd.h>

#include <iostream>

#include "cli/commands.h"
#include "core/error.h"
#include "engine/reconcile.h"
#include "format/session_json.h"
#include "report/issue.h"
#include "report/key_files.h"
#include "report/pdf_doc.h"
#include "report/recompute.h"
#include "report/signer.h"
#include "store/store.h"

namespace sp::cli {
namespace {

// Session files are a few kilobytes; 16 MiB guards against reading a wrong, huge file.
constexpr std::size_t kMaxSessionBytes = 16u << 20;

struct ReportOpts {
  std::string file;
  long long session = 0;
  std::string key, out, signed_by, paper = "a4", issued_at;
};

}  // namespace

void register_report(CLI::App& app, Context& ctx) {
  auto* sub = app.add_subcommand("report", "Write the signed PDF weigh-report of a session");
  sub->footer("Examples:\n  scaleproof report --session 1 --key keys/station.key --out report-1.pdf \\\n      --signed-by \"Marit Oyelaran\" --issued-at 2026-10-14T09:50:00-06:00\n  scaleproof report data-demo/sessions/01-pickup-travel-trailer.json --key keys/station.key --out r.pdf");
  auto o = std::make_shared<ReportOpts>();
  auto* file = sub->add_option("FILE", o->file, "Session file (scaleproof-session/1 JSON)");
  auto* session = sub->add_option("--session", o->session, "Session id in the store")
                      ->check(CLI::Range(1LL, 1LL << 53));
  file->excludes(session);
  sub->add_option("--key", o->key, "Station private key (NAME.key from `key new`)")->required();
  sub->add_option("--out", o->out, "Output PDF; the detached signature goes to OUT.sig")->required();
  sub->add_option("--signed-by", o->signed_by, "Name of the operator who signs");
  sub->add_option("--paper", o->paper, "Paper size: a4 or letter")->check(CLI::IsMember({"a4", "letter"}));
  sub->add_option("--issued-at", o->issued_at, "Issue time printed and signed, ISO 8601 "
                                               "(2026-10-14T10:30:00-05:00); default: none")
      ->check([](const std::string& v) {
        return report::valid_pdf_date(v) ? std::string()
                                         : "--issued-at: expected YYYY-MM-DDTHH:MM:SS with Z or +HH:MM, got " + v;
      });
  sub->callback([o, file, session, &ctx] {
    if (!*file && !*session) throw usage_error("report: give a session FILE or --session N");
    const std::string sig_path = o->out + ".sig";
    for (const std::string& p : {o->out, sig_path}) {
      if (::access(p.c_str(), F_OK) == 0) {
        throw Error(ExitCode::cant_create, p + ": already exists; refusing to overwrite it");
      }
    }
    auto signer = report::signer_from_pem(report::read_file_bytes(o->key), o->key);

    Session s;
    std::unique_ptr<store::Store> db;
    if (*file) {
      std::string text = report::read_file_bytes(o->file);
      if (text.size() > kMaxSessionBytes) throw data_error(o->file + ": larger than 16 MiB; expected a session file");
      s = parse_session_json(text, o->file);
    } else {
      db = store::open_sqlite_store(resolve_db_path(ctx), store::Options{});
      store::Txn txn(*db, store::Txn::read);
      s = db->load_session(o->session);
      txn.commit();
    }
    ReconcileResult result = reconcile(s);

    report::IssueOptions opt;
    if (!o->issued_at.empty()) opt.issued_at = o->issued_at;
    if (!o->signed_by.empty()) opt.signed_by = o->signed_by;
    opt.paper = o->paper;
    opt.software = std::string("scaleproof ") + SCALEPROOF_VERSION;
    report::IssuedReport rep =
        report::issue_report(s, result, report::session_json(s), report::results_json(result), *signer, opt);

    report::write_file_atomic(o->out, rep.pdf, true);
    try {
      report::write_file_atomic(sig_path, rep.pdf_signature, true);
    } catch (...) {
      ::unlink(o->out.c_str());
      throw;
    }
    if (db) {
      try {
        store::IssuedReport row;
        row.session_id = o->session;
        row.report_id = rep.id;
        row.pdf_sha256 = report::to_hex(report::sha256(rep.pdf));
        row.key_fingerprint = rep.fingerprint;
        row.signed_by = opt.signed_by;
        row.issued_at = o->issued_at;  // empty: the store records the time of recording
        store::Txn txn(*db, store::Txn::write);
        bool known = false;
        for (const auto& r : db->list_reports(o->session)) known = known || r.report_id == rep.id;
        if (!known) db->record_report(row);  // an identical re-issue is the same report
        txn.commit();
      } catch (...) {
        ::unlink(o->out.c_str());
        ::unlink(sig_path.c_str());
        throw;
      }
    }
    if (!ctx.quiet) {
      std::cout << "report " << rep.id << " written to " << o->out << " (signature " << sig_path << ")\n"
                << "signed with key " << rep.fingerprint << "\n";
    }
    ctx.exit_code = 0;
  });
}

}  // namespace sp::cli
