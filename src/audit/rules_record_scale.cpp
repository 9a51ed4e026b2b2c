// Audit rules on a report's signatures and record, and on the scale that weighed.
//
// Codes and severities:
//   signature-invalid     error    the embedded weigh record's signature does not hold
//   key-untrusted         error    signed by a key that is not among the --trust keys
//                                  (warning when no trusted key was given at all)
//   record-mismatch       error    results stated in the record differ from recomputation
//   key-outside-validity  error    the trusted key was not valid when the report was issued
//                                  (before valid_from, after valid_to or revocation;
//                                  report/trust.h)
//   signature-incomplete  error    the in-file signature holds only up to an offset: bytes were
//                                  added after it (an incremental update); the offset is named
//   file-altered          error    the in-file signature or the detached .sig does not verify
//                                  the PDF's bytes
//   pages-unsigned        warning  neither an in-file signature nor a .sig covers the printed
//                                  pages: only the embedded record is checked
//   inspection-lapsed     warning  no inspection recorded within N months before the weighing
//   division-implausible  warning  division outside NIST HB 44 Table 3 limits (Class III L)
//   class-unknown         note     accuracy class not recognised; Class III L assumed
#include <fmt/format.h>

#include <algorithm>

#include "audit/rules_internal.h"
#include "engine/scale_tolerance.h"

