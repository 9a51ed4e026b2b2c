// Writing an audit whose items are not all in memory: the store audit hands each final item
// (Auditor::on_final) to an AuditStreamWriter, which spills it in a compact binary form
// (audit/item_codec.h), deflated (audit/spill.h), to one of four temporary files by its worst
// severity (error, warning, note, none). finish() writes the head, then each severity's items
// in input order (the spilled ones merged with those the Auditor kept until its finish),
// rendered as they are read back, then the tail; with `pdf` it draws the summary PDF from the
// same pass (AuditPdfWriter), returned by pdf().
// The output equals audit_text(report) / audit_json(report).dump(2) of the whole result, and
// pdf() equals audit_pdf(report), byte for byte (tested); memory holds one item plus, for text,
// the first lines of the "No findings" list (and for the PDF its first 200), plus the PDF
// document itself while it is drawn (libharu keeps a document in memory until it is saved).
// Clean items are not spilled for text (they are only counted past the first lines).
// Throws sp::Error: cant_create when no temporary file can be made, io_error when one cannot be
// written or read back.
#pragma once
#include <cstdint>
#include <memory>
#include <ostream>
#include <string>
#include <vector>

#include "audit/output.h"

namespace sp::audit {

class Spill;

class AuditStreamWriter {
 public:
  enum class Format { text, json };
  explicit AuditStreamWriter(Format format, bool colour = false, std::size_t max_clean_lines = 50,
                             bool pdf = false, std::size_t pdf_max_pages = kAuditPdfPagesPerVolume);
  ~AuditStreamWriter();
  AuditStreamWriter(const AuditStreamWriter&) = delete;
  AuditStreamWriter& operator=(const AuditStreamWriter&) = delete;

  // A final item, findings sorted (Auditor::on_final). Items come in index order.
  void add(ItemAudit&& item);
  // Items spilled so far.
  std::size_t spilled() const { return spilled_; }
  // Bytes in the temporary files so far (compressed), and the same records uncompressed.
  std::uint64_t temp_bytes() const;
  std::uint64_t temp_raw_bytes() const;
  // `report.result` as Auditor::finish() returned it: the kept items, counts over all items.
  void finish(const AuditReport& report, std::ostream& out);
  // The summary PDF's volumes (audit_pdf), after finish() of a writer made with `pdf`. The
  // PDF is laid out twice (the first pass counts the volumes), the temporary files read twice.
  // With a sink (before finish()) each volume goes to it as soon as it is drawn instead, so
  // memory holds one volume.
  std::vector<std::string> take_pdf() { return std::move(pdf_); }
  void set_pdf_sink(AuditPdfWriter::VolumeSink sink) { pdf_sink_ = std::move(sink); }

 private:
  Format format_;
  bool colour_;
  std::size_t max_clean_lines_;
  bool with_pdf_;
  std::size_t pdf_max_pages_;
  std::vector<std::unique_ptr<Spill>> buckets_;  // by rank: error, warning, note, none
  std::vector<std::pair<std::uint32_t, std::string>> clean_lines_;  // text: first clean items
  std::vector<std::pair<std::uint32_t, std::string>> pdf_clean_;    // PDF: first clean items
  std::size_t spilled_ = 0;
  std::vector<std::string> pdf_;
  AuditPdfWriter::VolumeSink pdf_sink_;
};

}  // namespace sp::audit
