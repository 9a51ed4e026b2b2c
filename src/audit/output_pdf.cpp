// The audit summary PDF (output.h), drawn through the weigh-report's PDF writer
// (report/pdf_doc.h: libharu, DejaVu fonts embedded, deterministic bytes). Own layout: A4,
// plain black-and-white text, findings grouped by item, worst first, then the cautions.
#include <fmt/format.h>

#include <functional>
#include <memory>
#include <optional>
#include <sstream>

#include "audit/calendar.h"
#include "audit/output.h"
#include "core/error.h"
#include "report/pdf_doc.h"

namespace sp::audit {
namespace {

constexpr float kPageW = 595.276f;  // A4 in points (ISO 216: 210 mm x 297 mm)
constexpr float kPageH = 841.89f;
constexpr float kMargin = 46;
constexpr float kBody = 8.5f;
constexpr float kLead = kBody * 1.35f;

// Lays out and draws the pages. A Writer made with `dry` draws nothing and only counts pages
// (the first pass of AuditPdfWriter, which finds the number of volumes); `on_full` is called
// when a volume holds max_pages pages and another page is needed: it starts the next volume
// (a new document, the summary head drawn again) and the page is then begun in it.
class Writer {
 public:
  Writer(report::PdfDocument* doc, bool dry, std::size_t max_pages, std::function<void()> on_full)
      : doc_(doc), dry_(dry), max_pages_(max_pages), on_full_(std::move(on_full)) {}

  // A new volume in `doc` (nullptr when dry): page numbers start again at 1.
  void start_volume(report::PdfDocument* doc, std::size_t volume, std::size_t volumes) {
    doc_ = doc;
    volume_ = volume;
    volumes_ = volumes;
    pages_ = 0;
    page();
  }
  std::size_t pages() const { return pages_; }

  void page() {
    if (pages_ == max_pages_) {
      on_full_();  // calls start_volume, which begins the next volume's first page
      return;
    }
    ++pages_;
    y_ = kPageH - kMargin;
    if (dry_) return;
    doc_->new_page(kPageW, kPageH);
    const std::string where =
        volumes_ > 1 ? fmt::format("volume {} of {}, page {}", volume_, volumes_, pages_)
                     : fmt::format("page {}", pages_);
    doc_->text(kMargin, kMargin / 2, "scaleproof claim-file audit, " + where, 7,
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
      if (!dry_) doc_->text(x, y_ - size, line, size, font, grey);
      y_ -= size * 1.35f;
      line.clear();
    };
    while (in >> word) {
      std::string trial = line.empty() ? word : line + " " + word;
      if (!line.empty() && measure_->text_width(trial, size, font) > width) {
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
    if (!dry_) doc_->text(x, y_ - size, s, size, font);
  }
  void rule() {
    need(6);
    if (!dry_) doc_->line(kMargin, y_ - 2, kPageW - kMargin, y_ - 2, 0.5f, 0.55f);
    y_ -= 6;
  }
  // The document whose fonts measure text (the dry pass has one with no pages).
  void measure_with(report::PdfDocument* doc) { measure_ = doc; }

 private:
  report::PdfDocument* doc_;
  report::PdfDocument* measure_ = nullptr;
  bool dry_;
  std::size_t max_pages_;
  std::function<void()> on_full_;
  float y_ = 0;
  std::size_t pages_ = 0, volume_ = 1, volumes_ = 1;
};

void set_doc_info(report::PdfDocument& doc) {
  report::DocInfo info;
  info.title = "Claim-file audit";
  info.subject = "Audit of weigh-reports and session files";
  info.creator = "scaleproof";
  doc.set_info(info);
}

std::string sev(Severity s) {
  return s == Severity::error ? "ERROR" : s == Severity::warning ? "WARNING" : "note";
}

}  // namespace

struct AuditPdfWriter::State {
  const AuditReport* head = nullptr;  // the caller's, alive until finish()
  std::size_t items = 0;
  std::size_t max_pages = 0;
  std::size_t volumes = 0;  // 0: the dry pass, which counts them
  std::size_t volume = 0;   // the volume being drawn (1-based)
  std::unique_ptr<report::PdfDocument> doc = report::make_pdf_document();
  std::vector<std::string> done;  // finished volumes' bytes, when there is no sink
  AuditPdfWriter::VolumeSink sink;
  std::optional<Writer> w;
  bool in_head = false;

