// `scaleproof key new --out NAME [--station S] [--valid-from ISO]`: a station signing key pair
// (Ed25519). Writes NAME.key (private, PEM, mode 0600) and NAME.pub.pem; refuses to overwrite
// (exit 73). Prints the fingerprint and the key's trust-file entry (report/trust.h) to hand to
// those who verify the station's reports (with -q: the fingerprint only).
// `scaleproof key rotate --old OLD --out NEW [--station S] [--at ISO] [--revoke] [--trust FILE]`:
// the next key pair, and the entries that end OLD at AT (valid_to; revoked_at with --revoke,
// for a key that may have leaked) and start NEW at AT. With --trust FILE the whole updated
// trust file is printed instead (FILE is not changed; comments in it are not kept).
#include <chrono>
#include <ctime>
#include <iostream>

#include "cli/commands.h"
#include "core/error.h"
#include "report/cms_signature.h"
#include "report/key_files.h"
#include "report/signer.h"
#include "report/trust.h"

namespace sp::cli {
namespace {

std::string utc_now() {
  std::time_t t = std::chrono::system_clock::to_time_t(std::chrono::system_clock::now());
  std::tm tm{};
  gmtime_r(&t, &tm);
  char buf[32];
  std::strftime(buf, sizeof buf, "%Y-%m-%dT%H:%M:%SZ", &tm);
  return buf;
}

std::string check_time(const std::string& v) {
  return report::iso_utc_seconds(v)
             ? ""
             : "expected YYYY-MM-DDTHH:MM:SS with Z or an offset +HH:MM, got '" + v + "'";
}

std::string default_station(const std::string& name) {
  std::string base = report::key_file_names(name).private_path;
  base = base.substr(base.rfind('/') == std::string::npos ? 0 : base.rfind('/') + 1);
  return base.substr(0, base.size() - 4);
}

}  // namespace

void register_key(CLI::App& app, Context& ctx) {
  auto* key = app.add_subcommand("key", "Station signing keys (Ed25519)");
  key->footer(
      "Examples:\n  scaleproof key new --out keys/station --station \"Larkspur Flats Public "
      "Scale\"\n"
      "  scaleproof key rotate --old keys/station --out keys/station-2 --trust "
      "stations.trust.toml");
  key->require_subcommand(1);

  struct Opts {
    std::string out, old, station, valid_from, at, trust;
    bool revoke = false;
  };
  auto o = std::make_shared<Opts>();
  auto* fresh = key->add_subcommand("new", "Create a key pair: NAME.key (private) and NAME.pub.pem");
  fresh->footer(
      "Example:\n  scaleproof key new --out keys/station --station \"Larkspur Flats Public "
      "Scale\"");
  fresh->add_option("--out", o->out, "Base name of the key files, e.g. keys/station-3")->required();
  fresh->add_option("--station", o->station,
                    "Station name for the trust-file entry (default: the key's name)");
  fresh
      ->add_option("--valid-from", o->valid_from,
                   "Start of the key's validity, ISO 8601 (default: now)")
      ->check(check_time);
  fresh->callback([o, &ctx] {
    report::KeyFiles files = report::create_key_files(o->out);
    if (ctx.quiet) {
      std::cout << files.fingerprint << "\n";
      ctx.exit_code = 0;
      return;
    }
    report::TrustEntry e;
    e.source = files.public_path;
    e.fingerprint = files.fingerprint;
    e.station = o->station.empty() ? default_station(o->out) : o->station;
    e.valid_from = o->valid_from.empty() ? utc_now() : o->valid_from;
    std::cout << "private key: " << files.private_path
              << " (mode 0600; keep it secret, never in the store)\n"
              << "public key:  " << files.public_path << "\n"
              << "fingerprint: " << files.fingerprint << "\n\n"
              << "# trust-file entry (" << report::kTrustFormat
              << "; reports/VERIFY.md), for those who verify this station's reports:\n"
              << report::trust_entry_text(e);
    ctx.exit_code = 0;
  });

  auto* rotate = key->add_subcommand(
      "rotate", "Make the next key pair and the trust entries that end the old key");
  rotate->footer(
      "Example:\n  scaleproof key rotate --old keys/station --out keys/station-2 --at "
      "2027-01-01T00:00:00Z");
  rotate
      ->add_option("--old", o->old,
                   "Base name of the key being replaced (its NAME.pub.pem is read)")
      ->required();
  rotate->add_option("--out", o->out, "Base name of the new key files")->required();
  rotate->add_option("--station", o->station,
                     "Station name (default: the old key's entry, or its name)");
  rotate
      ->add_option("--at", o->at,
                   "When the old key ends and the new one starts, ISO 8601 (default: now)")
      ->check(check_time);
  rotate->add_flag("--revoke", o->revoke,
                   "End the old key with revoked_at (it may have leaked) instead of valid_to");
  rotate->add_option("--trust", o->trust, "Trust file holding the old key: print it updated");
  rotate->callback([o, &ctx] {
    const report::KeyFiles old_names = report::key_file_names(o->old);
    const auto old_key = report::verifier_from_pem(report::read_file_bytes(old_names.public_path),
                                                   old_names.public_path);
    const std::string old_fp = report::fingerprint(old_key->public_key());
    report::TrustList list;
    if (!o->trust.empty()) {
      list = report::parse_trust_file(report::read_file_bytes(o->trust), o->trust);
      if (list.find(old_fp) == nullptr) {
        throw data_error(o->trust + ": the old key " + old_fp + " (" + old_names.public_path +
                         ") is not in it");
      }
    }
    const std::string at = o->at.empty() ? utc_now() : o->at;
    report::TrustEntry ended;
    if (const report::TrustEntry* e = list.find(old_fp)) ended = *e;
    ended.fingerprint = old_fp;
    if (!o->station.empty()) ended.station = o->station;
    if (ended.station.empty()) ended.station = default_station(o->old);
    if (ended.valid_from &&
        report::iso_utc_seconds(at) <= report::iso_utc_seconds(*ended.valid_from)) {
      throw usage_error("key rotate: --at " + at + " is not after the old key's valid_from " +
                        *ended.valid_from);
    }
    (o->revoke ? ended.revoked_at : ended.valid_to) = at;
    report::KeyFiles files = report::create_key_files(o->out);
    report::TrustEntry next;
    next.fingerprint = files.fingerprint;
    next.station = ended.station;
    next.valid_from = at;
    if (!ctx.quiet) {
      std::cerr << "old key: " << old_names.public_path << " " << old_fp << " ends at " << at
                << (o->revoke ? " (revoked)" : "") << "\n"
                << "new key: " << files.private_path << " (mode 0600) and " << files.public_path
                << " " << files.fingerprint << "\n";
    }
    if (!o->trust.empty()) {
      std::cout << "format = \"" << report::kTrustFormat << "\"\n";
      for (const auto& e : list.entries) {
        std::cout << "\n" << report::trust_entry_text(e.fingerprint == old_fp ? ended : e);
      }
      std::cout << "\n" << report::trust_entry_text(next);
    } else {
      std::cout
          << "# trust-file entries: replace the old key's entry with the first, add the second\n"
          << report::trust_entry_text(ended) << "\n"
          << report::trust_entry_text(next);
    }
    ctx.exit_code = 0;
  });
}

}  // namespace sp::cli
