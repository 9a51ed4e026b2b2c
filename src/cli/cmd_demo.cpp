// `scaleproof demo [--out DIR]`: the invented scenario of data-demo/ end to end, for a
// newcomer's first five minutes. In DIR (default ./scaleproof-demo, which must be new or empty):
//   1. a copy of the scenario files (data-demo/), to read and to rerun commands on;
//   2. a fresh ticket store: the station's scale with its inspection history, the rigs, the
//      sessions (session files) and a return visit (CSV of passes), each session closed;
//   3. a station signing key made on the spot (keys/station.key, never committed anywhere);
//   4. each session reconciled and its signed weigh-report written (reports/*.pdf + .sig) and
//      recorded in the store;
//   5. every report verified with the station's public key, the results recomputed;
//   6. an audit of the reports folder as an insurer would run it (audit.txt, audit-summary.pdf)
//      and the store's hash chain checked;
// and it ends listing what it wrote and what to open first. The demo checks itself: the two
// planted errors (demo.json "expect") must be named where they were planted, every report
// must verify and the chain must be intact; otherwise it exits 1.
// Exit: 0 done; 1 a self-check failed; 73 DIR not empty / cannot be created.
#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <filesystem>
#include <iostream>
#include <memory>
#include <nlohmann/json.hpp>
#include <sstream>

#include "audit/audit.h"
#include "audit/calendar.h"
#include "audit/load.h"
#include "audit/output.h"
#include "cli/commands.h"
#include "cli/demo_data.h"
#include "core/error.h"
#include "engine/reconcile.h"
#include "format/session_json.h"
#include "report/issue.h"
#include "report/key_files.h"
#include "report/recompute.h"
#include "report/signer.h"
#include "report/trust.h"
#include "report/verify.h"
#include "store/importers.h"
#include "store/store.h"

namespace sp::cli {

namespace {

namespace fs = std::filesystem;
using nlohmann::json;

std::string_view demo_file(const std::string& name) {
  for (const auto& f : embedded::demo_files())
    if (f.name == name) return f.contents;
  throw Error(ExitCode::internal, "demo: the built-in scenario has no " + name +
                                      " (rebuild scaleproof after changing data-demo/)");
}

std::string join(const fs::path& a, const std::string& b) {
  return (a / b).string();
}

void make_dir(const fs::path& p) {
  std::error_code ec;
  fs::create_directories(p, ec);
  if (ec)
    throw Error(ExitCode::cant_create, p.string() + ": cannot create the folder: " + ec.message());
}

// File names from rig names: letters, digits and '-' only.
std::string slug(const std::string& s) {
  std::string out;
  for (char c : s) out += (std::isalnum(static_cast<unsigned char>(c)) || c == '-') ? c : '-';
  return out;
}

struct DemoSession {
  long long id = 0;
  std::string source;  // data-demo/... file it came from
  std::string rig;
  Session session;
  std::optional<ReconcileResult> result;
  std::string pdf, sig;  // written report
};

// "what it flagged" in one line for the progress output.
std::string flags_line(const ReconcileResult& r) {
  std::string s;
  for (const Flag& f : r.flags) {
    if (f.severity == Severity::note) continue;
    std::string where = f.rating   ? *f.rating
                        : f.ticket ? *f.ticket + (f.platform ? " " + *f.platform : "")
                                   : f.field.value_or("");
    s += (s.empty() ? "" : ", ") + f.code + (where.empty() ? "" : " (" + where + ")");
  }
  return s.empty() ? "no flags" : s;
}

bool expectation_met(const json& e, const ReconcileResult& r) {
  for (const Flag& f : r.flags) {
    if (f.code != e.at("flag").get<std::string>()) continue;
    if (e.contains("ticket") && f.ticket != e.at("ticket").get<std::string>()) continue;
    if (e.contains("platform") && f.platform != e.at("platform").get<std::string>()) continue;
    if (e.contains("field") && f.field != e.at("field").get<std::string>()) continue;
    return true;
  }
  return false;
}

class Demo {
 public:
  Demo(std::string out, const Context& ctx) : out_(std::move(out)), ctx_(ctx) {}

