// CSV of passes (one row a pass) <-> structs. Pure: streams in, strings out; no store access.
//
// Format: RFC 4180 (comma separated, fields with commas, quotes or line breaks in double
// quotes, "" for a quote inside), UTF-8, optional byte-order mark, LF or CRLF line ends; blank
// lines are skipped. The first line names the columns, in any order:
//   session      required  the session's key; rows with the same key form one session
//                          (a key not yet in the store opens a new session)
//   scale        the station's scale id (e.g. ST-3); required to open a new session
//   rig          the rig's name (or store id); required to open a new session
//   operator     who ran the scale; used when a new session is opened
//   kind         required  unhitched | hitched | tensioned
//   setting      bar tension setting label; tensioned passes only
//   ticket       required  scale ticket number, unique within the session
//   weighed_at   required  ISO 8601 date-time with offset: 2026-11-03T09:14:00-06:00 or ...Z
//   steer, drive required  platform readings, in the scale's weight unit
//   trailer      trailer-platform reading; empty or 0 for unhitched passes
//   gross        printed gross when the ticket shows one (must equal the sum)
//   ticket_scale scale id printed on the ticket, when it differs from the session's
//   entered_by   who keyed the ticket in
//   entered_at   when it was keyed in (ISO 8601); empty: the import time
//   void_reason  non-empty: the pass is stored and voided at once with this reason (on a
//                correction row: voided after the correction)
//   correction_reason  non-empty: the row corrects the pass with the same ticket in the same
//                session (stored earlier, in the store or the file): its kind, setting,
//                weighed_at, readings, gross and ticket_scale are the pass's complete
//                corrected values; entered_by / entered_at say who corrected it and when
// Unknown or repeated column names are refused. Empty optional fields mean "not given".
// Text cells are judged by validate::text_fault (format/validate.h); a text cell starting with
// a formula character is written "'=..." and read back as stored (docs/csv.md). Weights are
// plain decimals here; their ranges need the scale's unit, so the importer runs validate::pass.
// Errors are sp::Error(data_error) "<source>:<line>: <column>: <what was expected>, got ...".
#pragma once
#include <cstdint>
#include <istream>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/model.h"

namespace sp {

struct CsvPassRow {
  long line = 0;  // line on which the record starts (header = 1)
  std::string session;
  std::optional<std::string> scale, rig, operator_name, void_reason, correction_reason;
  Pass pass;
};

class PassCsvReader {
 public:
  // Reads and checks the header; throws data_error on a bad or missing header.
  PassCsvReader(std::istream& in, std::string source);
  // Next row into `row` (reusing its storage); false at the end of input. Throws data_error.
  bool next(CsvPassRow& row);
  std::uint64_t bytes_read() const { return bytes_; }
  long line() const { return line_; }
  // True when the header names the column.
  bool has_column(std::string_view name) const;

 private:
  bool read_record();
  bool multiline_ = false;  // the record held a quoted line break
  [[noreturn]] void fail(std::string_view column, const std::string& what) const;
  const std::string* field(int col) const;  // nullptr when absent or empty
  std::istream& in_;
  std::string source_;
  long line_ = 0;
  long record_line_ = 0;
  std::uint64_t bytes_ = 0;
  std::string buf_;
  std::vector<std::string> fields_;
  std::vector<int> col_;  // column id -> field index (-1 absent)
};

// The header line `write_pass_csv_row` matches (all columns, fixed order), with "\n".
std::string pass_csv_header();
// Appends one row (with "\n"). Numbers are written in shortest round-trip form.
void write_pass_csv_row(std::string& out, const CsvPassRow& row);

// Spreadsheet formula guard (OWASP "CSV Injection"): a text cell starting with one of these is
// written with a leading single quote; see docs/csv.md.
inline constexpr const char* kFormulaTriggers = "=+-@\t\r";
// True when the writer prefixes `v` with a single quote: it starts with a formula trigger, or
// with a quote followed by a trigger or another quote.
bool needs_text_prefix(std::string_view v);
// The reader's inverse: `v` without its guard quote (unchanged when it has none).
std::string_view strip_text_prefix(std::string_view v);

}  // namespace sp