namespace sp::audit::detail {

void record_rules(const AuditItem& item, const AuditOptions& o, std::vector<Finding>& out) {
  if (!item.verification) return;
  const VerificationFacts& v = *item.verification;
  if (!v.record_signature_ok) {
    out.push_back(make_finding(
        "signature-invalid", Severity::error,
        "The weigh record embedded in the report does not match its signature: the record was "
        "changed after signing, or was never signed by the key it names.",
        "Ed25519 signature of the embedded weigh record (RFC 8032)"));
    if (!v.key_fingerprint.empty()) {
      out.back().values.push_back(text_value("key fingerprint", v.key_fingerprint));
    }
  } else if (!v.key_trusted) {
    const bool err = o.trust_list_given;
    out.push_back(make_finding(
        "key-untrusted", err ? Severity::error : Severity::warning,
        err ? "The report is signed by a key that is not among the station keys you trust: "
              "anyone can make such a key, so the report's origin is not proven."
            : "No trusted station key was given (--trust): the signature shows the record is "
              "intact, but not which station issued it.",
        "signing key must be one of the --trust keys"));
    out.back().values.push_back(text_value("key fingerprint", v.key_fingerprint));
  }
  if (!v.record_matches) {
    Finding f = make_finding(
        "record-mismatch", Severity::error,
        "Results stated in the report differ from what its own readings give when recomputed.",
        "stated results must equal the recomputation from the record's inputs");
    for (const auto& m : v.mismatches) f.values.push_back(text_value("differs", m));
    out.push_back(std::move(f));
  }
  if (v.key_trusted && v.key_in_validity && !*v.key_in_validity) {
    out.push_back(make_finding(
        "key-outside-validity", Severity::error,
        "The report was signed by a trusted station key outside the time the trust list allows "
        "it to sign: " +
            v.key_validity_detail + ".",
        "the key's valid_from, valid_to and revoked_at in the trust file (reports/VERIFY.md)"));
    out.back().values.push_back(text_value("key fingerprint", v.key_fingerprint));
  }
  if (v.in_file_covered_end) {
    // One cause, one finding: the appended bytes also break a detached .sig, said here.
    const long long extra = v.file_size - *v.in_file_covered_end;
    Finding f = make_finding(
        "signature-incomplete", Severity::error,
        fmt::format(
            "The signature inside the PDF covers bytes 0 to {} only; the {} bytes from "
            "offset {} on were added after signing (an incremental update or appended "
            "data), so what they show is not signed{}.",
            *v.in_file_covered_end, extra, *v.in_file_covered_end,
            v.detached_present && !v.detached_ok ? "; the detached .sig fails on them too" : ""),
        "ISO 32000-1 §12.8.1: /ByteRange must cover the whole file but the signature value");
    f.values.push_back(number_value("signed up to offset",
                                    static_cast<double>(*v.in_file_covered_end), "bytes", 0));
    f.values.push_back(number_value("file size", static_cast<double>(v.file_size), "bytes", 0));
    out.push_back(std::move(f));
  } else if ((v.in_file_present && !v.in_file_ok) || (v.detached_present && !v.detached_ok)) {
    std::string which = v.in_file_present && !v.in_file_ok
                            ? "the signature inside the PDF (" + v.in_file_problem + ")"
                            : std::string();
    if (v.detached_present && !v.detached_ok) {
      which += (which.empty() ? "" : " and ") + std::string("the detached signature beside it");
    }
    out.push_back(make_finding(
        "file-altered", Severity::error,
        "The PDF's bytes do not match " + which +
            ": the file was changed after it was issued (or the .sig belongs to another report).",
        "CMS signature in the PDF (RFC 8419) and Ed25519 signature of the PDF bytes in "
        "<report>.pdf.sig"));
  } else if (!v.in_file_present && !v.detached_present) {
    out.push_back(make_finding(
        "pages-unsigned", Severity::warning,
        "No signature covers the report's printed pages: the PDF holds no signature of its own "
        "(issued before in-file signatures) and no detached signature (.pdf.sig) came with it; "
        "only the embedded weigh record's signature was checked, so the pages are not proven.",
        "ask the station for <report>.pdf.sig"));
  }
}

namespace {

void inspection_rule(const AuditItem& item, const AuditOptions& o,
                     const std::vector<TimedPass>& live, std::vector<Finding>& out) {
  std::optional<std::int64_t> weigh_day;
  for (const auto& p : live) {
    if (p.time && (!weigh_day || p.time->local_day < *weigh_day)) weigh_day = p.time->local_day;
  }
  if (!weigh_day) return;  // no readable time: reported by the ticket rules
  std::vector<Inspection> history;
  if (item.inspections) {
    history = *item.inspections;
  } else if (item.session.scale.last_inspected) {
    history.push_back(Inspection{*item.session.scale.last_inspected, std::nullopt});
  }
  // Window: from the weighing date moved back N calendar months, to the weighing date,
  // both ends included (exactly N months before still counts).
  const std::int64_t from = add_months(*weigh_day, -o.inspection_months);
  std::optional<std::int64_t> latest_before, earliest_after;
  for (const auto& i : history) {
    auto d = parse_date(i.date);
    if (!d) continue;
    if (*d <= *weigh_day) {
      if (!latest_before || *d > *latest_before) latest_before = d;
    } else if (!earliest_after || *d < *earliest_after) {
      earliest_after = d;
    }
  }
  if (latest_before && *latest_before >= from) return;
  std::string what;
  if (latest_before) {
    what = fmt::format("the last inspection recorded before the weighing was on {}", 
                       format_date(*latest_before));
  } else if (earliest_after) {
    what = fmt::format("the only inspection recorded is after the weighing ({})",
                       format_date(*earliest_after));
  } else {
    what = "no inspection of the scale is recorded at all";
  }
  Finding f = make_finding(
      "inspection-lapsed", Severity::warning,
      fmt::format("Scale {}: no inspection recorded within {} months before the weighing on {}; "
                  "{}. Inspection intervals differ between jurisdictions: check the rule "
                  "where the scale stands.",
                  item.session.scale.id, o.inspection_months, format_date(*weigh_day), what),
      fmt::format("an inspection on or after {} ({} months before the weighing; common practice, "
                  "annual certification)",
                  format_date(from), o.inspection_months));
  f.values.push_back(text_value("weighed", format_date(*weigh_day)));
  if (latest_before) f.values.push_back(text_value("last inspection", format_date(*latest_before)));
  f.values.push_back(number_value("limit", o.inspection_months, "months", 0));
  out.push_back(std::move(f));
}

}  // namespace

void scale_rules(const AuditItem& item, const AuditOptions& o, const std::vector<TimedPass>& live,
                 std::vector<Finding>& out) {
  const ScaleInfo& sc = item.session.scale;
  inspection_rule(item, o, live, out);
  auto cls = parse_scale_class(sc.accuracy_class);
  if (!cls) {
    out.push_back(make_finding(
        "class-unknown", Severity::note,
        fmt::format("Scale {}: accuracy class '{}' is not one the audit knows; tolerances of NIST "
                    "HB 44 Class III L were assumed.",
                    sc.id, sc.accuracy_class),
        "known classes: IIIL, III, OIML-III"));
  }
  if (cls.value_or(ScaleClass::hb44_iii_l) == ScaleClass::hb44_iii_l && sc.division > 0) {
    // NIST HB 44 Table 3, Class III L: d >= 5 lb and 2 000 to 10 000 divisions of capacity.
    DivisionCheck c = check_division_iii_l(sc.division, sc.capacity, item.session.units.weight);
    if (!c.ok) {
      Finding f = make_finding(
          "division-implausible", Severity::warning,
          fmt::format("Scale {}: {}. A Class III L vehicle scale built to NIST HB 44 would not "
                      "be certified like this, so the scale's stated data are doubtful.",
                      sc.id, c.reason),
          "NIST HB 44 §2.20 Table 3, Class III L: d >= 5 lb, 2 000 to 10 000 divisions");
      f.values.push_back(weight_value("division", sc.division, item.session.units.weight));
      if (sc.capacity) {
        f.values.push_back(weight_value("capacity", *sc.capacity, item.session.units.weight));
      }
      if (c.count) f.values.push_back(number_value("divisions", *c.count, "d", 0));
      out.push_back(std::move(f));
    }
  }
}

}  // namespace sp::audit::detail
