// The streaming writer of an audit (output_stream.h).
#include "audit/output_stream.h"

#include <algorithm>
#include <cerrno>
#include <cstring>

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

std::string io_message(const char* what) {
  return std::string("audit: ") + what + " a temporary file: " + std::strerror(errno);
}

}  // namespace

// Rendered items of one severity, in index order: [u32 index][u64 size][bytes] records in an
// unnamed temporary file (removed by the system when closed).
struct AuditStreamWriter::Spill {
  std::FILE* file = nullptr;
  std::size_t records = 0;
  // Reading back.
  std::size_t read = 0;
  std::uint32_t next_index = 0;
  std::string next;

  ~Spill() {
    if (file) std::fclose(file);
  }
  void put(std::uint32_t index, const std::string& text) {
    if (!file) {
      file = std::tmpfile();
      if (!file) throw Error(ExitCode::cant_create, io_message("cannot create"));
      // A whole store's findings run to hundreds of megabytes: write them in large blocks.
      std::setvbuf(file, nullptr, _IOFBF, 1u << 20);
    }
    const std::uint64_t size = text.size();
    if (std::fwrite(&index, sizeof index, 1, file) != 1 ||
        std::fwrite(&size, sizeof size, 1, file) != 1 ||
        (size > 0 && std::fwrite(text.data(), 1, text.size(), file) != text.size())) {
      throw Error(ExitCode::io_error, io_message("cannot write"));
    }
    ++records;
  }
  void rewind() {
    if (file && std::fseek(file, 0, SEEK_SET) != 0) {
      throw Error(ExitCode::io_error, io_message("cannot rewind"));
    }
  }
  // Loads the next record into next_index / next; false at the end.
  bool load() {
    if (read == records) return false;
    std::uint64_t size = 0;
    if (std::fread(&next_index, sizeof next_index, 1, file) != 1 ||
        std::fread(&size, sizeof size, 1, file) != 1) {
      throw Error(ExitCode::io_error, io_message("cannot read back"));
    }
    next.resize(static_cast<std::size_t>(size));
    if (size > 0 && std::fread(next.data(), 1, next.size(), file) != next.size()) {
      throw Error(ExitCode::io_error, io_message("cannot read back"));
    }
    ++read;
    return true;
  }
};

AuditStreamWriter::AuditStreamWriter(Format format, bool colour, std::size_t max_clean_lines)
    : format_(format), colour_(colour), max_clean_lines_(max_clean_lines) {
  for (int i = 0; i < 4; ++i) buckets_.push_back(std::make_unique<Spill>());
}

AuditStreamWriter::~AuditStreamWriter() = default;

void AuditStreamWriter::add(ItemAudit&& item) {
  const int r = rank(item);
  if (format_ == Format::text) {
    if (r == 3) {
      // Listed only when there are few; one more than the limit is enough to know.
      if (clean_lines_.size() <= max_clean_lines_) {
        clean_lines_.emplace_back(item.index, audit_text_clean_line(item));
      }
      return;
    }
    buckets_[static_cast<std::size_t>(r)]->put(item.index, audit_text_item(item, colour_));
  } else {
    buckets_[static_cast<std::size_t>(r)]->put(item.index, json_element(item));
  }
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
  // Calls emit(text) for each item of rank `b` in index order.
  auto merge = [&](std::size_t b, const auto& render, const auto& emit) {
    Spill& sp = *buckets_[b];
    sp.rewind();
    bool have = sp.load();
    std::size_t k = 0;
    const auto& ks = kept[b];
    while (have || k < ks.size()) {
      if (k < ks.size() && (!have || ks[k]->index < sp.next_index)) {
        emit(render(*ks[k++]));
      } else {
        emit(sp.next);
        have = sp.load();
      }
    }
  };

  if (format_ == Format::text) {
    out << audit_text_head(report, r.total_items, r.claims);
    auto render = [&](const ItemAudit& ia) { return audit_text_item(ia, colour_); };
    auto emit = [&](const std::string& s) { out << s; };
    for (std::size_t b = 0; b < 3; ++b) merge(b, render, emit);
    // The first clean lines, spilled and kept merged in index order.
    std::vector<std::string> lines;
    std::size_t c = 0, k = 0;
    const auto& ks = kept[3];
    while (lines.size() <= max_clean_lines_ && (c < clean_lines_.size() || k < ks.size())) {
      if (k < ks.size() && (c == clean_lines_.size() || ks[k]->index < clean_lines_[c].first)) {
        lines.push_back(audit_text_clean_line(*ks[k++]));
      } else {
        lines.push_back(clean_lines_[c++].second);
      }
    }
    out << audit_text_tail(static_cast<std::size_t>(r.clean_items), lines, max_clean_lines_);
    return;
  }

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
  if (at == std::string::npos) throw Error(ExitCode::internal, "audit: no items in the JSON shell");
  out.write(text.data(), static_cast<std::streamsize>(at));
  out << "\n  \"items\": [";
  bool first = true;
  auto emit = [&](const std::string& s) {
    out << (first ? "\n    " : ",\n    ") << s;
    first = false;
  };
  for (std::size_t b = 0; b < 4; ++b) merge(b, json_element, emit);
  out << (first ? "]" : "\n  ]");
  const std::size_t rest = at + marker.size();
  out.write(text.data() + rest, static_cast<std::streamsize>(text.size() - rest));
}

}  // namespace sp::audit
