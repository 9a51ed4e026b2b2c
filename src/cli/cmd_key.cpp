// `scaleproof key new --out NAME`: a station signing key pair (Ed25519).
// Writes NAME.key (private, PEM, mode 0600) and NAME.pub.pem; refuses to overwrite (exit 73).
// Prints the public key's fingerprint, to be read out or published for those who verify.
#include <iostream>

#include "cli/commands.h"
#include "report/key_files.h"

namespace sp::cli {

void register_key(CLI::App& app, Context& ctx) {
  auto* key = app.add_subcommand("key", "Station signing keys (Ed25519)");
  key->footer("Example:\n  scaleproof key new --out keys/station");
  key->require_subcommand(1);
  auto* fresh = key->add_subcommand("new", "Create a key pair: NAME.key (private) and NAME.pub.pem");
  fresh->footer("Example:\n  scaleproof key new --out keys/station");
  auto out = std::make_shared<std::string>();
  fresh->add_option("--out", *out, "Base name of the key files, e.g. keys/station-3")->required();
  fresh->callback([out, &ctx] {
    report::KeyFiles files = report::create_key_files(*out);
    if (!ctx.quiet) {
      std::cout << "private key: " << files.private_path << " (mode 0600; keep it secret, never in the store)\n"
                << "public key:  " << files.public_path << "\n"
                << "fingerprint: ";
    }
    std::cout << files.fingerprint << "\n";
    ctx.exit_code = 0;
  });
}

}  // namespace sp::cli
