// `scaleproof audit PATH... | --session N | --all`: the claim-file audit for insurers.
// Loads reports, session files, folders of them, or store sessions (audit/load.h), applies the
// audit rules (audit/audit.h) and prints the findings (audit/output.h). Exit 0 when no finding
// is an error, 1 when any is, 65 when an input could not be read (each is named on stderr).
#include <unistd.h>

#include <chrono>
#include <iostream>
#include <optional>

#include "audit/audit.h"
#include "audit/calendar.h"
#include "audit/ledger_proof.h"
#include "audit/load.h"
#include "audit/output.h"
#include "audit/output_stream.h"
#include "cli/commands.h"
#include "cli/store_cli.h"
#include "core/error.h"
#include "report/key_files.h"

namespace sp::cli {
namespace {

struct AuditOpts {
  std::vector<std::string> paths;
  long long session = 0;
  bool all = false;
  std::vector<std::string> trust;
  std::string claim_date;
  std::string audit_time;
  int max_span_minutes = 60;
  int inspection_months = 12;
  int stale_days = 180;
  bool json = false;
  std::string pdf;
  std::size_t pdf_pages = audit::kAuditPdfPagesPerVolume;
  std::string ledger;
};

// Volume k of the summary PDF: k = 1 is the --pdf name itself, then NAME-2.pdf, NAME-3.pdf, ...
// (the number before a final ".pdf", else at the end).
std::string volume_path(const std::string& base, std::size_t k) {
  if (k == 1) return base;
  const std::size_t slash = base.find_last_of('/');
  const std::size_t dot = base.size() >= 4 ? base.size() - 4 : std::string::npos;
  const bool ext = dot != std::string::npos && (slash == std::string::npos || dot > slash + 1) &&
                   (base.compare(dot, 4, ".pdf") == 0 || base.compare(dot, 4, ".PDF") == 0);
  const std::string n = "-" + std::to_string(k);
  return ext ? base.substr(0, dot) + n + base.substr(dot) : base + n;
}

// The summary PDF's volumes as files, each written as soon as it is drawn (memory holds one).
// None is overwritten: before the first is written every name of the set is checked; if the
// command fails after some were written, they are removed again (no partial set stays).
class VolumeFiles {
 public:
  explicit VolumeFiles(std::string base) : base_(std::move(base)) {}
  ~VolumeFiles() {
    if (kept_) return;
    for (const auto& p : written_) ::unlink(p.c_str());
  }
  VolumeFiles(const VolumeFiles&) = delete;
  VolumeFiles& operator=(const VolumeFiles&) = delete;

  void write(std::size_t k, std::size_t n, const std::string& bytes) {
    if (k == 1) {
      for (std::size_t j = 1; j <= n; ++j) {
        const std::string path = volume_path(base_, j);
        if (::access(path.c_str(), F_OK) == 0) {
          throw Error(ExitCode::cant_create,
                      path + ": already exists (the audit PDF is not overwritten)");
        }
      }
    }
    const std::string path = volume_path(base_, k);
    report::write_file_atomic(path, bytes, /*exclusive=*/true);
    written_.push_back(path);
    volumes_ = n;
  }
  // The set is complete: keep it, and say where it went.
  void keep(bool say) {
    kept_ = true;
    if (!say) return;
    if (volumes_ == 1) {
      std::cout << "Audit summary written to " << base_ << "\n";
    } else {
      std::cout << "Audit summary written in " << volumes_ << " volumes: " << base_ << " to "
                << volume_path(base_, volumes_) << " (each opens with the same summary)\n";
    }
  }

