// Audit rule on a report's ledger anchor, applied when the insurer supplied a copy of the
// station's ledger (audit --ledger STORE): the report names the ledger's rows and head when it
// was issued (report/record.h), and the store must still begin with exactly those rows
// (audit/ledger_proof.h). Codes and severities:
//   anchor-not-in-store  error  the store does not contain the report's anchor: rows were
//                               removed or rewritten after the report was issued
//   no-ledger-anchor     note   the report names no anchor (issued from a session file, or
//                               made before reports carried one): nothing to compare
#include <fmt/format.h>

#include "audit/rules_internal.h"

namespace sp::audit::detail {

void anchor_rules(const AuditItem& item, std::vector<Finding>& out) {
  if (!item.anchor || !item.anchor->checked) return;
  const AnchorFacts& a = *item.anchor;
  if (!a.recorded) {
    out.push_back(make_finding(
        "no-ledger-anchor", Severity::note,
        fmt::format("Report {} names no ledger anchor (issued from a session file, or before "
                    "reports carried one): store {} cannot be compared with it.",
                    a.report_id, a.store),
        "a report issued from the store names the ledger's rows and head (record.h)"));
    return;
  }
  if (a.contained) return;
  Finding f = make_finding(
      "anchor-not-in-store", Severity::error,
      fmt::format("Report {} was issued when the ledger held {} rows with head {}; store {} does "
                  "not contain that anchor: {}.",
                  a.report_id, a.rows, a.head, a.store, a.detail),
      "the store must begin with exactly the rows the report was issued from (SHA-256 hash "
      "chain prefix, FIPS 180-4)");
  f.values.push_back(text_value("anchor", fmt::format("{}:{}", a.rows, a.head)));
  out.push_back(std::move(f));
}

}  // namespace sp::audit::detail
