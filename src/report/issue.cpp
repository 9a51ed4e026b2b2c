#include "report/issue.h"

#include "report/cms_signature.h"
#include "report/pdf_signature.h"
#include "report/record.h"
#include "report/report_pdf.h"

namespace sp::report {

IssuedReport issue_report(const Session& session, const ReconcileResult& result,
                          const nlohmann::json& session_json, const nlohmann::json& result_json,
                          const Signer& signer, const IssueOptions& options) {
  RecordMeta meta{options.issued_at, options.signed_by, options.paper, options.software,
                  signer.public_key(), options.ledger};
  nlohmann::json record = build_record(session_json, result_json, meta);
  IssuedReport out;
  out.id = record["report"]["id"].get<std::string>();
  out.record_text = canonical_json(record);
  out.record_signature = signer.sign(out.record_text);
  RenderInput in;
  in.session = &session;
  in.result = &result;
  in.record = &record;
  in.record_text = out.record_text;
  in.record_signature = out.record_signature;
  in.paper = options.paper;
  in.font_dir = options.font_dir;
  in.reserve_signature = true;
  in.pdf_name = options.pdf_name;
  out.pdf = render_report_pdf(in);
  std::optional<std::int64_t> signed_at;
  if (options.issued_at) signed_at = iso_utc_seconds(*options.issued_at);
  sign_pdf_in_place(out.pdf, signer, signed_at);
  out.pdf_signature = signer.sign(out.pdf);
  out.fingerprint = fingerprint(signer.public_key());
  return out;
}

}  // namespace sp::report
