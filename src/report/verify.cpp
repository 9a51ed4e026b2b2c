#include "report/verify.h"

#include "core/error.h"
#include "report/pdf_extract.h"
#include "report/pdf_signature.h"
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
  return pages_verified || record_only;
}

std::string VerifyResult::verdict() const {
  if (!is_report) return "NOT A WEIGH-REPORT: " + not_report_reason;
  std::string failed;
  for (const auto& c : checks) {
    if (c.status == CheckStatus::failed) failed += (failed.empty() ? "" : ", ") + c.name;
  }
  if (!failed.empty()) return "VERIFICATION FAILED: " + failed;
  const std::string origin =
      origin_checked ? ""
                     : "; the origin was not checked (no --pubkey or --trust): the key " +
                           fingerprint + " is whoever signed it";
  if (record_only) {
    return "record checks hold (--record-only: the printed pages were not checked)" + origin;
  }
  if (!pages_verified) {
    return "PAGES NOT VERIFIED: no signature covers the printed pages (none inside the PDF, no "
           ".sig beside "
           "it); only the embedded record was checked";
  }
  if (!origin_checked) {
    return "all checks hold, but the origin was not checked: the file is intact since key " +
           fingerprint + " signed it; pass --pubkey or --trust to check that key is the station's";
  }
  return "all checks hold: the printed pages and the weigh record are as the station key signed "
         "them";
}

std::vector<std::string> VerifyResult::coverage() const {
  std::vector<std::string> out;
  if (!is_report) return out;
  auto status = [&](const char* name) {
    for (const auto& c : checks) {
      if (c.name == name) return c.status;
    }
    return CheckStatus::skipped;
  };
  std::vector<std::string> pages, record;
  if (status("in-file signature") == CheckStatus::passed) {
    pages.push_back("the in-file signature");
    record.push_back("the in-file signature");
  }
  if (status("detached signature") == CheckStatus::passed) {
    pages.push_back("the detached signature");
    record.push_back("the detached signature");
  }
  if (status("record signature") == CheckStatus::passed)
    record.insert(record.begin(), "the record signature");
  auto join = [](const std::vector<std::string>& v) {
    std::string s;
    for (std::size_t i = 0; i < v.size(); ++i)
      s += (i == 0 ? "" : i + 1 == v.size() ? " and " : ", ") + v[i];
    return s;
  };
  out.push_back("printed pages: " + (pages.empty()
                                         ? std::string("covered by no signature that holds")
                                         : "covered by " + join(pages)));
  out.push_back("weigh record:  " + (record.empty()
                                         ? std::string("covered by no signature that holds")
                                         : "covered by " + join(record)));
  return out;
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
  out.record_only = options.record_only;
  if (!looks_like_pdf(pdf)) {
    out.not_report_reason = "not a PDF file (no %PDF- header)";
    return out;
  }
  const PdfContents contents = read_pdf(pdf);
  if (!contents.parsed) {
    out.not_report_reason = "not a readable PDF (" + contents.problem + ")";
    return out;
  }
  std::optional<std::string> text = find_attachment(contents, kRecordAttachment);
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
  if (record.contains("report") && record["report"].is_object() &&
      record["report"].contains("issued_at") && record["report"]["issued_at"].is_string()) {
    out.issued_at = record["report"]["issued_at"].get<std::string>();
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
  std::string whose =
      options.station_key ? "the station key " + fingerprint(options.station_key->public_key())
      : options.trust     ? "the record's key " + out.fingerprint
                          : "the key named in the record " + out.fingerprint +
                            " (pass --pubkey or --trust to check it is the station's)";
  out.origin_checked = options.station_key != nullptr || options.trust != nullptr;

  // The in-file signature first: it covers the pages and the record together.
  if (contents.signatures.empty()) {
    out.checks.push_back(
        {"in-file signature", CheckStatus::skipped,
         "none inside the PDF (reports issued before in-file signatures carry only the .sig)"});
  } else {
    std::optional<VerifyCheck> chosen;
    for (const PdfSignatureDict& d : contents.signatures) {
      PdfSignatureCheck c = check_pdf_signature(pdf, d);
      bool by_key = key != nullptr && c.signer_key == key->public_key();
      VerifyCheck vc;
      vc.name = "in-file signature";
      if (c.valid && by_key) {
        vc.status = CheckStatus::passed;
        vc.detail = "CMS (RFC 8419) over the whole file but its own value (bytes 0-" +
                    std::to_string(c.gap_start) + " and " + std::to_string(c.gap_end) + "-" +
                    std::to_string(c.covered_end) + "), by " + whose;
      } else {
        vc.status = CheckStatus::failed;
        vc.detail = !c.problem.empty() ? c.problem
                    : !key             ? "no key to check it with"
                                       : "signed by key " +
                                 (c.signer_key.size() == kPublicKeySize ? fingerprint(c.signer_key)
                                                                        : std::string("(none)")) +
                                 ", not " + whose;
      }
      if (!chosen || (chosen->status == CheckStatus::failed && vc.status == CheckStatus::passed)) {
        chosen = vc;
        out.in_file = c;
      }
    }
    out.checks.push_back(*chosen);
  }

  std::optional<std::string> sig = find_attachment(contents, kRecordSigAttachment);
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
  } else if (options.trust) {
    std::optional<std::string> issued, latest;
    const auto& rep = record.find("report");
    if (rep != record.end() && rep->is_object() && rep->contains("issued_at") &&
        (*rep)["issued_at"].is_string()) {
      issued = (*rep)["issued_at"].get<std::string>();
    }
    const auto& ses = record.find("session");
    if (ses != record.end() && ses->is_object() && ses->contains("passes") &&
        (*ses)["passes"].is_array()) {
      std::optional<std::int64_t> best;
      for (const auto& p : (*ses)["passes"]) {
        if (!p.is_object() || !p.contains("weighed_at") || !p["weighed_at"].is_string()) continue;
        const std::string w = p["weighed_at"].get<std::string>();
        auto t = iso_utc_seconds(w);
        if (t && (!best || *t > *best)) {
          best = t;
          latest = w;
        }
      }
    }
    TrustVerdict tv = out.fingerprint.empty()
                          ? TrustVerdict{false, nullptr, "the record names no valid key"}
                          : check_trust(*options.trust, out.fingerprint, issued, latest);
    out.checks.push_back(check("station key", tv.ok, tv.detail));
  } else {
    out.checks.push_back({"station key", CheckStatus::skipped,
                          "no --pubkey or --trust given: the origin was not checked"});
  }

  if (!options.recompute) {
    out.checks.push_back({"results", CheckStatus::skipped, "no recomputation available"});
  } else if (!record.contains("session") || !record.contains("results")) {
    out.checks.push_back(check("results", false, "the record lacks its session or its results"));
  } else {
    // A hostile record must not abort verification: its failure becomes a failed check.
    try {
      nlohmann::json again = options.recompute(record["session"]);
      const bool format1 = record["format"] == kRecordFormatV1;
      if (format1) again = results_as_format1(again, record["results"]);
      std::vector<std::string> diffs = compare_results(record["results"], again);
      std::string detail = format1 ? "recomputed from the record's inputs (a format 1 record: "
                                     "its numbers, codes and statuses): "
                                   : "recomputed from the record's inputs: ";
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
  for (const auto& c : out.checks) {
    if ((c.name == "in-file signature" || c.name == "detached signature") &&
        c.status == CheckStatus::passed) {
      out.pages_verified = true;
    }
  }
  return out;
}

}  // namespace sp::report