  int run() {
    manifest_ = json::parse(demo_file("demo.json"));
    prepare();
    build_store();
    make_key();
    issue_reports();
    verify_reports();
    audit_and_check();
    finish();
    return failures_.empty() ? 0 : static_cast<int>(ExitCode::check_failed);
  }

 private:
  void say(const std::string& s) const {
    if (!ctx_.quiet) std::cout << s << "\n";
  }
  void fail(const std::string& s) {
    failures_.push_back(s);
    std::cerr << "scaleproof: demo self-check: " << s << "\n";
  }

  void prepare() {
    std::error_code ec;
    if (fs::exists(dir_, ec) && !fs::is_empty(dir_, ec))
      throw Error(ExitCode::cant_create,
                  out_ +
                      ": exists and is not empty; the demo builds a fresh store: remove it or "
                      "pass --out NEW-FOLDER");
    for (const char* sub : {"", "keys", "reports", "data-demo"}) make_dir(dir_ / sub);
    for (const auto& f : embedded::demo_files()) {
      const fs::path p = dir_ / "data-demo" / std::string(f.name);
      make_dir(p.parent_path());
      report::write_file_atomic(p.string(), std::string(f.contents), true);
    }
    say(
        fmt::format("scaleproof demo: an invented scenario at \"{}\" (every name, vehicle and "
                    "ticket is made up)\n",
                    manifest_.at("station").get<std::string>()));
    say(fmt::format("1. scenario files copied to {}", join(dir_, "data-demo/")));
  }

  Session parse(const std::string& name) const {
    return parse_session_json(demo_file(name), "data-demo/" + name);
  }

  void build_store() {
    db_path_ = join(dir_, "store.db");
    store::Options o;
    o.create = true;
    db_ = store::open_sqlite_store(db_path_, o);
    const json& sc = manifest_.at("scale");
    const std::optional<std::string> by = std::string("scaleproof demo");
    {
      store::Txn txn(*db_, store::Txn::write);
      ScaleInfo info;
      info.id = sc.at("id").get<std::string>();
      info.division = sc.at("division").get<double>();
      info.accuracy_class = sc.at("accuracy_class").get<std::string>();
      info.name = sc.at("name").get<std::string>();
      info.location = sc.at("location").get<std::string>();
      info.capacity = sc.at("capacity").get<double>();
      const long long scale_id = db_->add_scale(info, WeightUnit::lb, by, "");
      for (const json& i : sc.at("inspections")) {
        store::Inspection in;
        in.scale_id = scale_id;
        in.inspected_on = i.at("date").get<std::string>();
        in.seal = i.at("seal").get<std::string>();
        in.inspector = i.at("inspector").get<std::string>();
        in.entered_by = by;
        db_->add_inspection(in);
      }
      txn.commit();
    }
    for (const json& r : manifest_.at("rigs")) {
      const Session s = parse(r.at("from_session").get<std::string>());
      store::RigRecord rig;
      rig.name = r.at("name").get<std::string>();
      rig.units = s.units;
      rig.vehicle = s.tow_vehicle;
      rig.trailer = s.trailer;
      rig.entered_by = by;
      try {
        store::Txn txn(*db_, store::Txn::write);
        db_->add_rig(rig);
        txn.commit();
      } catch (const Error& e) {
        fail("the store refused rig " + rig.name + ": " + e.what());
      }
    }
    std::vector<std::string> sources;
    for (const json& f : manifest_.at("sessions")) {
      const std::string name = f.get<std::string>();
      const Session s = parse(name);
      try {
        store::Txn txn(*db_, store::Txn::write);
        store::import_session(*db_, s, "data-demo/" + name, s.operator_name);
        txn.commit();
        sources.push_back("data-demo/" + name);
      } catch (const Error& e) {
        // Keep going so the rest of the demo still shows; this session is reported from its
        // file, not from the store, and the self-check fails.
        fail("the store refused " + name + ": " + e.what());
        DemoSession d;
        d.source = "data-demo/" + name;
        d.rig = "file";
        d.session = s;
        file_only_.push_back(std::move(d));
      }
    }
    long long csv_passes = 0;
    for (const json& f : manifest_.at("pass_csv")) {
      const std::string name = f.get<std::string>();
      std::istringstream in{std::string(demo_file(name))};
      store::Txn txn(*db_, store::Txn::write);
      csv_passes += store::import_pass_csv(*db_, in, "data-demo/" + name, std::nullopt).passes;
      txn.commit();
      sources.push_back("data-demo/" + name);
    }
    // Close every session at its last pass, as the operator does when the rig drives off.
    store::Txn txn(*db_, store::Txn::write);
    const auto list = db_->list_sessions();
    for (std::size_t i = 0; i < list.size(); ++i) {
      DemoSession d;
      d.id = list[i].id;
      d.rig = list[i].rig_name;
      d.source = i < sources.size() ? sources[i] : "store";
      d.session = db_->load_session(d.id);
      std::string last;
      for (const Pass& p : d.session.passes) last = std::max(last, p.weighed_at);
      db_->close_session(d.id, d.session.operator_name, last);
      sessions_.push_back(std::move(d));
    }
    txn.commit();
    for (DemoSession& d : file_only_) sessions_.push_back(std::move(d));
    say(
        fmt::format("2. ticket store {}: scale {} with {} inspections, {} rigs, {} sessions "
                    "({} from session files, {} passes from CSV), all closed",
                    db_path_, sc.at("id").get<std::string>(), sc.at("inspections").size(),
                    manifest_.at("rigs").size(), sessions_.size(), manifest_.at("sessions").size(),
                    csv_passes));
  }

