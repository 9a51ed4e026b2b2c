// Writing an audit whose items are not all in memory: the store audit hands each final item
// (Auditor::on_final) to an AuditStreamWriter, which renders it at once (a text block or a JSON
// element) and spills it to one of four temporary files by its worst severity (error, warning,
// note, none). finish() writes the head, then each severity's items in input order (the spilled
// ones merged with those the Auditor kept until its finish), then the tail.
// The output equals audit_text(report) / audit_json(report).dump(2) of the whole result byte
// for byte (tested); memory holds one rendered item plus, for text, the first lines of the
// "No findings" list.
// Throws sp::Error: cant_create when no temporary file can be made, io_error when one cannot be
// written or read back.
#pragma once
#include <cstdio>
#include <memory>
#include <ostream>
#include <string>
#include <vector>

#include "audit/output.h"

namespace sp::audit {

class AuditStreamWriter {
 public:
  enum class Format { text, json };
  explicit AuditStreamWriter(Format format, bool colour = false,
                             std::size_t max_clean_lines = 50);
  ~AuditStreamWriter();
  AuditStreamWriter(const AuditStreamWriter&) = delete;
  AuditStreamWriter& operator=(const AuditStreamWriter&) = delete;

  // A final item, findings sorted (Auditor::on_final). Items come in index order.
  void add(ItemAudit&& item);
  // Items spilled so far.
  std::size_t spilled() const { return spilled_; }
  // `report.result` as Auditor::finish() returned it: the kept items, counts over all items.
  void finish(const AuditReport& report, std::ostream& out);

 private:
  struct Spill;
  Format format_;
  bool colour_;
  std::size_t max_clean_lines_;
  std::vector<std::unique_ptr<Spill>> buckets_;  // by rank: error, warning, note, none
  std::vector<std::pair<std::uint32_t, std::string>> clean_lines_;  // text: first clean items
  std::size_t spilled_ = 0;
};

}  // namespace sp::audit
