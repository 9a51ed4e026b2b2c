// CMS SignedData with Ed25519 over detached content (RFC 5652 §5, RFC 8419), the signature a
// weigh-report carries inside its PDF (pdf_signature.h).
//
// What is made (make_cms_signature), every field fixed by the inputs, so the same content, key
// and time always give the same bytes (Ed25519 is deterministic, RFC 8032 §5.1.6):
//   ContentInfo signedData, version 1, detached (no eContent), eContentType id-data;
//   one certificate: the station certificate below;
//   one SignerInfo: sid issuerAndSerialNumber, digestAlgorithm id-sha512 (RFC 8419 §3.1:
//   SHA-512 when signed attributes are present), signed attributes content-type (id-data),
//   message-digest (SHA-512 of the content) and, when the record states an issue time,
//   signing-time (that time; RFC 5652 §11.3), signatureAlgorithm id-Ed25519, signature =
//   PureEd25519 over the DER of the signed attributes (RFC 5652 §5.4).
// The station certificate is self-signed X.509 v3 (RFC 5280) made from the station key alone:
// serial = the first 8 bytes of SHA-256(raw key) with the top bit cleared, subject = issuer =
// CN "scaleproof station key " + the first four groups of the fingerprint, notBefore = the issue
// time (or 1970-01-01T00:00:00Z when none is stated), notAfter 99991231235959Z (RFC 5280
// §4.1.2.5: no well-defined expiry), keyUsage critical digitalSignature + nonRepudiation.
// It carries the key; trust comes from the key's fingerprint (a trust file or --pubkey), never
// from the certificate.
// Why the signature is computed here and not by CMS_final: OpenSSL 3.0 (Debian 12) builds the
// SignedData but cannot sign or verify one with Ed25519 (it hands the digest name to the
// EdDSA provider, which refuses it: "eddsa_digest_signverify_init: invalid digest"). The
// structure, attributes and encoding are OpenSSL's CMS API; only the one signature is made
// with Signer::sign over the attributes' DER, as RFC 5652 §5.4 defines it.
#pragma once
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>

#include "report/signer.h"

namespace sp::report {

// Seconds since 1970-01-01T00:00:00Z of an ISO 8601 date-time "YYYY-MM-DDThh:mm:ss" with "Z",
// "+hh:mm", "-hh:mm" or nothing (UTC); nullopt when it is not one.
std::optional<std::int64_t> iso_utc_seconds(std::string_view iso);

// DER of the SignedData over `content`. Throws sp::Error(internal) if OpenSSL fails.
std::string make_cms_signature(std::string_view content, const Signer& signer,
                               std::optional<std::int64_t> signing_time);

// What checking a CMS signature found. Safe on arbitrary bytes: never throws.
struct CmsCheck {
  bool parsed = false;     // a SignedData with one Ed25519 / SHA-512 SignerInfo
  std::string problem;     // why not valid, in words; empty when valid
  std::string signer_key;  // raw 32-byte key of the signer's certificate, when parsed
  std::optional<std::int64_t> signing_time;  // the signing-time attribute, when present
  bool digest_ok = false;                    // message-digest equals SHA-512 of the content
  bool signature_ok = false;                 // Ed25519 signature of the signed attributes holds
  bool valid() const { return parsed && digest_ok && signature_ok; }
};
// Checks `der` (trailing zero padding allowed, as in a PDF's /Contents) against `content`.
CmsCheck check_cms_signature(std::string_view der, std::string_view content);

}  // namespace sp::report