  void make_key() {
    keys_ = report::create_key_files(join(dir_, "keys/station"));
    signer_ = report::signer_from_pem(report::read_private_key_file(keys_.private_path),
                                      keys_.private_path);
    verifier_ =
        report::verifier_from_pem(report::read_file_bytes(keys_.public_path), keys_.public_path);
    // The insurer trusts the station's key through a trust file (report/trust.h), as it would
    // in practice: the entry names the station and the key's validity. The bounds are invented
    // to cover the demo's fixed issue times (October 2026) and its audit (November 2026).
    report::TrustEntry e;
    e.source = keys_.public_path;
    e.fingerprint = keys_.fingerprint;
    e.station = manifest_.at("station").get<std::string>();
    e.valid_from = "2026-01-01T00:00:00Z";
    e.valid_to = "2027-01-01T00:00:00Z";
    trust_path_ = join(dir_, "keys/insurer.trust.toml");
    report::write_file_atomic(trust_path_,
                              std::string("# Keys the insurer accepts (") + report::kTrustFormat +
                                  "; reports/VERIFY.md). Invented demo data.\nformat = \"" +
                                  report::kTrustFormat + "\"\n\n" + report::trust_entry_text(e),
                              true);
    say(
        fmt::format("3. station key made just now: {} (private, mode 0600) and {}\n"
                    "   fingerprint {}\n"
                    "   the insurer's trust file {} accepts it from {} to {}",
                    keys_.private_path, keys_.public_path, keys_.fingerprint, trust_path_,
                    *e.valid_from, *e.valid_to));
  }

  void issue_reports() {
    say("4. reconciled and signed:");
    for (DemoSession& d : sessions_) {
      d.result = reconcile(d.session);
      const ReconcileResult& r = *d.result;
      report::IssueOptions opt;
      std::string last;
      for (const Pass& p : d.session.passes) last = std::max(last, p.weighed_at);
      opt.issued_at = last;  // issued as the rig leaves the scale (a fixed, invented time)
      opt.signed_by = d.session.operator_name;
      opt.software = std::string("scaleproof ") + SCALEPROOF_VERSION;
      const std::string base = d.id > 0 ? fmt::format("report-{}-{}", d.id, slug(d.rig))
                                        : "report-file-" + slug(fs::path(d.source).stem().string());
      opt.pdf_name = base + ".pdf";
      const report::IssuedReport rep = report::issue_report(
          d.session, r, report::session_json(d.session), report::results_json(r), *signer_, opt);
      d.pdf = join(dir_, "reports/" + base + ".pdf");
      d.sig = d.pdf + ".sig";
      report::write_file_atomic(d.pdf, rep.pdf, true);
      report::write_file_atomic(d.sig, rep.pdf_signature, true);
      if (d.id > 0) record(d, rep, opt, last);
      std::string fit =
          r.fit ? fmt::format("fit {} (chi-square {:.1f}, dof {})",
                              r.fit->passed ? "passed" : "FAILED", r.fit->chi_square, r.fit->dof)
                : "no fit test";
      say(fmt::format("   session {} {:<5} {:<40} {:<10} {}; {}", d.id, d.rig, d.source,
                      to_string(r.verdict), fit, flags_line(r)));
      for (const json& e : manifest_.at("expect"))
        if ("data-demo/" + e.at("session").get<std::string>() == d.source && !expectation_met(e, r))
          fail(fmt::format("{}: expected the planted error to be named ({}), it was not", d.source,
                           e.dump()));
    }
  }

