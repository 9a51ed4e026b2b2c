// The ledger proof as JSON, format scaleproof-check/1 (docs/ledger-proof.md): what
// `check-store --json` prints and the console's /api/ledger answers; `check-store --anchors
// FILE` takes it back. Keys: format, verdict ("ok" | "FAILED"), rows, head (null when the
// chain breaks), schema_version, chain (only when it breaks), failures, notes, checkpoints,
// anchors. Deterministic; pure.
#pragma once
#include <nlohmann/json.hpp>

#include "audit/ledger_proof.h"

namespace sp::audit {

nlohmann::ordered_json proof_json(const LedgerProof& p);

}  // namespace sp::audit
