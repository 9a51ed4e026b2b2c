// Rendering of an audit: the readable findings table, the --json document and the summary PDF.
//
// Pure: strings in, strings (or bytes) out. Every rendering carries the audit's limits, the
// inputs that could not be read (each named) and the cautions: an audit checks documents, it
// does not replace the vehicle and hitch makers' instructions, local law or a qualified
// inspection.
// JSON document (format "scaleproof-audit/1"):
//   {"format", "audited_at", "claim_date" (or null),
//    "limits": {"max_span_minutes", "inspection_months", "stale_days", "future_slack_minutes"},
//    "trusted_keys": [fingerprint...],
//    "summary": {"items", "errors", "warnings", "notes", "clean", "unreadable"},
//    "items": [{"source", "claim", "kind", "label", "verdict", "verdict_reason", "worst" (or null),
//               "findings": [{"code", "severity", "message", "ticket", "platform", "rule",
//                             "evidence": [{"name", "text", "value", "unit"}]}]}],
//    "unreadable": [{"source", "message"}],
//    "cautions": [text...]}
// Items and findings are in the AuditResult's order (worst first).
#pragma once
#include <functional>
#include <memory>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "audit/audit.h"

namespace sp::audit {

struct Unreadable {
  std::string source;
  std::string message;  // the loader's error, naming the file and what was expected
};

struct AuditReport {
  AuditResult result;
  std::vector<Unreadable> unreadable;
  AuditOptions options;
  std::vector<std::string> trusted_keys;  // fingerprints of the --trust keys
};

// The cautions printed with every audit (audit's own line + the weigh-report's first caution).
std::vector<std::string> audit_cautions();

// Text table grouped by item, worst first. Clean items are listed one line each up to
// `max_clean_lines`, then only counted (an audit of a whole store has many).
std::string audit_text(const AuditReport& report, bool colour, std::size_t max_clean_lines = 50);
nlohmann::ordered_json audit_json(const AuditReport& report);

// The parts of audit_text and audit_json, for writers that stream the items
// (audit/output_stream.h); audit_text is head + items + tail, byte for byte.
// Head: summary line (`items`, `claims`; counts from report.result), limits, keys, unreadable.
std::string audit_text_head(const AuditReport& report, std::size_t items, std::size_t claims);
// One item with findings: its heading, counts and findings table.
std::string audit_text_item(const ItemAudit& item, bool colour);
// One line of the "No findings" list.
std::string audit_text_clean_line(const ItemAudit& item);
// The "No findings" section (`clean_lines` are the first of the `clean` items' lines, in order;
// listed only when clean <= max_clean_lines) and the cautions.
std::string audit_text_tail(std::size_t clean, const std::vector<std::string>& clean_lines,
                            std::size_t max_clean_lines);
// One element of the document's "items".
nlohmann::ordered_json audit_json_item(const ItemAudit& item);
// The audit summary PDF (A4) in volumes of at most `max_pages` pages each: the bytes of
// volume 1, 2, ... (one element when it fits). libharu's page tree holds at most 8 191 pages
// per document (HPDF_LIMIT_MAX_ARRAY in hpdf_consts.h), and it keeps a whole document in
// memory until it is saved (~85 KiB a page measured), so a store-wide audit is split: every
// volume opens with the same summary of the whole audit and names itself "Volume k of n"
// (its footer too); the findings run on from one volume to the next in the audit's order.
// Throws sp::Error(internal) when the PDF cannot be made. It is AuditPdfWriter fed with
// report.result's items, twice (the first pass counts the volumes).
inline constexpr std::size_t kAuditPdfPagesPerVolume = 1000;
std::vector<std::string> audit_pdf(const AuditReport& report,
                                   std::size_t max_pages = kAuditPdfPagesPerVolume);

// The summary PDF drawn one item at a time, for writers that stream the items
// (audit/output_stream.h): audit_pdf(report) byte for byte when given the same items.
// The head (counts from report.result, `items` items in all, limits, keys, unreadable inputs)
// is drawn at construction; then item() for each item with findings, in the result's order;
// then finish() with the number of clean items and the clean_line() of the first ones in order
// (kCleanListed are listed, the rest counted). The document is built in memory (libharu) and
// returned by finish(), in volumes of at most `max_pages` pages (see audit_pdf). With
// `volumes` 0 it draws nothing and only counts the volumes (volumes() after finish(), which
// then returns nothing); a second writer given that count draws them. Throws
// sp::Error(internal) when the PDF cannot be made or `max_pages` (2 to kMaxPagesPerVolume)
// cannot hold the summary.
class AuditPdfWriter {
 public:
  static constexpr std::size_t kCleanListed = 200;
  static constexpr std::size_t kMaxPagesPerVolume = 8000;  // under libharu's 8 191
  // Called with each volume as soon as it is finished (volume k of n, its bytes), so that
  // only one volume is in memory; without a sink finish() returns them all.
  using VolumeSink = std::function<void(std::size_t volume, std::size_t volumes, std::string)>;
  AuditPdfWriter(const AuditReport& head, std::size_t items,
                 std::size_t max_pages = kAuditPdfPagesPerVolume, std::size_t volumes = 1,
                 VolumeSink sink = {});
  ~AuditPdfWriter();
  AuditPdfWriter(const AuditPdfWriter&) = delete;
  AuditPdfWriter& operator=(const AuditPdfWriter&) = delete;
  void item(const ItemAudit& item);
  static std::string clean_line(const ItemAudit& item);
  std::vector<std::string> finish(std::size_t clean,
                                  const std::vector<std::string>& first_clean_lines);
  std::size_t volumes() const;

 private:
  struct State;
  std::unique_ptr<State> s_;
};

}  // namespace sp::audit