  // The store records which key signed which report, and the PDF's SHA-256.
  void record(const DemoSession& d, const report::IssuedReport& rep,
              const report::IssueOptions& opt, const std::string& at) {
    store::Txn txn(*db_, store::Txn::write);
    store::IssuedReport row;
    row.session_id = d.id;
    row.report_id = rep.id;
    row.pdf_sha256 = report::to_hex(report::sha256(rep.pdf));
    row.key_fingerprint = rep.fingerprint;
    row.signed_by = opt.signed_by;
    row.issued_at = at;
    db_->record_report(row);
    txn.commit();
  }

  void verify_reports() {
    say("5. verified with the station's public key (signatures, and results recomputed):");
    for (const DemoSession& d : sessions_) {
      report::VerifyOptions opt;
      opt.station_key = verifier_.get();
      opt.detached_signature = report::read_file_bytes(d.sig);
      opt.recompute = report::recompute_results;
      const report::VerifyResult v =
          report::verify_report_bytes(report::read_file_bytes(d.pdf), opt);
      int passed = 0;
      for (const auto& c : v.checks) passed += c.status == report::CheckStatus::passed;
      if (v.all_hold()) {
        say(fmt::format("   {}: all {} checks hold", d.pdf, passed));
      } else {
        fail(fmt::format("{}: verification failed ({})", d.pdf,
                         v.is_report ? "see scaleproof verify" : v.not_report_reason));
      }
    }
  }

  void audit_and_check() {
    const json& a = manifest_.at("audit");
    audit::AuditOptions opt;
    opt.now = audit::parse_date_time(a.at("audit_time").get<std::string>())->utc_seconds;
    opt.claim_date = a.at("claim_date").get<std::string>();
    const auto trusted = audit::load_trusted_keys({trust_path_});
    opt.trust_list_given = true;
    audit::Auditor auditor(opt);
    audit::AuditReport rep;
    rep.options = opt;
    for (const auto& k : trusted) rep.trusted_keys.push_back(k.fingerprint);
    audit::LoadSinks sinks;
    sinks.item = [&](const audit::AuditItem& item) { auditor.add(item); };
    sinks.unreadable = [&](audit::Unreadable u) {
      fail("audit could not read " + u.source + ": " + u.message);
      rep.unreadable.push_back(std::move(u));
    };
    sinks.skipped = [](const std::string&, const std::string&) {};
    audit::load_paths({join(dir_, "reports")}, trusted, sinks);
    rep.result = auditor.finish();
    audit_txt_ = join(dir_, "audit.txt");
    audit_pdf_ = join(dir_, "audit-summary.pdf");
    report::write_file_atomic(audit_txt_, audit::audit_text(rep, false), true);
    // A handful of demo reports: one volume (audit_pdf splits only past its page limit).
    const std::vector<std::string> pdf = audit::audit_pdf(rep);
    if (pdf.size() != 1) throw Error(ExitCode::internal, "demo: the audit PDF needs one volume");
    report::write_file_atomic(audit_pdf_, pdf.front(), true);
    say(fmt::format(
        "6. audit of {} as an insurer runs it (claim date {}): {} items, {} errors, "
        "{} warnings, {} notes, {} clean",
        join(dir_, "reports/"), *opt.claim_date, rep.result.items.size(), rep.result.errors,
        rep.result.warnings, rep.result.notes, rep.result.clean_items));
    for (const auto& item : rep.result.items) {
      std::string codes;
      for (const auto& f : item.findings)
        if (f.severity != Severity::note) codes += (codes.empty() ? "" : ", ") + f.code;
      say(fmt::format("   {:<44} {}", fs::path(item.source).filename().string(),
                      codes.empty() ? "no errors or warnings" : codes));
    }
    store::Txn txn(*db_, store::Txn::read);
    const store::ChainCheck c = db_->check_chain();
    txn.commit();
    if (c.ok) {
      say(fmt::format("   store hash chain intact: {} rows, head {}", c.rows,
                      c.head.substr(0, 16)));
    } else {
      fail(fmt::format("store hash chain broken at {} #{}: {}", c.table, c.id, c.problem));
    }
  }

