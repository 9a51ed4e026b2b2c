// Claim-file audit: the rules an insurer applies to weigh-reports, session files and store
// sessions before relying on them.
//
// Pure library over plain structs: no I/O, no clock, no globals, no printing. The caller
// (the CLI's loaders) fills one AuditItem per weighing it read, with the engine's
// reconciliation and, for signed reports, the verification facts; the Auditor applies every
// rule and returns findings grouped by item, worst first.
//
// Units: every weight in an item is in its session's weight unit (core/model.h); findings'
// evidence carries the unit beside each number. Times: "weighed_at" strings are ISO 8601
// date-times with an offset (session file format); dates are "YYYY-MM-DD".
// Streaming: Auditor::add keeps no Session or ReconcileResult beyond the one being added. By
// default it keeps every item's findings until finish() (ticket-reuse may still add one to any
// earlier item). A store audit first names the tickets shared by several sessions
// (Auditor::limit_reuse_to) and hands every item that holds none of them to a sink at once
// (Auditor::on_final), so memory stays flat however large the store is (audit/output_stream.h).
#pragma once
#include <cstdint>
#include <functional>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "core/model.h"
#include "engine/result.h"

namespace sp::audit {

// Where an item came from. A report is a signed weigh-report PDF, a session a session file,
// a store item one session of the ticket store.
enum class ItemKind { report, session, store };
std::string_view to_string(ItemKind k);

// One recorded inspection (certification) of a scale.
struct Inspection {
  std::string date;                      // "YYYY-MM-DD"
  std::optional<std::string> reference;  // seal or certificate number, when recorded
};

// What verifying a signed report established (filled by the report verifier's loader).
struct VerificationFacts {
  bool record_signature_ok = false;    // the embedded weigh record's signature holds
  std::string key_fingerprint;         // of the key that signed it (report/signer.h format)
  bool key_trusted = false;            // that fingerprint is among the insurer's --trust keys
  bool detached_present = false;       // a "<report>.pdf.sig" lay beside the PDF
  bool detached_ok = false;            // ... and it verifies the PDF's bytes with that key
  bool in_file_present = false;        // the PDF holds a signature (report/pdf_signature.h)
  bool in_file_ok = false;             // ... which holds over the whole file, by that key
  // ... which holds over a range that ends before the end of the file: bytes were appended
  // (an incremental update) from this offset on; the file has file_size bytes.
  std::optional<long long> in_file_covered_end;
  long long file_size = 0;
  std::string in_file_problem;  // why the in-file signature fails, when it does
  // The trust list's verdict on the signing key at the report's issue time (report/trust.h),
  // when the key is in the list: nullopt otherwise.
  std::optional<bool> key_in_validity;
  std::string key_validity_detail;
  bool record_matches = true;          // stated results equal the recomputation
  std::vector<std::string> mismatches; // one line per differing result, when not
};

// A report's ledger anchor (report/record.h "ledger"): where in the station's ledger it was
// issued, and, when the insurer supplied a copy of that ledger (audit --ledger), whether it
// still begins with exactly those rows (audit/ledger_proof.h check_anchor).
struct AnchorFacts {
  std::string report_id;
  bool recorded = false;   // the record names an anchor (false: issued from a session file)
  long long rows = 0;
  std::string head;        // hex
  bool checked = false;    // a store was supplied and compared
  std::string store;       // its path, for the message
  bool contained = false;  // ... and it contains the anchor
  std::string detail;      // why not, in plain words
};

struct AuditItem {
  std::string source;  // file path, or "<store>#<session id>"
  std::string claim;   // the claim it belongs to: the PATH argument (folder or file) or store
  ItemKind kind = ItemKind::session;
  Session session;
  // The engine's result for `session` (for a report: recomputed from the embedded record).
  // nullopt when reconcile() threw; `reconcile_error` then says why.
  std::optional<ReconcileResult> result;
  std::optional<std::string> reconcile_error;
  std::optional<VerificationFacts> verification;  // reports only
  std::optional<AnchorFacts> anchor;              // reports only
  // The scale's inspection history when known (store); when nullopt the rules fall back to
  // session.scale.last_inspected.
  std::optional<std::vector<Inspection>> inspections;
};

struct AuditOptions {
  // The audit clock: seconds since 1970-01-01T00:00:00Z. Required (the library reads no clock);
  // the CLI passes the system time.
  std::int64_t now = 0;
  // Date of the incident or of the policy check, "YYYY-MM-DD"; stale-weighing needs it.
  std::optional<std::string> claim_date;
  // First to last pass of one session. 60 min: the default; a rig parked longer may
  // have been loaded or unloaded between passes (common practice).
  int max_span_minutes = 60;
  // No inspection within this many months before the weighing: inspection-lapsed. 12 months is
  // the usual annual certification cycle (common practice; jurisdictions differ).
  int inspection_months = 12;
  // Weighing more than this many days before the claim date: stale-weighing (issue #5 default).
  int stale_days = 180;
  // Station clocks are not synchronised to the second; a ticket up to this far ahead of the
  // audit clock is not yet "future" (common practice: a few minutes of clock drift).
  int future_slack_minutes = 5;
  // Whether the insurer named any trusted key (a key, a folder of keys or a trust file). Without
  // one every report key is unknown, which is reported as a warning (origin unproven) instead of an
  // error.
  bool trust_list_given = false;
};

// One number or fact shown as evidence. `text` is what people read (value with unit);
// `number`/`unit` are for machines (JSON) when the fact is numeric.
struct EvidenceValue {
  std::string name;
  std::string text;
  std::optional<double> number;
  std::string unit;
};

struct Finding {
  std::string code;  // e.g. "ticket-reuse"; the codes are listed in audit_rules.cpp
  Severity severity = Severity::warning;
  std::string message;  // plain language, with the numbers
  std::optional<std::string> ticket;
  std::optional<std::string> platform;
  std::vector<EvidenceValue> values;
  std::string rule;  // the rule applied, with its source ("NIST HB 44 Table 3", "common practice")
};

// Findings for one item, worst first (error, warning, note; then in rule order).
struct ItemAudit {
  std::uint32_t index = 0;  // position among the items added (0-based), for stable merging
  std::string source;
  std::string claim;
  ItemKind kind = ItemKind::session;
  std::string label;  // "session 12 at scale ST-3, 2026-10-14" etc.
  // The engine's verdict on the weighing (engine/result.h), in the audit's own reading: for a
  // report, that of the recomputed results; not-proven when it could not be reconciled.
  Verdict verdict = Verdict::not_proven;
  std::string verdict_reason;
  WeightUnit weight_unit = WeightUnit::lb;
  std::vector<Finding> findings;
  int count(Severity s) const;
  // Worst severity present; nullopt when clean.
  std::optional<Severity> worst() const;
};

struct AuditResult {
  std::vector<ItemAudit> items;  // worst item first; input order among equals
  int errors = 0, warnings = 0, notes = 0;
  int clean_items = 0;  // items without any finding
  // Items added and claims seen: items.size() and its claims, unless items were handed to an
  // Auditor::on_final sink (then `items` holds only the ones kept until finish()).
  std::size_t total_items = 0;
  std::size_t claims = 0;
};

// The per-item rules (everything except ticket-reuse, which needs the other items).
// Precondition: options.now set. Never throws on odd data: a rule that cannot be applied
// (unreadable time, missing reading) says so as a finding.
std::vector<Finding> audit_item(const AuditItem& item, const AuditOptions& options);

// Applies audit_item to each item and ticket-reuse across all items added (across claims too).
class Auditor {
 public:
  explicit Auditor(AuditOptions options);
  ~Auditor();
  Auditor(const Auditor&) = delete;
  Auditor& operator=(const Auditor&) = delete;
  void add(const AuditItem& item);
  // Only passes whose ticket is in `tickets` can be a ticket-reuse (the others are known to be
  // unique): only they enter the ticket index, and an item holding none of them is final when
  // added. Without this call every ticket is indexed and every item kept until finish().
  void limit_reuse_to(std::vector<std::string> tickets);
  // Where final items go (findings sorted, worst first), in the order added, instead of being
  // kept; the counts of finish() include them. Items that may still receive a ticket-reuse
  // finding are kept until finish().
  void on_final(std::function<void(ItemAudit&&)> sink);
  // Sorted result of the items kept; counts over every item added. The Auditor is left empty.
  AuditResult finish();

 private:
  struct State;
  std::unique_ptr<State> state_;
};

// Convenience: all items at once.
AuditResult run_audit(const std::vector<AuditItem>& items, const AuditOptions& options);

// A short label for an item: session id or file, scale, date of the first pass.
std::string item_label(const AuditItem& item);

}  // namespace sp::audit
