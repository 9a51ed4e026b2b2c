// Verification of a weigh-report from its bytes alone (safe on arbitrary input: it never
// crashes, throws or reads out of bounds; a fuzz target drives verify_report_bytes). The PDF is
// read with qpdf (pdf_extract.h), so any valid arrangement of the same objects reads alike.
//
// Checks, in order, each passed / failed / skipped:
//   "in-file signature"  the CMS signature inside the PDF (pdf_signature.h) covers the whole
//                        file but its own value and holds, by the station key when one is given
//                        (else by the key the record names); skipped when the PDF has none
//                        (reports issued before in-file signatures);
//   "record signature"   the embedded weigh-record.sig is a valid Ed25519 signature of the
//                        embedded weigh-record.json, by that same key;
//   "record form"        the record is in canonical form with format "scaleproof-record/2"
//                        (or /1, the format before the ledger anchor);
//   "station key"        with --pubkey: the record names that key; with --trust: the record's
//                        key is in the trust list and the report was issued within its validity
//                        (trust.h check_trust); skipped with neither ("origin not checked");
//   "results"            results recomputed from the record's session equal the record's
//                        results (record.h compare_results; skipped without a recompute);
//   "detached signature" report.pdf.sig is a valid signature of the whole file (skipped when
//                        absent).
// The printed pages are verified when the in-file or the detached signature holds. When
// neither is there the report does not hold (verdict "PAGES NOT VERIFIED"), unless the caller
// asked for the record checks only (record_only).
// Not a report (is_report false): not a readable PDF, or no parseable scaleproof record inside.
#pragma once
#include <functional>
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "report/pdf_signature.h"
#include "report/signer.h"
#include "report/trust.h"

namespace sp::report {

enum class CheckStatus { passed, failed, skipped };

struct VerifyCheck {
  std::string name;
  CheckStatus status = CheckStatus::skipped;
  std::string detail;
};

struct VerifyResult {
  bool is_report = false;
  std::string not_report_reason;
  std::string report_id;    // when is_report
  std::optional<std::string> issued_at;  // the record's report.issued_at, when a string
  std::string fingerprint;  // of the key that signed the record
  std::vector<VerifyCheck> checks;
  bool pages_verified = false;               // the in-file or the detached signature holds
  bool record_only = false;                  // VerifyOptions::record_only was set
  bool origin_checked = false;               // a --pubkey or --trust named the signing key
  std::optional<PdfSignatureCheck> in_file;  // the in-file signature looked at, when any
  // is_report, no check failed, and the pages verified (or record_only).
  bool all_hold() const;
  // The verdict, one line, the same words wherever it is shown: "all checks hold: ...",
  // "all checks hold, but the origin was not checked: ...", "PAGES NOT VERIFIED: ...",
  // "record checks hold (--record-only): ...", "VERIFICATION FAILED: ...".
  std::string verdict() const;
  // What each signature covered, one line each ("printed pages: ...", "weigh record: ...").
  std::vector<std::string> coverage() const;
};

// Recomputes the results object from the record's "session" object. May throw sp::Error
// (a bad session); verify turns that into a failed "results" check.
using Recompute = std::function<nlohmann::json(const nlohmann::json& session)>;

struct VerifyOptions {
  const Verifier* station_key = nullptr;         // --pubkey; null: the record's own key
  const TrustList* trust = nullptr;              // --trust; checked against the record's key
  bool record_only = false;                      // --record-only: pages not required
  std::optional<std::string> detached_signature; // bytes of report.pdf.sig, when present
  Recompute recompute;                           // empty: "results" is skipped
};

VerifyResult verify_report_bytes(std::string_view pdf, const VerifyOptions& options);

// Nesting depth of a JSON text (brackets outside strings), computed without recursion, so
// hostile input cannot exhaust the stack of a recursive parser.
std::size_t json_depth(std::string_view text);

std::string_view to_string(CheckStatus s);

}  // namespace sp::report
