#include "audit/ledger_proof_json.h"

namespace sp::audit {
namespace {

const char* state_word(AnchorState s) {
  switch (s) {
    case AnchorState::holds:
      return "holds";
    case AnchorState::tail_missing:
      return "tail-missing";
    case AnchorState::rewritten:
      return "rewritten";
    case AnchorState::not_proven:
      return "not-proven";
  }
  return "not-proven";
}

nlohmann::ordered_json checkpoint_json(const CheckpointResult& r) {
  const store::Checkpoint& c = r.checkpoint;
  return {
      {"number", r.number},
      {"position", c.seq},
      {"rows", c.rows},
      {"head", c.head},
      {"public_key", c.public_key},
      {"key_fingerprint", c.key_fingerprint},
      {"signature", c.signature},
      {"signed_by", c.signed_by ? nlohmann::ordered_json(*c.signed_by) : nlohmann::ordered_json()},
      {"signed_at", c.signed_at},
      {"holds", r.holds}};
}

}  // namespace

// Format scaleproof-check/1: what a station hands to an insurer (docs/ledger-proof.md); its
// checkpoints are self-verifying and `check-store --anchors FILE` takes it back.
nlohmann::ordered_json proof_json(const LedgerProof& p) {
  nlohmann::ordered_json j = {{"format", "scaleproof-check/1"},
                              {"verdict", p.ok() ? "ok" : "FAILED"},
                              {"rows", p.chain.rows},
                              {"head", p.chain.head},
                              {"schema_version", p.schema_version}};
  if (!p.chain.ok) {
    j["chain"] = {{"table", p.chain.table},
                  {"id", p.chain.id},
                  {"position", p.chain.seq},
                  {"problem", p.chain.problem},
                  {"ticket", p.chain.ticket ? nlohmann::ordered_json(*p.chain.ticket)
                                            : nlohmann::ordered_json()}};
    j["head"] = nullptr;  // rows counts the rows before the bad one; no head is proven
  }
  j["failures"] = p.failures;
  j["notes"] = p.notes;
  j["checkpoints"] = nlohmann::ordered_json::array();
  for (const auto& r : p.checkpoints) j["checkpoints"].push_back(checkpoint_json(r));
  j["anchors"] = nlohmann::ordered_json::array();
  for (const auto& [a, r] : p.anchors) {
    j["anchors"].push_back({{"rows", a.rows},
                            {"head", a.head},
                            {"source", a.source},
                            {"state", state_word(r.state)},
                            {"detail", r.detail}});
  }
  return j;
}

}  // namespace sp::audit
