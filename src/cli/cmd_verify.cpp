// `scaleproof verify report.pdf [--pubkey NAME.pub.pem | --trust TRUST] [--record-only]`:
// checks a weigh-report. Prints the verdict first (report/verify.h VerifyResult::verdict), then
// one line per check ("ok", "FAILED", "skipped") and what each signature covered. Exit 0 when
// every check holds and a signature covers the printed pages (or --record-only), 1 otherwise
// (the failed checks named), 65 when the file is not a scaleproof weigh-report.
// The detached signature is read from report.pdf.sig beside the file when it exists.
#include <unistd.h>

#include <iostream>

#include "cli/commands.h"
#include "core/error.h"
#include "report/key_files.h"
#include "report/recompute.h"
#include "report/trust.h"
#include "report/verify.h"

namespace sp::cli {
namespace {

// A weigh-report is well under a megabyte; 256 MiB guards against reading a wrong, huge file.
constexpr std::size_t kMaxReportBytes = 256u << 20;

}  // namespace

void register_verify(CLI::App& app, Context& ctx) {
  auto* sub = app.add_subcommand("verify", "Check a weigh-report's signatures and recompute its results");
  sub->footer(
      "Examples:\n  scaleproof verify report-1.pdf --pubkey keys/station.pub.pem\n"
      "  scaleproof verify report-1.pdf --trust stations.trust.toml");
  struct Opts {
    std::string pdf, pubkey;
    std::vector<std::string> trust;
    bool record_only = false;
  };
  auto o = std::make_shared<Opts>();
  sub->add_option("REPORT", o->pdf, "The weigh-report PDF")->required();
  auto* pub = sub->add_option("--pubkey", o->pubkey, "The station's public key (NAME.pub.pem)");
  auto* trust = sub->add_option(
      "--trust", o->trust,
      "Trust file (scaleproof-trust/1 TOML), public key or folder of keys; repeatable");
  pub->excludes(trust);
  sub->add_flag(
      "--record-only", o->record_only,
      "Check the embedded record only; do not require a signature over the printed pages");
  sub->callback([o, &ctx] {
    std::string pdf = report::read_file_bytes(o->pdf);
    if (pdf.size() > kMaxReportBytes) throw data_error(o->pdf + ": larger than 256 MiB; not a weigh-report");
    std::unique_ptr<report::Verifier> station;
    if (!o->pubkey.empty()) station = report::verifier_from_pem(report::read_file_bytes(o->pubkey), o->pubkey);
    report::TrustList trusted;
    if (!o->trust.empty()) trusted = report::load_trust(o->trust);
    report::VerifyOptions opt;
    opt.station_key = station.get();
    opt.trust = o->trust.empty() ? nullptr : &trusted;
    opt.record_only = o->record_only;
    const std::string sig_path = o->pdf + ".sig";
    if (::access(sig_path.c_str(), F_OK) == 0) opt.detached_signature = report::read_file_bytes(sig_path);
    opt.recompute = report::recompute_results;

    report::VerifyResult r = report::verify_report_bytes(pdf, opt);
    if (!r.is_report) throw data_error(o->pdf + ": " + r.not_report_reason);
    std::cout << o->pdf << ": weigh-report " << r.report_id << "\n" << r.verdict() << "\n";
    for (const auto& c : r.checks) {
      std::string name = c.name + ":";
      name.resize(std::max<std::size_t>(name.size(), 20), ' ');
      std::cout << "  " << name << std::string(report::to_string(c.status)) << " - " << c.detail << "\n";
    }
    for (const auto& line : r.coverage()) std::cout << "  " << line << "\n";
    bool ok = r.all_hold();
    if (!ok) {
      bool any = false;
      for (const auto& c : r.checks) {
        if (c.status == report::CheckStatus::failed) {
          std::cerr << "scaleproof: " << o->pdf << ": " << c.name << " failed\n";
          any = true;
        }
      }
      if (!any) std::cerr << "scaleproof: " << o->pdf << ": the printed pages were not verified\n";
    }
    ctx.exit_code = static_cast<int>(ok ? ExitCode::ok : ExitCode::check_failed);
  });
}

}  // namespace sp::cli
