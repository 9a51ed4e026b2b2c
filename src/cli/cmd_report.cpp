// `scaleproof report FILE|--session N --key NAME.key --out report.pdf [--signed-by NAME]
//  [--paper a4|letter] [--issued-at ISO]`: the signed PDF weigh-report.
// `scaleproof report --session N M ... --out-dir DIR ...`: one report per session, written to
// DIR/report-N.pdf (+ .sig), in one process (a station issuing the day's reports pays the
// start-up, the key and the store once).
// Writes report.pdf and report.pdf.sig (raw 64-byte Ed25519 over the PDF's bytes); refuses to
// overwrite either (73). With --session the report is recorded in the store (which public key
// signed it, and the PDF's SHA-256); if recording fails, the files just written are removed.
// A batch is all or nothing: every output name is checked and every session loaded before the
// first file is written, and on any failure the files already written are removed and nothing
// is recorded.
// Same input, same key, same options, same file name, same store state -> byte-identical files
// (no clock unless --issued-at; the PDF names itself and its .sig); a batch writes the same
// bytes as one `report --session N --out report-N.pdf` per session, each run on the store as it
// was before the batch. A report from the store carries the ledger anchor (the chain's rows and
// head when issued, and its latest signed checkpoint: record.h), so a report issued after
// another one was recorded differs from it in the anchor.
#include <sys/stat.h>
#include <unistd.h>

#include <filesystem>
#include <iostream>
#include <set>

#include "cli/commands.h"
#include "core/error.h"
#include "engine/reconcile.h"
#include "format/session_json.h"
#include "ops/issue_store.h"
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
  std::vector<long long> sessions;
  std::string key, out, out_dir, signed_by, paper = "a4", issued_at;
};

// One report to write: its session (0: from a file) and its two output paths.
struct Planned {
  long long session = 0;
  std::string pdf, sig;
};

void refuse_existing(const Planned& p) {
  for (const std::string& f : {p.pdf, p.sig}) {
    if (::access(f.c_str(), F_OK) == 0) {
      throw Error(ExitCode::cant_create, f + ": already exists; refusing to overwrite it");
    }
  }
}

report::IssueOptions issue_options(const ReportOpts& o) {
  report::IssueOptions opt;
  if (!o.issued_at.empty()) opt.issued_at = o.issued_at;
  if (!o.signed_by.empty()) opt.signed_by = o.signed_by;
  opt.paper = o.paper;
  opt.software = std::string("scaleproof ") + SCALEPROOF_VERSION;
  return opt;
}

// Files written so far; removed unless keep() is called (a failed report or batch leaves none).
class Written {
 public:
  Written() = default;
  Written(const Written&) = delete;
  Written& operator=(const Written&) = delete;
  ~Written() {
    if (keep_) return;
    for (const auto& f : files_) ::unlink(f.c_str());
  }
  void write(const std::string& path, const std::string& bytes) {
    report::write_file_atomic(path, bytes, true);
    files_.push_back(path);
  }
  // One folder fsync for all the names written (report and .sig, or a whole batch), before
  // the store records them: a crash never leaves the ledger naming a report whose files
  // vanished. Each file's data was fsynced when written.
  void sync() const { report::sync_folders(files_); }
  void keep() { keep_ = true; }

 private:
  std::vector<std::string> files_;
  bool keep_ = false;
};

// The reports to write, in the order given; usage errors for a wrong combination of options.
std::vector<Planned> plan_outputs(const ReportOpts& o) {
  const bool from_file = !o.file.empty();
  if (!from_file && o.sessions.empty())
    throw usage_error("report: give a session FILE or --session N");
  if (!o.out_dir.empty()) {
    if (from_file) throw usage_error("report: --out-dir is for --session N...; a FILE takes --out");
    if (!o.out.empty())
      throw usage_error("report: give --out (one report) or --out-dir (one per session), not both");
    struct stat st {};
    if (::stat(o.out_dir.c_str(), &st) != 0 || !S_ISDIR(st.st_mode)) {
      throw Error(ExitCode::cant_create, o.out_dir + ": --out-dir must be an existing folder");
    }
    std::vector<Planned> plan;
    std::set<long long> seen;
    for (long long id : o.sessions) {
      if (!seen.insert(id).second)
        throw usage_error("report: session " + std::to_string(id) + " is given twice");
      const std::string pdf = o.out_dir + "/report-" + std::to_string(id) + ".pdf";
      plan.push_back({id, pdf, pdf + ".sig"});
    }
    return plan;
  }
  if (o.sessions.size() > 1)
    throw usage_error("report: several sessions need --out-dir DIR (one report each)");
  if (o.out.empty())
    throw usage_error("report: --out is required (or --out-dir DIR with --session)");
  return {{from_file ? 0 : o.sessions[0], o.out, o.out + ".sig"}};
}

}  // namespace

