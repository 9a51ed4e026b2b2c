// Renders the weigh-report PDF from a session, its results and its signed weigh record.
//
// Pages, in order: title, then the verdict (result.h: its words, reason and meaning, and which
// figures are 2u), header (report id, station, scale, operator, rig), scale tickets (voided
// passes struck with their reason), results with ± expanded uncertainty (k = 2), geometry
// entered vs back-solved (a length its flag says does not fit is shown so), checks (fit test
// in words, flags), ratings table, the re-solve without the value a failed fit names (when
// there is one), charts (axle loads against bar moment, ball hitches only; side-view sketch),
// recommendation (marked provisional when the result says so), cautions
// (reports/cautions.json, on every report), signature block. A fifth wheel's report uses the
// wording's "couplings.fifth-wheel" words (report_text.h). The record (canonical JSON) and its raw 64-byte signature are
// embedded as the attachments "weigh-record.json" and "weigh-record.sig".
// Deterministic: identical arguments (the file name included) give identical bytes. Throws
// sp::Error.
#pragma once
#include <nlohmann/json.hpp>
#include <string>

#include "core/model.h"
#include "engine/result.h"

namespace sp::report {

inline constexpr const char* kRecordAttachment = "weigh-record.json";
inline constexpr const char* kRecordSigAttachment = "weigh-record.sig";

struct RenderInput {
  const Session* session = nullptr;
  const ReconcileResult* result = nullptr;
  const nlohmann::json* record = nullptr;  // build_record() output; its "report" block is shown
  std::string record_text;                 // canonical_json(*record), as signed
  std::string record_signature;            // 64 bytes
  std::string paper = "a4";                // "a4" | "letter"
  std::string font_dir = "/usr/share/fonts/truetype/dejavu";
  // Reserve the in-file signature (report/pdf_signature.h), to be filled by sign_pdf_in_place;
  // its /M is the record's issued_at.
  bool reserve_signature = false;
  std::string pdf_name = "report.pdf";  // the file's name, no folder (signature block)
};

std::string render_report_pdf(const RenderInput& in);

// Decimals used for the session's weights: 0 when the scale division is 1 or more, else 1.
int weight_decimals(const Session& s);

}  // namespace sp::report