  void finish() {
    if (ctx_.quiet) return;
    const std::string db = db_path_;
    std::cout << "\nWrote:\n"
              << fmt::format("  {:<44} the ticket store (SQLite, hash-chained)\n", db)
              << fmt::format("  {:<44} signed weigh-reports and their detached signatures\n",
                             join(dir_, "reports/*.pdf(.sig)"))
              << fmt::format("  {:<44} station key pair (the private key stays here)\n",
                             join(dir_, "keys/station.{key,pub.pem}"))
              << fmt::format("  {:<44} the insurer's trust file for that key\n", trust_path_)
              << fmt::format("  {:<44} the insurer's audit of the reports\n", audit_txt_)
              << fmt::format("  {:<44} the same audit as a PDF summary\n", audit_pdf_)
              << fmt::format("  {:<44} the scenario's files (sessions, CSV, rigs, truth)\n",
                             join(dir_, "data-demo/"));
    std::cout << "\nOpen first:\n";
    if (!sessions_.empty())
      std::cout << "  " << sessions_.front().pdf
                << "   a clean setup at three bar settings, with the recommendation\n";
    for (const DemoSession& d : sessions_)
      for (const json& e : manifest_.at("expect"))
        if ("data-demo/" + e.at("session").get<std::string>() == d.source)
          std::cout << "  " << d.pdf << "   " << e.at("flag").get<std::string>()
                    << " named by the fit\n";
    std::cout << "  " << audit_txt_ << "   what an insurer's audit makes of all of them\n";
    std::cout << "\nThen try:\n"
              << "  scaleproof --db " << db << " session list\n"
              << "  scaleproof verify "
              << (sessions_.empty() ? "REPORT.pdf" : sessions_.front().pdf) << " --trust "
              << trust_path_ << "\n"
              << "  scaleproof plan "
              << join(dir_, "data-demo/sessions/01-pickup-travel-trailer.json") << "\n"
              << "  scaleproof reconcile "
              << join(dir_, "data-demo/sessions/03-mis-keyed-reading.json") << "\n";
    if (!failures_.empty())
      std::cout << "\nThe demo's self-check FAILED (" << failures_.size()
                << " problem(s), listed on stderr).\n";
  }

  std::string out_;
  fs::path dir_{out_};
  const Context& ctx_;
  json manifest_;
  std::string db_path_, audit_txt_, audit_pdf_, trust_path_;
  std::unique_ptr<store::Store> db_;
  report::KeyFiles keys_;
  std::unique_ptr<report::Signer> signer_;
  std::unique_ptr<report::Verifier> verifier_;
  std::vector<DemoSession> sessions_;
  std::vector<DemoSession> file_only_;  // sessions the store refused (reported from the file)
  std::vector<std::string> failures_;
};

}  // namespace

void register_demo(CLI::App& app, Context& ctx) {
  CLI::App* sub = app.add_subcommand(
      "demo",
      "Run the invented demo scenario end to end: store, imports, signed reports, "
      "verification and an audit, in a fresh folder");
  auto out = std::make_shared<std::string>("scaleproof-demo");
  sub->add_option("--out", *out, "Folder to build the demo in (must be new or empty)");
  sub->footer(
      "Example:\n"
      "  scaleproof demo --out demo-out   # then open demo-out/reports/report-1-RA-1.pdf");
  sub->callback([out, &ctx] { ctx.exit_code = Demo(*out, ctx).run(); });
}

}  // namespace sp::cli
