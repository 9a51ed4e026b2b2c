#include "report/verify.h"

#include "core/error.h"
#include "report/pdf_extract.h"
#include "report/record.h"
#include "report/report_pdf.h"

namespace sp::report {
namespace {

// A weigh record nests a few levels (record > results > tensioned[] > estimate); 64 leaves room.
constexpr std::size_t kMaxRecordDepth = 64;

VerifyCheck check(std::string name, bool ok, std::string detail) {
  return {std::move(name), ok ? CheckStatus::passed : CheckStatus::failed, std::move(detail)};
}

std::string key_hex(const nlohmann::json& record) {
  const auto& report = record.find("report");
  if (report == record.end() || !report->is_object()) return "";
  auto pk = report->find("public_key");
  return pk != report->end() && pk->is_string() ? pk->get<std::string>() : "";
}

}  // namespace

std::string_view to_string(CheckStatus s) {
  switch (s) {
    case CheckStatus::passed: return "ok";
    case CheckStatus::failed: return "FAILED";
    case CheckStatus::skipped: return "skipped";
  }
  return "skipped";
}

bool VerifyResult::all_hold() const {
  if (!is_report) return false;
  for (const auto& c : checks) {
    if (c.status == CheckStatus::failed) return false;
  }
  return true;
}

std::size_t json_depth(std::string_view text) {
  std::size_t depth = 0, max_depth = 0;
  bool in_string = false, escaped = false;
  for (char c : text) {
    if (in_string) {
      if (escaped) escaped = false;
      else if (c == '\\') escaped = true;
      else if (c == '"') in_string = false;
    } else if (c == '"') {
      in_string = true;
    } else if (c == '[' || c == '{') {
      max_depth = std::max(max_depth, ++depth);
    } else if ((c == ']' || c == '}') && depth > 0) {
      --depth;
    }
  }
  return max_depth;
}

VerifyResult verify_report_bytes(std::string_view pdf, const VerifyOptions& options) {
  VerifyResult out;
  if (!looks_like_pdf(pdf)) {
    out.not_report_reason = "not a PDF file (no %PDF- header or %%EOF marker)";
    return out;
  }
  std::optional<std::string> text = find_attachment(pdf, kRecordAttachment);
  if (!text) {
    out.not_report_reason = std::string("no embedded ") + kRecordAttachment + "; not a scaleproof weigh-report";
    return out;
  }
  nlohmann::json record;
  if (json_depth(*text) <= kMaxRecordDepth) record = nlohmann::json::parse(*text, nullptr, false);
  if (!record.is_object() || !record.contains("format") || !record["format"].is_string() ||
      record["format"].get<std::string>().rfind("scaleproof-record/", 0) != 0) {
    out.not_report_reason = std::string(kRecordAttachment) + " is not a scaleproof weigh record";
    return out;
  }
  out.is_report = true;
  if (record.contains("report") && record["report"].is_object() && record["report"].contains("id") &&
      record["report"]["id"].is_string()) {
    out.report_id = record["report"]["id"].get<std::string>();
  }

  // Which key: the station's (given) or the one the record names.
  std::string named;
  std::unique_ptr<Verifier> record_key;
  if (from_hex(key_hex(record), named) && named.size() == kPublicKeySize) {
    try {
      record_key = verifier_from_raw(named);
      out.fingerprint = fingerprint(named);
    } catch (const Error&) {
      // Not a valid curve point: treated as no key named; the checks below then fail.
      record_key.reset();
    }
  }
  const Verifier* key = options.station_key ? options.station_key : record_key.get();
  std::string whose = options.station_key ? "the station key " + fingerprint(options.station_key->public_key())
                                          : "the key named in the record " + out.fingerprint +
                                                " (pass --pubkey to check it is the station's)";

  std::optional<std::string> sig = find_attachment(pdf, kRecordSigAttachment);
  if (!key) {
    out.checks.push_back(check("record signature", false, "the record names no valid Ed25519 public key"));
  } else if (!sig) {
    out.checks.push_back(check("record signature", false, std::string("no embedded ") + kRecordSigAttachment));
  } else {
    bool ok = key->verify(*text, *sig);
    out.checks.push_back(check("record signature", ok,
                               (ok ? "valid, by " : "does not match the record for ") + whose));
  }

  bool canonical = false;
  try {
    canonical = canonical_json(record) == *text;
  } catch (const Error&) {
    canonical = false;  // NaN-like or invalid UTF-8 content: not canonical
  }
  // Format 1 (before the ledger anchor) still verifies: signed records are never re-issued.
  bool known_format = record["format"] == kRecordFormat || record["format"] == kRecordFormatV1;
  out.checks.push_back(check("record form", canonical && known_format,
                             !known_format ? "format " + record["format"].get<std::string>() +
                                                 " is not " + kRecordFormat
                             : canonical   ? record["format"].get<std::string>() + ", canonical"
                                           : "the record is not in canonical form"));

  if (options.station_key) {
    bool same = named == options.station_key->public_key();
    out.checks.push_back(check("station key", same,
                               same ? "the record names the station key"
                                    : "the record names key " + (out.fingerprint.empty() ? "(none)" : out.fingerprint) +
                                          ", not the station key"));
  } else {
    out.checks.push_back({"station key", CheckStatus::skipped, "no --pubkey given"});
  }

  if (!options.recompute) {
    out.checks.push_back({"results", CheckStatus::skipped, "no recomputation available"});
  } else if (!record.contains("session") || !record.contains("results")) {
    out.checks.push_back(check("results", false, "the record lacks its session or its results"));
  } else {
    // A hostile record must not abort verification: its failure becomes a failed check.
    try {
      nlohmann::json again = options.recompute(record["session"]);
      std::vector<std::string> diffs = compare_results(record["results"], again);
      std::string detail = "recomputed from the record's inputs: ";
      if (diffs.empty()) {
        detail += "all results agree";
      } else {
        detail += std::to_string(diffs.size()) + " differ";
        for (const auto& d : diffs) detail += "\n    " + d;
      }
      out.checks.push_back(check("results", diffs.empty(), detail));
    } catch (const Error& e) {
      out.checks.push_back(check("results", false, std::string("cannot recompute: ") + e.what()));
    } catch (const std::exception& e) {
      // Includes nlohmann::json::exception; verification never throws (fuzz contract).
      out.checks.push_back(check("results", false, std::string("cannot recompute: ") + e.what()));
    }
  }

  if (!options.detached_signature) {
    out.checks.push_back({"detached signature", CheckStatus::skipped, "no .sig file beside the report"});
  } else if (!key) {
    out.checks.push_back(check("detached signature", false, "no key to check it with"));
  } else {
    bool ok = key->verify(pdf, *options.detached_signature);
    out.checks.push_back(check("detached signature", ok,
                               (ok ? "the whole file is as signed, by " : "does not match the file for ") + whose));
  }
  return out;
}

}  // namespace sp::report
