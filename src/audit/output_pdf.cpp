// The audit summary PDF (output.h), drawn through the weigh-report's PDF writer
// (report/pdf_doc.h: libharu, DejaVu fonts embedded, deterministic bytes). Own layout: A4,
// plain black-and-white text, findings grouped by item, worst first, then the cautions.
#include <fmt/format.h>

#include <memory>
#include <optional>
#include <sstream>

#include "audit/calendar.h"
#include "audit/output.h"
#include "report/pdf_doc.h"

namespace sp::audit {
namespace {

constexpr float kPageW = 595.276f;  // A4 in points (ISO 216: 210 mm x 297 mm)
constexpr float kPageH = 841.89f;
constexpr float kMargin = 46;
constexpr float kBody = 8.5f;
constexpr float kLead = kBody * 1.35f;

class Writer {
 public:
  explicit Writer(report::PdfDocument& doc) : doc_(doc) { page(); }

  void page() {
    doc_.new_page(kPageW, kPageH);
    y_ = kPageH - kMargin;
    ++pages_;
    doc_.text(kMargin, kMargin / 2, fmt::format("scaleproof claim-file audit, page {}", pages_), 7,
              report::Font::regular, 0.35f);
  }
  void need(float h) {
    if (y_ - h < kMargin) page();
  }
  void gap(float h) { y_ -= h; }
  // Wrapped paragraph at indent x; returns nothing, advances y.
  void para(const std::string& text, float x, float size = kBody,
            report::Font font = report::Font::regular, float grey = 0) {
    const float width = kPageW - kMargin - x;
    std::istringstream in(text);
    std::string word, line;
    auto flush = [&] {
      need(size * 1.35f);
      doc_.text(x, y_ - size, line, size, font, grey);
      y_ -= size * 1.35f;
      line.clear();
    };
    while (in >> word) {
      std::string trial = line.empty() ? word : line + " " + word;
      if (!line.empty() && doc_.text_width(trial, size, font) > width) {
        flush();
        line = word;
      } else {
        line = trial;
      }
    }
    if (!line.empty()) flush();
  }
  void text_at(float x, const std::string& s, float size = kBody,
               report::Font font = report::Font::regular) {
    doc_.text(x, y_ - size, s, size, font);
  }
  void rule() {
    need(6);
    doc_.line(kMargin, y_ - 2, kPageW - kMargin, y_ - 2, 0.5f, 0.55f);
    y_ -= 6;
  }
  float y() const { return y_; }

