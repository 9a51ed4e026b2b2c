// Issuing weigh-reports of sessions in the ticket store: the pieces `scaleproof report
// --session` and the console share, around report/issue.h.
//  - ledger_anchor: the chain's rows and head and its latest signed checkpoint, read in the
//    transaction that loads the sessions (a report is issued from exactly that state; its own
//    row comes after it). Precondition: a transaction is open.
//  - report_row: the ledger row of an issued report (which key signed it, the PDF's SHA-256);
//    `issued_at` empty: the store records the time of recording.
//  - record_report_once: appends the row unless the session already has a report of that id
//    (an identical re-issue is the same report). Precondition: a write transaction.
#pragma once
#include <optional>
#include <string>

#include "report/issue.h"
#include "report/record.h"
#include "store/store.h"

namespace sp::ops {

report::LedgerAnchor ledger_anchor(store::Store& db);

store::IssuedReport report_row(long long session, const report::IssuedReport& rep,
                               const std::optional<std::string>& signed_by,
                               const std::string& issued_at);

void record_report_once(store::Store& db, const store::IssuedReport& row);

}  // namespace sp::ops