 private:
  std::string base_;
  std::vector<std::string> written_;
  std::size_t volumes_ = 0;
  bool kept_ = false;
};

// audit --ledger STORE: each report's anchor against a copy of the station's ledger. The chain
// is walked once; each anchor is then one stored-hash lookup (audit/ledger_proof.h).
struct LedgerCheck {
  std::string path;
  std::unique_ptr<store::Store> store;
  store::ChainCheck chain;
  void prepare(audit::AuditItem& item) {
    if (!item.anchor) return;
    item.anchor->checked = true;
    item.anchor->store = path;
    if (!item.anchor->recorded) return;
    audit::AnchorResult r = audit::check_anchor(
        *store, audit::Anchor{item.anchor->rows, item.anchor->head, item.anchor->report_id},
        chain.rows, chain.ok);
    item.anchor->contained = r.state == audit::AnchorState::holds;
    item.anchor->detail = r.detail;
  }
};

std::string check_date(const std::string& v) {
  return audit::parse_date(v) ? "" : "expected a date YYYY-MM-DD, got '" + v + "'";
}

std::string check_time(const std::string& v) {
  return audit::parse_date_time(v) ? ""
                                   : "expected a date-time YYYY-MM-DDThh:mm:ss with Z or an "
                                     "offset, got '" +
                                         v + "'";
}

}  // namespace

void register_audit(CLI::App& app, Context& ctx) {
  auto* sub =
      app.add_subcommand("audit",
                         "Audit a claim file: weigh-reports, session files or store sessions\n"
                         "  e.g. scaleproof audit claims/4711/ --trust keys/station-3.pub.pem "
                         "--claim-date 2026-11-02");
  sub->footer(
      "Examples:\n  scaleproof audit claims/4711/ --trust keys/station.pub.pem --claim-date "
      "2026-11-18\n  scaleproof audit --all --json");
  auto o = std::make_shared<AuditOpts>();
  auto* paths = sub->add_option("PATH", o->paths,
                                "Weigh-report PDFs (with their .sig beside them), session files, "
                                "or folders holding them (one folder = one claim)");
  auto* session = sub->add_option("--session", o->session, "Audit one session of the store (--db)")
                      ->check(CLI::Range(1LL, 1LL << 53).description(""))
                      ->type_name("N");  // not CLI11's "INT:INT in [1 - 9007199254740992]"
  auto* all = sub->add_flag("--all", o->all, "Audit every session of the store (--db)");
  paths->excludes(session)->excludes(all);
  session->excludes(all);
  sub->add_option("--trust", o->trust,
                  "Station public key you accept (NAME.pub.pem), or a folder of them; repeatable");
  sub->add_option("--claim-date", o->claim_date, "Date of the incident or policy check, YYYY-MM-DD")
      ->check(check_date);
  sub->add_option("--audit-time", o->audit_time,
                  "The audit's clock, ISO 8601 with offset (default: now); for reproducible audits")
      ->check(check_time);
  sub->add_option("--max-span-minutes", o->max_span_minutes,
                  "Longest first-to-last pass span of one session")
      ->check(CLI::Range(0, 100000));
  sub->add_option("--inspection-months", o->inspection_months,
                  "A scale inspection must lie within this many months before the weighing")
      ->check(CLI::Range(0, 1200));
  sub->add_option("--stale-days", o->stale_days, "Longest time from weighing to --claim-date")
      ->check(CLI::Range(0, 100000));
  sub->add_flag("--json", o->json, "Print the audit as JSON (format scaleproof-audit/1)");
  sub->add_option("--pdf", o->pdf,
                  "Also write an audit summary PDF to this file (not overwritten)");
  sub->add_option("--pdf-pages", o->pdf_pages,
                  "Pages per volume of the --pdf summary; a longer one continues in NAME-2.pdf, "
                  "NAME-3.pdf, ... (default 1000)")
      ->check(CLI::Range(std::size_t{10}, audit::AuditPdfWriter::kMaxPagesPerVolume));
  auto* ledger = sub->add_option("--ledger", o->ledger,
                                 "A copy of the station's store: every report's ledger anchor "
                                 "must be a prefix of its chain (with PATH...)");
  ledger->needs(paths);

  sub->callback([o, paths, session, all, &ctx] {
    if (!*paths && !*session && !*all) {
      throw usage_error(
          "audit: give PATH... (reports, session files, claim folders), "
          "--session N or --all");
    }
    audit::AuditOptions opt;
    if (!o->audit_time.empty()) {
      opt.now = audit::parse_date_time(o->audit_time)->utc_seconds;
    } else {
      opt.now = std::chrono::duration_cast<std::chrono::seconds>(
                    std::chrono::system_clock::now().time_since_epoch())
                    .count();
    }
    if (!o->claim_date.empty()) opt.claim_date = o->claim_date;
    opt.max_span_minutes = o->max_span_minutes;
    opt.inspection_months = o->inspection_months;
    opt.stale_days = o->stale_days;
    const auto trusted = audit::load_trusted_keys(o->trust);
    opt.trust_list_given = !trusted.empty();

    audit::LoadObserver observer;
    observer.on_unreadable = [](const audit::Unreadable& u) {
      std::cerr << "scaleproof: " << u.message << "\n";
    };
    observer.on_skipped = [&ctx](const std::string& path, const std::string& why) {
      if (!ctx.quiet) std::cerr << "scaleproof: skipped " << path << ": " << why << "\n";
    };
    if (!*paths) {
      // Store audit: streamed, so memory stays flat however many sessions the store holds;
      // the summary PDF is drawn from the same pass (audit/output_stream.h).
      auto db = open_store(ctx);
      std::optional<long long> one;
      if (*session) one = o->session;
      std::vector<std::string> keys;
      for (const auto& k : trusted) keys.push_back(k.fingerprint);
      audit::AuditStreamWriter writer(
          o->json ? audit::AuditStreamWriter::Format::json : audit::AuditStreamWriter::Format::text,
          ctx.colour, 50, !o->pdf.empty(), o->pdf_pages);
      std::optional<VolumeFiles> files;
      if (!o->pdf.empty()) {
        files.emplace(o->pdf);
        writer.set_pdf_sink([&files](std::size_t k, std::size_t n, std::string bytes) {
          files->write(k, n, bytes);
        });
      }
      const audit::AuditResult counts =
          audit::audit_store_streamed(*db, resolve_db_path(ctx), one, opt, keys, writer, std::cout);
      if (o->json) std::cout << "\n";
      if (files) files->keep(!ctx.quiet && !o->json);
      ctx.exit_code = static_cast<int>(counts.errors > 0 ? ExitCode::check_failed : ExitCode::ok);
      return;
    }
    // Reports and session files: in memory (a claim file is a handful of documents).
    LedgerCheck lc;
    std::unique_ptr<store::Txn> ledger_txn;
    if (!o->ledger.empty()) {
      if (::access(o->ledger.c_str(), F_OK) != 0) {
        throw Error(ExitCode::no_input, "--ledger " + o->ledger + ": no store here");
      }
      lc.path = o->ledger;
      lc.store = store::open_sqlite_store(o->ledger, store::Options{});
      ledger_txn = std::make_unique<store::Txn>(*lc.store, store::Txn::read);
      lc.chain = lc.store->check_chain();
      observer.prepare = [&lc](audit::AuditItem& item) { lc.prepare(item); };
    }
    audit::AuditReport rep = audit::audit_paths(o->paths, trusted, opt, observer);

    if (o->json) {
      std::cout << audit::audit_json(rep).dump(2) << "\n";
    } else {
      std::cout << audit::audit_text(rep, ctx.colour);
    }
    if (!o->pdf.empty()) {
      // A claim file is small: its volumes are drawn in memory, then written.
      const std::vector<std::string> volumes = audit::audit_pdf(rep, o->pdf_pages);
      VolumeFiles files(o->pdf);
      for (std::size_t k = 1; k <= volumes.size(); ++k) {
        files.write(k, volumes.size(), volumes[k - 1]);
      }
      files.keep(!ctx.quiet && !o->json);
    }
    ExitCode code = !rep.unreadable.empty() ? ExitCode::data_error
                    : rep.result.errors > 0 ? ExitCode::check_failed
                                            : ExitCode::ok;
    ctx.exit_code = static_cast<int>(code);
  });
}

}  // namespace sp::cli
