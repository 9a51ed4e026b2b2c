// The signed message of a ledger checkpoint (schema/003_checkpoints.sql), and signing and
// checking it with the station key (report/signer.h).
//
// Message: the canonical JSON (record.h rules) of
//   {"format": "scaleproof-checkpoint/1", "rows": N, "head": "<64 hex>",
//    "signed_at": "<ISO 8601>", "signed_by": "<name>" or null}
// signed with PureEd25519 (RFC 8032). With stock tools: write that text without a trailing
// newline (`jq -cjS` of the object gives it for ASCII names) and run
// `openssl pkeyutl -verify -pubin -inkey STATION.pub.pem -rawin -in msg -sigfile sig.bin`.
// Pure apart from the signer; nothing here reads the store.
#pragma once
#include <optional>
#include <string>

#include "report/signer.h"

namespace sp::report {

inline constexpr const char* kCheckpointFormat = "scaleproof-checkpoint/1";

struct CheckpointClaim {
  long long rows = 0;
  std::string head;  // 64 lower-case hex digits
  std::string signed_at;
  std::optional<std::string> signed_by;
};

std::string checkpoint_message(const CheckpointClaim& c);

struct SignedCheckpoint {
  std::string public_key_hex;  // 64 hex digits
  std::string fingerprint;
  std::string signature_hex;  // 128 hex digits
};
SignedCheckpoint sign_checkpoint(const CheckpointClaim& c, const Signer& signer);

// True when `signature_hex` is a valid signature of the claim by `public_key_hex`; false for
// any malformed key or signature (never throws).
bool checkpoint_signature_holds(const CheckpointClaim& c, const std::string& public_key_hex,
                                const std::string& signature_hex);

}  // namespace sp::report
