// Renders the weigh-report PDF from a session, its results and its signed weigh record.
//
// Pages, in order: header (report id, station, scale, operator, rig), scale tickets (voided
// passes struck with their reason), results with ± expanded uncertainty (k = 2), geometry
// entered vs back-solved, checks (fit test in words, flags), ratings table, charts (axle loads
// against bar moment; side-view sketch), recommendation, cautions (reports/cautions.json, on
// every report), signature block. The record (canonical JSON) and its raw 64-byte signature are
// embedded as the attachments "weigh-record.json" and "weigh-record.sig".
// Deterministic: identical arguments give identical bytes. Throws sp::Error.
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
};

std::string render_report_pdf(const RenderInput& in);

// Decimals used for the session's weights: 0 when the scale division is 1 or more, else 1.
int weight_decimals(const Session& s);

}  // namespace sp::report
