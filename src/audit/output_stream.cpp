// The streaming writer of an audit (output_stream.h).
#include "audit/output_stream.h"

#include <algorithm>
#include <optional>

#include "audit/item_codec.h"
#include "audit/spill.h"
#include "core/error.h"

namespace sp::audit {
namespace {

int rank(const ItemAudit& ia) {
  auto w = ia.worst();
  return w ? static_cast<int>(*w) : 3;
}

// One element of "items" as audit_json(...).dump(2) prints it at depth 2: nlohmann indents an
// element's inner lines by the array's depth, and strings never hold a raw newline (escaped).
std::string json_element(const ItemAudit& ia) {
  const std::string flat = audit_json_item(ia).dump(2);
  std::string out;
  out.reserve(flat.size() + flat.size() / 8);
  for (char c : flat) {
    out += c;
    if (c == '\n') out += "    ";
  }
  return out;
}

// The first `limit` of `spilled` (index, line) and the kept items' lines, in index order.
std::vector<std::string> first_lines(
    const std::vector<std::pair<std::uint32_t, std::string>>& spilled,
    const std::vector<const ItemAudit*>& kept, std::size_t limit,
    std::string (*line)(const ItemAudit&)) {
  std::vector<std::string> lines;
  std::size_t c = 0, k = 0;
  while (lines.size() < limit && (c < spilled.size() || k < kept.size())) {
    if (k < kept.size() && (c == spilled.size() || kept[k]->index < spilled[c].first)) {
      lines.push_back(line(*kept[k++]));
    } else {
      lines.push_back(spilled[c++].second);
    }
  }
  return lines;
}

}  // namespace

AuditStreamWriter::AuditStreamWriter(Format format, bool colour, std::size_t max_clean_lines,
                                     bool pdf, std::size_t pdf_max_pages)
    : format_(format),
      colour_(colour),
      max_clean_lines_(max_clean_lines),
      with_pdf_(pdf),
      pdf_max_pages_(pdf_max_pages) {
  for (int i = 0; i < 4; ++i) buckets_.push_back(std::make_unique<Spill>());
}

AuditStreamWriter::~AuditStreamWriter() = default;

std::uint64_t AuditStreamWriter::temp_bytes() const {
  std::uint64_t n = 0;
  for (const auto& b : buckets_) n += b->file_bytes();
  return n;
}

std::uint64_t AuditStreamWriter::temp_raw_bytes() const {
  std::uint64_t n = 0;
  for (const auto& b : buckets_) n += b->raw_bytes();
  return n;
}

void AuditStreamWriter::add(ItemAudit&& item) {
  const int r = rank(item);
  if (r == 3) {
    // Listed only when there are few; one more than the limit is enough to know.
    if (with_pdf_ && pdf_clean_.size() < AuditPdfWriter::kCleanListed) {
      pdf_clean_.emplace_back(item.index, AuditPdfWriter::clean_line(item));
    }
    if (format_ == Format::text) {
      if (clean_lines_.size() <= max_clean_lines_) {
        clean_lines_.emplace_back(item.index, audit_text_clean_line(item));
      }
      return;
    }
  }
  std::string rec;
  encode_item(item, rec);
  buckets_[static_cast<std::size_t>(r)]->put(rec);
  ++spilled_;
}

void AuditStreamWriter::finish(const AuditReport& report, std::ostream& out) {
  const AuditResult& r = report.result;
  // The kept items by rank, in index order (Auditor::finish sorts stably by rank only).
  std::vector<std::vector<const ItemAudit*>> kept(4);
  for (const auto& ia : r.items) kept[static_cast<std::size_t>(rank(ia))].push_back(&ia);
  for (auto& k : kept) {
    std::stable_sort(k.begin(), k.end(),
                     [](const ItemAudit* a, const ItemAudit* b) { return a->index < b->index; });
  }
  std::optional<AuditPdfWriter> pdf;
  // Calls emit(item) for each item of rank `b` in index order.
  std::string rec;
  auto merge = [&](std::size_t b, const auto& emit) {
    Spill& sp = *buckets_[b];
    std::optional<ItemAudit> next;
    auto load = [&] {
      if (sp.read(rec)) {
        next = decode_item(rec);
      } else {
        next.reset();
      }
    };
    load();
    std::size_t k = 0;
    const auto& ks = kept[b];
    while (next || k < ks.size()) {
      if (k < ks.size() && (!next || ks[k]->index < next->index)) {
        emit(*ks[k++]);
      } else {
        emit(*next);
        load();
      }
    }
  };

  const std::vector<std::string> pdf_clean =
      with_pdf_ ? first_lines(pdf_clean_, kept[3], AuditPdfWriter::kCleanListed,
                              AuditPdfWriter::clean_line)
                : std::vector<std::string>();
  if (with_pdf_) {
    // First pass: lay the PDF out without drawing to count its volumes (each names "k of n"),
    // then read the temporary files again for the pass that writes everything.
    AuditPdfWriter dry(report, r.total_items, pdf_max_pages_, 0);
    for (std::size_t b = 0; b < 3; ++b) merge(b, [&](const ItemAudit& ia) { dry.item(ia); });
    dry.finish(static_cast<std::size_t>(r.clean_items), pdf_clean);
    for (auto& sp : buckets_) sp->rewind();
    pdf.emplace(report, r.total_items, pdf_max_pages_, dry.volumes(), pdf_sink_);
  }

  if (format_ == Format::text) {
    out << audit_text_head(report, r.total_items, r.claims);
    auto emit = [&](const ItemAudit& ia) {
      out << audit_text_item(ia, colour_);
      if (pdf) pdf->item(ia);
    };
    for (std::size_t b = 0; b < 3; ++b) merge(b, emit);
    out << audit_text_tail(
        static_cast<std::size_t>(r.clean_items),
        first_lines(clean_lines_, kept[3], max_clean_lines_ + 1, audit_text_clean_line),
        max_clean_lines_);
  } else {
    // JSON: the document without its items, with the items streamed in where "items" stands.
    AuditReport shell;
    shell.options = report.options;
    shell.trusted_keys = report.trusted_keys;
    shell.unreadable = report.unreadable;
    shell.result.errors = r.errors;
    shell.result.warnings = r.warnings;
    shell.result.notes = r.notes;
    shell.result.clean_items = r.clean_items;
    nlohmann::ordered_json doc = audit_json(shell);
    doc["summary"]["items"] = r.total_items;
    const std::string text = doc.dump(2);
    const std::string marker = "\n  \"items\": []";
    const std::size_t at = text.find(marker);
    if (at == std::string::npos) {
      throw Error(ExitCode::internal, "audit: no items in the JSON shell");
    }
    out.write(text.data(), static_cast<std::streamsize>(at));
    out << "\n  \"items\": [";
    bool first = true;
    auto emit = [&](const ItemAudit& ia) {
      out << (first ? "\n    " : ",\n    ") << json_element(ia);
      first = false;
      if (pdf && rank(ia) < 3) pdf->item(ia);
    };
    for (std::size_t b = 0; b < 4; ++b) merge(b, emit);
    out << (first ? "]" : "\n  ]");
    const std::size_t rest = at + marker.size();
    out.write(text.data() + rest, static_cast<std::streamsize>(text.size() - rest));
  }
  if (pdf) {
    pdf_ = pdf->finish(static_cast<std::size_t>(r.clean_items), pdf_clean);
  }
}

}  // namespace sp::audit
