// Fuzz target: the weigh-report verifier (report/verify.h verify_report_bytes), which reads
// untrusted PDFs. Its contract is stronger than the parsers': it never throws at all, and a
// file it does not take for a report never "holds". Inputs are the PDF bytes; when the input is longer than 64
// bytes and its last byte is odd, its last 64 bytes are also offered as the detached signature.
// The station key is RFC 8032 §7.1 TEST 1's public key; seed reports are signed with it.
#include <string>

#include "fuzz_common.h"
#include "report/recompute.h"
#include "report/signer.h"
#include "report/verify.h"

namespace sp::fuzz {

inline const sp::report::Verifier& rfc8032_test1_key() {
  // RFC 8032 §7.1 TEST 1 public key (references.md, Cryptography).
  static const char kPub[] =
      "\xd7\x5a\x98\x01\x82\xb1\x0a\xb7\xd5\x4b\xfe\xd3\xc9\x64\x07\x3a"
      "\x0e\xe1\x72\xf3\xda\xa6\x23\x25\xaf\x02\x1a\x68\xf7\x07\x51\x1a";
  static const auto key = sp::report::verifier_from_raw(std::string_view(kPub, 32));
  return *key;
}

inline int verify_report_one(const uint8_t* data, size_t size) {
  std::string_view bytes = as_text(data, size);
  sp::report::VerifyOptions opt;
  opt.station_key = &rfc8032_test1_key();
  opt.recompute = sp::report::recompute_results;
  if (size > 64 && (data[size - 1] & 1u) != 0) {
    opt.detached_signature = std::string(bytes.substr(size - 64));
    bytes = bytes.substr(0, size - 64);
  }
  sp::report::VerifyResult r;
  try {
    r = sp::report::verify_report_bytes(bytes, opt);
  } catch (const std::exception& e) {
    violated("verify_report_bytes threw", e.what());
  }
  if (!r.is_report && r.all_hold()) violated("a non-report holds", r.not_report_reason);
  return 0;
}

}  // namespace sp::fuzz

SP_FUZZ_ENTRY(sp::fuzz::verify_report_one)
