// `scaleproof check-store [--expect ROWS:HASH]... [--anchors FILE]... [--pubkey STATION.pub.pem]
//  [--sign-checkpoint --key STATION.key [--signed-by NAME]] [--json]`: the ledger proof
// (audit/ledger_proof.h): the hash chain over every stored row, the schema against what the
// migrations make (triggers included), every signed checkpoint, and the anchors given.
// Exit: 0 everything holds (prints the row count and the head hash, then what was proven);
// 1 anything does not (the first line names the first bad row, or the first failure; one line
// per cause); 2 a malformed flag; 65 an --anchors file that is not a check-store JSON or whose
// checkpoints do not verify.
// --sign-checkpoint runs the proof inside the write transaction and appends the checkpoint only
// when everything holds, so a station never signs a chain it has not just verified.
#include <iostream>
#include <nlohmann/json.hpp>

#include "audit/ledger_proof.h"
#include "audit/ledger_proof_json.h"
#include "cli/commands.h"
#include "cli/store_cli.h"
#include "core/error.h"
#include "report/checkpoint.h"
#include "report/key_files.h"
#include "report/signer.h"

namespace sp::cli {
namespace {

struct CheckOpts {
  std::string expect_head;
  std::vector<std::string> expect, anchors_files, pubkeys;
  bool sign = false, json = false;
  std::string key, signed_by;
};

void print_text(const audit::LedgerProof& p, const CheckOpts& o) {
  const store::ChainCheck& c = p.chain;
  if (!c.ok) {
    std::cout << "check-store: FAILED at " << c.table << " id " << c.id;
    if (c.ticket) std::cout << " (ticket " << *c.ticket << ")";
    std::cout << ", chain position " << c.seq << ": " << c.problem << "\n";
  } else if (!p.ok()) {
    std::cout << "check-store: FAILED: " << p.failures.front() << "\n";
  } else {
    std::cout << "check-store: ok, " << c.rows << " rows, head "
              << (c.head.empty() ? "(empty store)" : c.head) << "\n";
  }
  for (size_t i = c.ok ? 1 : 0; i < p.failures.size(); ++i) {
    std::cout << "check-store: FAILED: " << p.failures[i] << "\n";
  }
  if (!c.ok) std::cout << "check-store: " << c.rows << " rows before it verified\n";
  if (!p.ok() && c.ok) {
    std::cout << "check-store: the chain itself links, " << c.rows << " rows, head "
              << (c.head.empty() ? "(empty store)" : c.head) << "\n";
  }
  int holding = 0;
  const audit::CheckpointResult* latest = nullptr;
  for (const auto& r : p.checkpoints) {
    if (!r.holds) continue;
    ++holding;
    if (latest == nullptr || r.checkpoint.seq > latest->checkpoint.seq) latest = &r;
  }
  if (latest != nullptr) {
    std::cout << "check-store: " << holding << " of " << p.checkpoints.size()
              << " signed checkpoint(s) hold; latest: rows 1 to " << latest->checkpoint.rows
              << ", signed " << latest->checkpoint.signed_at << " with key "
              << latest->checkpoint.key_fingerprint << "\n";
  } else if (p.checkpoints.empty()) {
    std::cout << "check-store: no signed checkpoint in the store (`check-store --sign-checkpoint "
                 "--key STATION.key` adds one)\n";
  }
  for (const auto& [a, r] : p.anchors) {
    if (r.state == audit::AnchorState::holds) {
      std::cout << "check-store: anchor " << a.rows << ":" << audit::short_head(a.head) << " ("
                << a.source << ") holds: rows 1 to " << a.rows << " are unchanged\n";
    }
  }
  if (!o.expect_head.empty() && p.ok()) {
    std::cout << "check-store: the head is the expected one (--expect-head)\n";
  }
  for (const auto& n : p.notes) std::cout << "check-store: note: " << n << "\n";
}

}  // namespace

void register_check_store(CLI::App& app, Context& ctx) {
  auto* sub = app.add_subcommand(
      "check-store",
      "Prove the store: hash chain, schema, signed checkpoints, and anchors taken earlier");
  sub->footer(
      "Examples:\n  scaleproof check-store\n"
      "  scaleproof check-store --expect 1207:3f2a9c1e...   (the ledger anchor printed on a "
      "report)\n"
      "  scaleproof check-store --sign-checkpoint --key keys/station.key --signed-by \"Ines "
      "Varga\"\n"
      "  scaleproof check-store --json > checkpoints.json   (hand this to an insurer)\n"
      "  scaleproof check-store --anchors checkpoints.json --pubkey keys/station.pub.pem");
  auto o = std::make_shared<CheckOpts>();
  sub->add_option("--expect", o->expect,
                  "ROWS:HASH taken earlier (the ledger anchor printed on a report): proves the "
                  "store still begins with exactly those rows; later appends are fine; "
                  "repeatable");
  sub->add_option("--anchors", o->anchors_files,
                  "JSON from an earlier `check-store --json`: each signed checkpoint in it, and "
                  "its head, must be a prefix of the chain; repeatable");
  sub->add_option("--pubkey", o->pubkeys,
                  "Station public key (NAME.pub.pem) checkpoints must be signed with; "
                  "repeatable (key rotation); default: any key, origin not checked");
  sub->add_option("--expect-head", o->expect_head,
                  "Deprecated: HASH must be today's head exactly, so any later append fails it "
                  "too; use --expect ROWS:HASH");
  auto* sign = sub->add_flag("--sign-checkpoint", o->sign,
                             "After the proof holds, append a checkpoint: the row count and head "
                             "signed with --key");
  auto* key =
      sub->add_option("--key", o->key, "Station private key (NAME.key) for --sign-checkpoint");
  sub->add_option("--signed-by", o->signed_by, "Who signs the checkpoint (signed with it)");
  sub->add_flag("--json", o->json, "Print the proof as JSON (format scaleproof-check/1)");
  key->needs(sign);
  sign->needs(key);

  sub->callback([&ctx, o] {
    audit::ProofOptions po;
    for (const auto& e : o->expect) po.anchors.push_back(audit::parse_anchor(e, "--expect"));
    for (const auto& f : o->anchors_files) {
      for (auto& a : audit::anchors_from_check_json(report::read_file_bytes(f), f)) {
        po.anchors.push_back(std::move(a));
      }
    }
    for (const auto& f : o->pubkeys) {
      po.station_keys.push_back(
          report::verifier_from_pem(report::read_file_bytes(f), f)->public_key());
    }
    std::unique_ptr<report::Signer> signer;
    if (o->sign) signer = report::signer_from_pem(report::read_private_key_file(o->key), o->key);
    if (!o->expect_head.empty()) {
      std::cerr << "scaleproof: --expect-head is deprecated: it fails on any honest append; use "
                   "--expect ROWS:HASH (the anchor printed on a report)\n";
    }

    auto store = open_store(ctx);
    store::Txn txn(*store, o->sign ? store::Txn::write : store::Txn::read);
    const bool tty = stderr_is_terminal() && !ctx.quiet;
    po.progress = [tty](long long n) {
      if (tty) std::cerr << "\rchecking: " << n << " rows" << std::flush;
    };
    audit::LedgerProof p = audit::prove_ledger(*store, po);
    if (tty) std::cerr << "\r\033[K";
    if (!o->expect_head.empty() && p.chain.ok && o->expect_head != p.chain.head) {
      p.failures.push_back("head hash " + (p.chain.head.empty() ? "(empty store)" : p.chain.head) +
                           " is not the expected " + o->expect_head +
                           " (rows were removed from the end, or the chain was rebuilt, or rows "
                           "were appended since)");
    }
    std::string signed_line;
    if (o->sign && p.ok()) {
      std::optional<std::string> by;
      if (!o->signed_by.empty()) by = o->signed_by;
      const store::Checkpoint c =
          audit::append_signed_checkpoint(*store, *signer, store::now_utc(), by);
      const auto all = store->list_checkpoints();
      p.checkpoints.push_back({all.back(), static_cast<int>(all.size()), true});
      // The checkpoint is the chain's new head (written by this transaction, after the proof).
      const store::ChainHead now = store->chain_head();
      p.chain.rows = now.rows;
      p.chain.head = now.head;
      signed_line = "check-store: checkpoint " + std::to_string(all.size()) +
                    " signed: rows 1 to " + std::to_string(c.rows) + ", head " + c.head + ", key " +
                    c.key_fingerprint + "\n";
    }
    txn.commit();
    if (o->json) {
      std::cout << audit::proof_json(p).dump(2) << "\n";
    } else {
      print_text(p, *o);
      std::cout << signed_line;
    }
    if (o->sign && !p.ok() && !o->json) {
      std::cout << "check-store: no checkpoint signed: the proof does not hold\n";
    }
    ctx.exit_code = static_cast<int>(p.ok() ? ExitCode::ok : ExitCode::check_failed);
  });
}

}  // namespace sp::cli
