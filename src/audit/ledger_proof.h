// The ledger proof behind `check-store` and the audit's anchor rule: the hash chain walked, the
// schema compared with what the migrations make, every signed checkpoint checked (signature,
// key, and that its signed head is a prefix of today's chain), and outside anchors (a head
// printed on a report, a checkpoint handed to an insurer) proved to be prefixes too.
//
// Why prefixes: the chain is plain SHA-256, so whoever can write the file can rewrite a row and
// recompute every later hash, or cut rows off the end; the walk alone then passes. A head taken
// earlier (ROWS rows, hash of row ROWS) still binds rows 1..ROWS: once the walk verified every
// stored hash, row ROWS's stored hash equals the anchor exactly when rows 1..ROWS are unchanged
// (SHA-256 collision resistance, FIPS 180-4). An honest append after the anchor keeps it.
// A checkpoint is such a head stored in the chain, signed by the station key: a rewrite cannot
// re-sign it without the key. What none of this can catch without an outside anchor is written
// in docs/ledger-proof.md.
//
// Reads through the Store interface only; the caller holds a read transaction. Throws what the
// store throws.
#pragma once
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "report/signer.h"
#include "store/store.h"

namespace sp::audit {

// A head taken earlier: chain positions 1..rows, `head` the hex SHA-256 of row `rows`.
struct Anchor {
  long long rows = 0;
  std::string head;    // 64 lower-case hex digits
  std::string source;  // where it came from, for messages: "--expect", "report SP-...", ...
};

// "ROWS:HASH" as given to --expect or printed on a report (spaces inside HASH, as the report
// groups it, are ignored; upper-case hex is accepted). Throws usage_error naming `flag`.
Anchor parse_anchor(const std::string& text, const std::string& flag);

enum class AnchorState {
  holds,         // rows 1..rows of the chain are exactly the anchored ones
  tail_missing,  // the chain is shorter than the anchor: rows were removed from the end
  rewritten,     // row `rows` has another hash: a row at or before it was changed
  not_proven,    // the chain breaks before row `rows`, so the walk could not verify it
};

struct AnchorResult {
  AnchorState state = AnchorState::not_proven;
  std::string detail;  // plain words, e.g. "the chain has only 12 rows; rows 13 to 15 ..."
};

// One anchor against a store whose chain walk verified rows 1..verified_rows. `lower` is the
// largest anchor size known to hold below this one (0: none), so a rewrite is located to rows
// lower+1..rows. chain_ok: the walk found nothing (then verified_rows is the whole chain).
AnchorResult check_anchor(store::Store& st, const Anchor& a, long long verified_rows, bool chain_ok,
                          long long lower = 0);

struct ProofOptions {
  std::vector<Anchor> anchors;              // outside anchors (--expect, --anchors FILE)
  std::vector<std::string> station_keys;    // raw 32-byte keys a checkpoint may be signed with;
                                            // empty: any key (its origin is then not checked)
  std::function<void(long long)> progress;  // called now and then during the walk
};

struct CheckpointResult {
  store::Checkpoint checkpoint;
  int number = 0;      // 1, 2, ... in chain order, as messages name it
  bool holds = false;  // signature, key and prefix all hold
};

struct LedgerProof {
  store::ChainCheck chain;  // the walk (its own finding when !chain.ok)
  std::vector<store::SchemaDifference> schema;
  std::vector<CheckpointResult> checkpoints;
  std::vector<std::pair<Anchor, AnchorResult>> anchors;
  int schema_version = 0;
  // One line per cause besides the walk's own finding, in plain words, no prefix.
  std::vector<std::string> failures;
  std::vector<std::string> notes;  // what was not checked, and why
  bool ok() const { return chain.ok && failures.empty(); }
};

LedgerProof prove_ledger(store::Store& st, const ProofOptions& options);

// The anchors in the JSON that `check-store --json` prints (a station hands it to an insurer):
// every checkpoint in it whose signature holds, then its head. A checkpoint whose signature
// does not hold is data_error naming `source` and the checkpoint. Throws data_error on JSON
// that is not such an output.
std::vector<Anchor> anchors_from_check_json(const std::string& text, const std::string& source);

// Signs the current chain head (rows, head, signed_at, signed_by) with `signer` and appends it
// as a checkpoint (report/checkpoint.h message). Precondition: a write transaction, in which the
// caller has just proven the chain. Throws data_error on an empty store.
store::Checkpoint append_signed_checkpoint(store::Store& st, const report::Signer& signer,
                                           const std::string& signed_at,
                                           const std::optional<std::string>& signed_by);

// Short form of a head for messages: "3f2a9c1e…" (8 hex digits).
std::string short_head(const std::string& head);

}  // namespace sp::audit