 private:
  report::PdfDocument& doc_;
  float y_ = 0;
  int pages_ = 0;
};

std::string sev(Severity s) {
  return s == Severity::error ? "ERROR" : s == Severity::warning ? "WARNING" : "note";
}

}  // namespace

struct AuditPdfWriter::State {
  std::unique_ptr<report::PdfDocument> doc = report::make_pdf_document();
  std::optional<Writer> w;
};

AuditPdfWriter::AuditPdfWriter(const AuditReport& rep, std::size_t items)
    : s_(std::make_unique<State>()) {
  const AuditResult& r = rep.result;
  const AuditOptions& o = rep.options;
  report::DocInfo info;
  info.title = "Claim-file audit";
  info.subject = "Audit of weigh-reports and session files";
  info.creator = "scaleproof";
  s_->doc->set_info(info);
  Writer& w = s_->w.emplace(*s_->doc);
  w.para("Claim-file audit", kMargin, 18, report::Font::bold);
  w.gap(4);
  w.para(fmt::format("{} items audited: {} errors, {} warnings, {} notes; {} without findings; "
                     "{} inputs could not be read.",
                     items, r.errors, r.warnings, r.notes, r.clean_items, rep.unreadable.size()),
         kMargin, 10, report::Font::bold);
  w.para(fmt::format("Audited at {}. Claim date: {}.", format_utc(o.now),
                     o.claim_date.value_or("not given")),
         kMargin);
  w.para(fmt::format("Limits: first to last pass within {} min; a scale inspection within {} "
                     "months before the weighing; weighing at most {} days before the claim "
                     "date; ticket times up to {} min ahead of the audit clock.",
                     o.max_span_minutes, o.inspection_months, o.stale_days, o.future_slack_minutes),
         kMargin);
  if (rep.trusted_keys.empty()) {
    w.para("Trusted station keys: none given; report origins were not checked.", kMargin);
  } else {
    w.para("Trusted station keys (SHA-256 fingerprints):", kMargin);
    for (const auto& k : rep.trusted_keys) w.para(k, kMargin + 12, kBody, report::Font::mono);
  }
  if (!rep.unreadable.empty()) {
    w.gap(4);
    w.para("Inputs that could not be read", kMargin, 11, report::Font::bold);
    for (const auto& u : rep.unreadable) w.para(u.message, kMargin + 12);
  }
}

AuditPdfWriter::~AuditPdfWriter() = default;

void AuditPdfWriter::item(const ItemAudit& ia) {
  Writer& w = *s_->w;
  w.gap(6);
  w.need(4 * kLead);
  w.rule();
  w.para(ia.source + " (" + std::string(to_string(ia.kind)) + ")", kMargin, 11,
         report::Font::bold);
  w.para(ia.label, kMargin, kBody, report::Font::regular, 0.35f);
  w.para("Verdict: " + std::string(to_string(ia.verdict)) + ". " + ia.verdict_reason, kMargin,
         kBody, report::Font::bold, 0.35f);
  for (const auto& f : ia.findings) {
    w.gap(2);
    w.need(3 * kLead);
    w.text_at(kMargin, sev(f.severity), kBody, report::Font::bold);
    w.text_at(kMargin + 48, f.code, kBody, report::Font::bold);
    w.text_at(kMargin + 160, f.ticket ? "ticket " + *f.ticket : "", kBody);
    w.gap(kLead);
    w.para(f.message, kMargin + 48);
    if (!f.values.empty()) {
      std::string ev;
      for (const auto& v : f.values) ev += (ev.empty() ? "" : "; ") + v.name + " " + v.text;
      w.para("Evidence: " + ev, kMargin + 48, 7.5f, report::Font::regular, 0.2f);
    }
    w.para("Rule: " + f.rule, kMargin + 48, 7.5f, report::Font::regular, 0.35f);
  }
}

std::string AuditPdfWriter::clean_line(const ItemAudit& ia) {
  return ia.source + ": " + ia.label + "; verdict " + std::string(to_string(ia.verdict));
}

std::string AuditPdfWriter::finish(std::size_t clean, const std::vector<std::string>& lines) {
  Writer& w = *s_->w;
  if (clean > 0) {
    w.gap(6);
    w.rule();
    w.para(fmt::format("Without findings ({})", clean), kMargin, 11, report::Font::bold);
    std::size_t listed = 0;
    for (const auto& l : lines) {
      if (listed == kCleanListed) break;
      ++listed;
      w.para(l, kMargin + 12);
    }
    if (clean > kCleanListed) {
      w.para(fmt::format("... and {} more (see the --json output)", clean - kCleanListed),
             kMargin + 12);
    }
  }
  w.gap(8);
  w.rule();
  w.para("Cautions", kMargin, 11, report::Font::bold);
  for (const auto& c : audit_cautions()) w.para("- " + c, kMargin + 6);
  return s_->doc->finish();
}

std::string audit_pdf(const AuditReport& rep) {
  const AuditResult& r = rep.result;
  AuditPdfWriter pdf(rep, r.items.size());
  std::vector<std::string> lines;
  std::size_t clean = 0;
  for (const auto& ia : r.items) {
    if (!ia.findings.empty()) {
      pdf.item(ia);
    } else if (++clean <= AuditPdfWriter::kCleanListed) {
      lines.push_back(AuditPdfWriter::clean_line(ia));
    }
  }
  return pdf.finish(clean, lines);
}

}  // namespace sp::audit
