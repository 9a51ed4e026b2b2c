// Issuing a signed weigh-report: record -> record signature -> PDF with its in-file signature
// -> detached PDF signature.
//
//   record_text   = canonical_json(build_record(session_to_json, result_to_json, meta))
//   record_sig    = Ed25519(record_text)            embedded as weigh-record.sig
//   pdf           = render_report_pdf(..., record_text, record_sig), with a signature
//                   placeholder, then sign_pdf_in_place: a CMS SignedData (RFC 8419) over
//                   every byte but its own value (report/pdf_signature.h); signing time =
//                   the record's issued_at, none when it has none
//   pdf_sig       = Ed25519(pdf bytes)              written beside it as report.pdf.sig
// Both PDF signatures cover the printed pages: the in-file one travels with the file, the
// detached one keeps the stock `openssl pkeyutl` check and reports from before working.
// Deterministic: Ed25519 signatures are deterministic (RFC 8032 §5.1.6), so the same session,
// options and key give byte-identical outputs. Pure apart from reading the font files.
#pragma once
#include <nlohmann/json.hpp>
#include <optional>
#include <string>

#include "core/model.h"
#include "engine/result.h"
#include "report/record.h"
#include "report/signer.h"

namespace sp::report {

struct IssueOptions {
  std::optional<std::string> issued_at;  // ISO 8601; no clock otherwise
  std::optional<std::string> signed_by;
  std::string paper = "a4";
  std::string software;                  // "scaleproof X.Y.Z"
  std::string font_dir = "/usr/share/fonts/truetype/dejavu";
  std::optional<LedgerAnchor> ledger;    // the store's head when issued; none from a file
  // The PDF's file name (no folder), printed in its signature block with the detached
  // signature's name, pdf_name + ".sig"; so the bytes depend on it.
  std::string pdf_name = "report.pdf";
};

struct IssuedReport {
  std::string id;
  std::string record_text;
  std::string record_signature;  // 64 bytes
  std::string pdf;
  std::string pdf_signature;     // 64 bytes
  std::string fingerprint;
};

// `session_json` and `result_json` are the format/result_json.h objects of `session` and
// `result`; the caller passes both so this stays independent of how they were produced.
IssuedReport issue_report(const Session& session, const ReconcileResult& result,
                          const nlohmann::json& session_json, const nlohmann::json& result_json,
                          const Signer& signer, const IssueOptions& options);

}  // namespace sp::report