  void draw_head();
  void next_volume();
  void emit(std::string bytes) {
    if (sink) {
      sink(volume, volumes, std::move(bytes));
    } else {
      done.push_back(std::move(bytes));
    }
  }
};

// The summary that opens every volume: counts over the whole audit, limits, keys, unreadable
// inputs, and (in a set of volumes) which volume this is.
void AuditPdfWriter::State::draw_head() {
  const AuditResult& r = head->result;
  const AuditOptions& o = head->options;
  Writer& wr = *w;
  wr.para("Claim-file audit", kMargin, 18, report::Font::bold);
  wr.gap(4);
  // The dry pass lays the volume line out as if there were several volumes (its height is the
  // same whatever the numbers); a single volume omits it and so needs no more pages.
  if (volumes != 1) {
    wr.para(fmt::format("Volume {} of {}", volume, volumes == 0 ? 9 : volumes), kMargin, 10,
            report::Font::bold);
    wr.para(
        "Every volume opens with this summary of the whole audit; the findings run on from "
        "one volume to the next, in the order of the audit.",
        kMargin);
  }
  wr.para(fmt::format("{} items audited: {} errors, {} warnings, {} notes; {} without findings; "
                      "{} inputs could not be read.",
                      items, r.errors, r.warnings, r.notes, r.clean_items, head->unreadable.size()),
          kMargin, 10, report::Font::bold);
  wr.para(fmt::format("Audited at {}. Claim date: {}.", format_utc(o.now),
                      o.claim_date.value_or("not given")),
          kMargin);
  wr.para(
      fmt::format("Limits: first to last pass within {} min; a scale inspection within {} "
                  "months before the weighing; weighing at most {} days before the claim "
                  "date; ticket times up to {} min ahead of the audit clock.",
                  o.max_span_minutes, o.inspection_months, o.stale_days, o.future_slack_minutes),
      kMargin);
  if (head->trusted_keys.empty()) {
    wr.para("Trusted station keys: none given; report origins were not checked.", kMargin);
  } else {
    wr.para("Trusted station keys (SHA-256 fingerprints):", kMargin);
    for (const auto& k : head->trusted_keys) wr.para(k, kMargin + 12, kBody, report::Font::mono);
  }
  if (!head->unreadable.empty()) {
    wr.gap(4);
    wr.para("Inputs that could not be read", kMargin, 11, report::Font::bold);
    for (const auto& u : head->unreadable) wr.para(u.message, kMargin + 12);
  }
}

void AuditPdfWriter::State::next_volume() {
  if (in_head) {
    throw Error(ExitCode::internal,
                fmt::format("audit PDF: {} pages a volume cannot hold the summary", max_pages));
  }
  if (volumes != 0 && volume > 0) {  // the volume drawn so far is full
    if (volume == volumes) {
      throw Error(ExitCode::internal, "audit PDF: more volumes than the first pass counted");
    }
    emit(doc->finish());
    doc = report::make_pdf_document();
    set_doc_info(*doc);
  }
  if (volumes == 0) {
    // Measuring text sets its font on the measuring document's page, which libharu records
    // in that page's content stream: the dry pass measures with a fresh document per volume,
    // so its memory stays that of one volume, as the drawing pass's does.
    doc = report::make_pdf_document();
    doc->new_page(kPageW, kPageH);
  }
  ++volume;
  w->start_volume(volumes == 0 ? nullptr : doc.get(), volume, volumes);
  w->measure_with(doc.get());
  in_head = true;
  draw_head();
  in_head = false;
  // The head alone must leave room on its volume's pages for findings, or no volume would end.
  if (w->pages() >= max_pages) {
    throw Error(ExitCode::internal,
                fmt::format("audit PDF: {} pages a volume cannot hold the summary and findings",
                            max_pages));
  }
}

AuditPdfWriter::AuditPdfWriter(const AuditReport& rep, std::size_t items, std::size_t max_pages,
                               std::size_t volumes, VolumeSink sink)
    : s_(std::make_unique<State>()) {
  if (max_pages < 2 || max_pages > kMaxPagesPerVolume) {
    throw Error(ExitCode::internal,
                fmt::format("audit PDF: pages per volume must be 2 to {}, not {}",
                            kMaxPagesPerVolume, max_pages));
  }
  State& st = *s_;
  st.head = &rep;
  st.items = items;
  st.max_pages = max_pages;
  st.volumes = volumes;
  st.sink = std::move(sink);
  set_doc_info(*st.doc);
  st.w.emplace(nullptr, volumes == 0, max_pages, [&st] { st.next_volume(); });
  st.next_volume();
}

AuditPdfWriter::~AuditPdfWriter() = default;

void AuditPdfWriter::item(const ItemAudit& ia) {
  Writer& w = *s_->w;
  w.gap(6);
  w.need(4 * kLead);
  w.rule();
  w.para(ia.source + " (" + std::string(to_string(ia.kind)) + ")", kMargin, 11, report::Font::bold);
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

std::vector<std::string> AuditPdfWriter::finish(std::size_t clean,
                                                const std::vector<std::string>& lines) {
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
  if (s_->volumes == 0) {
    s_->volumes = s_->volume;
    return {};
  }
  if (s_->volume != s_->volumes) {
    throw Error(ExitCode::internal, "audit PDF: fewer volumes than the first pass counted");
  }
  s_->emit(s_->doc->finish());
  return std::move(s_->done);
}

std::size_t AuditPdfWriter::volumes() const {
  return s_->volumes;
}

std::vector<std::string> audit_pdf(const AuditReport& rep, std::size_t max_pages) {
  const AuditResult& r = rep.result;
  std::vector<std::string> lines;
  std::size_t clean = 0;
  for (const auto& ia : r.items) {
    if (ia.findings.empty() && ++clean <= AuditPdfWriter::kCleanListed) {
      lines.push_back(AuditPdfWriter::clean_line(ia));
    }
  }
  std::size_t volumes = 0;  // 0: the first pass counts them
  for (int pass = 0; pass < 2; ++pass) {
    AuditPdfWriter pdf(rep, r.items.size(), max_pages, volumes);
    for (const auto& ia : r.items) {
      if (!ia.findings.empty()) pdf.item(ia);
    }
    std::vector<std::string> out = pdf.finish(clean, lines);
    if (pass == 1) return out;
    volumes = pdf.volumes();
  }
  return {};
}

}  // namespace sp::audit