void register_report(CLI::App& app, Context& ctx) {
  auto* sub = app.add_subcommand("report", "Write the signed PDF weigh-report of a session");
  sub->footer(
      "Examples:\n  scaleproof report --session 1 --key keys/station.key --out report-1.pdf \\\n   "
      "   --signed-by \"Marit Oyelaran\" --issued-at 2026-10-14T09:50:00-06:00\n  scaleproof "
      "report data-demo/sessions/01-pickup-travel-trailer.json --key keys/station.key --out r.pdf");
  auto o = std::make_shared<ReportOpts>();
  auto* file = sub->add_option("FILE", o->file, "Session file (scaleproof-session/1 JSON)");
  auto* session = sub->add_option("--session", o->sessions, "Session id(s) in the store")
                      ->check(CLI::Range(1LL, 1LL << 53).description(""))
                      ->type_name("N");  // not CLI11's "INT:INT in [1 - 9007199254740992]"
  file->excludes(session);
  sub->add_option("--key", o->key, "Station private key (NAME.key from `key new`)")->required();
  sub->add_option("--out", o->out, "Output PDF; the detached signature goes to OUT.sig");
  sub->add_option(
      "--out-dir", o->out_dir,
      "With --session N...: existing folder for report-N.pdf (+ .sig), one per session");
  sub->add_option("--signed-by", o->signed_by, "Name of the operator who signs");
  sub->add_option("--paper", o->paper, "Paper size: a4 or letter")
      ->check(CLI::IsMember({"a4", "letter"}));
  sub->add_option("--issued-at", o->issued_at,
                  "Issue time printed and signed, ISO 8601 "
                  "(2026-10-14T10:30:00-05:00); default: none")
      ->check([](const std::string& v) {
        return report::valid_pdf_date(v)
                   ? std::string()
                   : "--issued-at: expected YYYY-MM-DDTHH:MM:SS with Z or +HH:MM, got " + v;
      });
  sub->callback([o, &ctx] {
    const std::vector<Planned> plan = plan_outputs(*o);
    for (const Planned& p : plan) refuse_existing(p);
    auto signer = report::signer_from_pem(report::read_private_key_file(o->key), o->key);
    report::IssueOptions opt = issue_options(*o);

    // Every session is read (and so known to exist) before anything is written.
    std::vector<Session> sessions;
    std::unique_ptr<store::Store> db;
    if (!o->file.empty()) {
      std::string text = report::read_file_bytes(o->file);
      if (text.size() > kMaxSessionBytes)
        throw data_error(o->file + ": larger than 16 MiB; expected a session file");
      sessions.push_back(parse_session_json(text, o->file));
    } else {
      db = store::open_sqlite_store(resolve_db_path(ctx), store::Options{});
      store::Txn txn(*db, store::Txn::read);
      for (const Planned& p : plan) sessions.push_back(db->load_session(p.session));
      opt.ledger = ops::ledger_anchor(*db);
      txn.commit();
    }

    Written written;
    std::vector<std::string> ids;  // only the ids and the key are printed: memory stays per report
    std::string fingerprint;
    std::vector<store::IssuedReport> rows;
    for (size_t i = 0; i < plan.size(); ++i) {
      const Session& s = sessions[i];
      ReconcileResult result = reconcile(s);
      report::IssueOptions named = opt;
      named.pdf_name = std::filesystem::path(plan[i].pdf).filename().string();
      report::IssuedReport rep = report::issue_report(s, result, report::session_json(s),
                                                      report::results_json(result), *signer, named);
      written.write(plan[i].pdf, rep.pdf);
      written.write(plan[i].sig, rep.pdf_signature);
      if (db) rows.push_back(ops::report_row(plan[i].session, rep, opt.signed_by, o->issued_at));
      ids.push_back(rep.id);
      fingerprint = rep.fingerprint;
    }
    written.sync();
    if (db) {
      store::Txn txn(*db, store::Txn::write);
      for (const store::IssuedReport& row : rows) ops::record_report_once(*db, row);
      txn.commit();
    }
    written.keep();
    if (!ctx.quiet) {
      for (size_t i = 0; i < plan.size(); ++i) {
        std::cout << "report " << ids[i] << " written to " << plan[i].pdf << " (signature "
                  << plan[i].sig << ")\n";
      }
      std::cout << "signed with key " << fingerprint << "\n";
    }
    ctx.exit_code = 0;
  });
}

}  // namespace sp::cli
