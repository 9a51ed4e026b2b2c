// Verification of a weigh-report from its bytes alone (safe on arbitrary input: it never
// crashes, throws or reads out of bounds; a fuzz target drives verify_report_bytes).
//
// Checks, in order, each passed / failed / skipped:
//   "record signature"   the embedded weigh-record.sig is a valid Ed25519 signature of the
//                        embedded weigh-record.json, by the station key when one is given,
//                        else by the key the record names (which proves only that the record
//                        is unaltered since it was signed by whoever holds that key);
//   "record form"        the record is in canonical form with format "scaleproof-record/2"
//                        (or /1, the format before the ledger anchor);
//   "station key"        the record names the given station key (skipped without one);
//   "results"            results recomputed from the record's session equal the record's
//                        results (record.h compare_results; skipped without a recompute);
//   "detached signature" report.pdf.sig is a valid signature of the whole file (skipped when
//                        absent). This is the check that covers the printed pages.
// Not a report (is_report false): not a PDF, or no parseable scaleproof record inside.
#pragma once
#include <functional>
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "report/signer.h"

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
  std::string fingerprint;  // of the key that signed the record
  std::vector<VerifyCheck> checks;
  bool all_hold() const;    // is_report and no check failed
};

// Recomputes the results object from the record's "session" object. May throw sp::Error
// (a bad session); verify turns that into a failed "results" check.
using Recompute = std::function<nlohmann::json(const nlohmann::json& session)>;

struct VerifyOptions {
  const Verifier* station_key = nullptr;         // --pubkey; null: the record's own key
  std::optional<std::string> detached_signature; // bytes of report.pdf.sig, when present
  Recompute recompute;                           // empty: "results" is skipped
};

VerifyResult verify_report_bytes(std::string_view pdf, const VerifyOptions& options);

// Nesting depth of a JSON text (brackets outside strings), computed without recursion, so
// hostile input cannot exhaust the stack of a recursive parser.
std::size_t json_depth(std::string_view text);

std::string_view to_string(CheckStatus s);

}  // namespace sp::report
