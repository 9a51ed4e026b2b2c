#include "ops/issue_store.h"

#include "report/signer.h"

namespace sp::ops {

report::LedgerAnchor ledger_anchor(store::Store& db) {
  const store::ChainHead head = db.chain_head();
  report::LedgerAnchor a{head.rows, head.head, std::nullopt};
  if (auto c = db.latest_checkpoint()) {
    a.checkpoint = report::CheckpointRef{c->seq,        c->rows,      c->head,
                                         c->signed_at,  c->signed_by, c->key_fingerprint,
                                         c->public_key, c->signature};
  }
  return a;
}

store::IssuedReport report_row(long long session, const report::IssuedReport& rep,
                               const std::optional<std::string>& signed_by,
                               const std::string& issued_at) {
  store::IssuedReport row;
  row.session_id = session;
  row.report_id = rep.id;
  row.pdf_sha256 = report::to_hex(report::sha256(rep.pdf));
  row.key_fingerprint = rep.fingerprint;
  row.signed_by = signed_by;
  row.issued_at = issued_at;
  return row;
}

void record_report_once(store::Store& db, const store::IssuedReport& row) {
  for (const auto& r : db.list_reports(row.session_id)) {
    if (r.report_id == row.report_id) return;
  }
  db.record_report(row);
}

}  // namespace sp::ops
