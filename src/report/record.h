// The weigh record: the signed, machine-readable heart of a weigh-report.
//
// A record is one JSON object:
//   {
//     "format":  "scaleproof-record/2",
//     "report":  {"id", "issued_at" (ISO 8601 or null), "signed_by" (or null), "paper",
//                 "software", "public_key" (raw Ed25519, hex), "key_fingerprint"},
//     "session": the session's inputs, exactly the session-file object (format/session_json.h),
//     "results": the engine's results, exactly the `reconcile --json` object (format/result_json.h)
//     "ledger":  the ledger anchor when issued from the store, else null (issued from a session
//                file): {"rows": chain rows when issued, "head": hex SHA-256 of the last of them,
//                "checkpoint": the store's latest signed checkpoint then, or null:
//                {"position", "rows", "head", "signed_at", "signed_by", "key_fingerprint",
//                 "public_key", "signature"} (report/checkpoint.h signs rows, head, signed_at,
//                 signed_by)}
//   }
// Format 1 records (before the ledger anchor) have no "ledger" key; they still verify.
// Canonical form (what is signed; see reports/VERIFY.md):
//   - UTF-8, no byte-order mark, no whitespace outside strings, no trailing newline;
//   - object keys sorted by their UTF-8 bytes, at every level; array order kept;
//   - strings escaped as JSON requires and nothing more (non-ASCII is written as is);
//   - integers (values with no fraction that fit in 64 bits) without a decimal point;
//     other numbers in the shortest form that reads back to the same IEEE-754 double
//     (nlohmann_json's dtoa, e.g. 0.1, 1.5e-07); -0 is written 0; NaN/inf are refused.
// The report id is "SP-" + the first 12 hex digits of SHA-256 over the canonical record
// without report.id, so the same weighing, signer, key, paper and issue time always get the
// same id, and any other change gets another.
#pragma once
#include <nlohmann/json.hpp>
#include <optional>
#include <string>

namespace sp::report {

inline constexpr const char* kRecordFormat = "scaleproof-record/2";
inline constexpr const char* kRecordFormatV1 = "scaleproof-record/1";  // no ledger anchor

// The store's latest signed checkpoint when a report was issued (store/store.h Checkpoint).
struct CheckpointRef {
  long long position = 0;
  long long rows = 0;
  std::string head;
  std::string signed_at;
  std::optional<std::string> signed_by;
  std::string key_fingerprint;
  std::string public_key;  // hex
  std::string signature;   // hex
};

// Where in the ledger a report was issued: chain rows 1..rows, head = hash of row `rows`.
struct LedgerAnchor {
  long long rows = 0;
  std::string head;
  std::optional<CheckpointRef> checkpoint;
};

// The "ledger" value of a record: the anchor, or nullopt when the record has none (null, or a
// format 1 record). Throws data_error when "ledger" is there but malformed.
std::optional<LedgerAnchor> record_ledger(const nlohmann::json& record);

struct RecordMeta {
  std::optional<std::string> issued_at;  // as given with --issued-at; no clock otherwise
  std::optional<std::string> signed_by;
  std::string paper = "a4";
  std::string software;                  // "scaleproof 0.1.0"
  std::string public_key;                // raw 32 bytes
  std::optional<LedgerAnchor> ledger;    // nullopt: issued from a session file, no anchor
};

// Canonical text of any JSON value (rules above). Throws data_error on NaN/inf.
std::string canonical_json(const nlohmann::json& value);

// "SP-" + 12 hex digits; see above.
std::string report_id(const nlohmann::json& record_without_id);

// Assembles the record object. `session` and `results` are the JSON objects of
// format/result_json.h (ordered or not; the canonical form sorts them).
nlohmann::json build_record(const nlohmann::json& session, const nlohmann::json& results,
                            const RecordMeta& meta);

// Compares the results stated in a record with recomputed ones. Numbers agree when
// |a - b| <= kRecomputeTolerance * max(1, |a|, |b|): recomputation may run on another machine
// or build, where the last bits of a least-squares solution can differ (common practice for
// comparing floating-point results). Everything else must be equal. Returns one line per
// difference, as "$.tongue_load.value: record 812.5, recomputed 790.1"; empty when all agree.
//
// Results stated without a "verdict" come from software before results led with one (issue
// 12), whose records must still verify. They are compared on what they state: every key they
// hold must be recomputed, every number must agree, and every flag they list must be raised
// again (same code, severity, ticket, platform, field, needed); what was added since is not
// held against them (keys they lack, `rating-over` flags), nor is wording that has been
// reworded since (flag messages, rating labels, notes, unsolved lines).
inline constexpr double kRecomputeTolerance = 1e-6;
std::vector<std::string> compare_results(const nlohmann::json& stated,
                                         const nlohmann::json& recomputed,
                                         std::size_t max_lines = 20);

// The recomputed results as a format 1 record stated them, so reports issued before format 2
// still verify. Format 2 added to the results: "verdict", "verdict_reason", "uncertainty",
// "tow_steer", "tow_drive", "if_excluded", "target.provisional", "target.whole_step",
// "tensioned[].note", "flags[].rating" and the flag code "rating-over"; these are removed.
// Wording ("message", "label", "note" strings and "unsolved" lines) is the issuing software's
// and has been reworded since (fifth-wheel terms, one finding per cause), so in a format 1
// record only numbers, codes, statuses and the shape are compared: the wording of `stated`
// is copied over the projection where both have a string at the same place.
nlohmann::json results_as_format1(const nlohmann::json& recomputed, const nlohmann::json& stated);

}  // namespace sp::report
