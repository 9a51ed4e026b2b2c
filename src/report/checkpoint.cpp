#include "report/checkpoint.h"

#include <nlohmann/json.hpp>

#include "core/error.h"
#include "report/record.h"

namespace sp::report {

std::string checkpoint_message(const CheckpointClaim& c) {
  nlohmann::json m = {{"format", kCheckpointFormat},
                      {"rows", c.rows},
                      {"head", c.head},
                      {"signed_at", c.signed_at},
                      {"signed_by", c.signed_by ? nlohmann::json(*c.signed_by) : nlohmann::json()}};
  return canonical_json(m);
}

SignedCheckpoint sign_checkpoint(const CheckpointClaim& c, const Signer& signer) {
  const std::string key = signer.public_key();
  return {to_hex(key), fingerprint(key), to_hex(signer.sign(checkpoint_message(c)))};
}

bool checkpoint_signature_holds(const CheckpointClaim& c, const std::string& public_key_hex,
                                const std::string& signature_hex) {
  std::string key, sig;
  if (!from_hex(public_key_hex, key) || key.size() != kPublicKeySize) return false;
  if (!from_hex(signature_hex, sig) || sig.size() != kSignatureSize) return false;
  try {
    return verifier_from_raw(key)->verify(checkpoint_message(c), sig);
  } catch (const Error&) {
    return false;  // not a valid curve point, or a name that is not UTF-8
  }
}

}  // namespace sp::report
