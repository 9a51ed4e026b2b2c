#include "format/pass_csv.h"

#include <fmt/format.h>

#include <algorithm>
#include <charconv>
#include <cmath>
#include <iterator>

#include "core/error.h"
#include "format/iso8601.h"
#include "format/validate.h"

namespace sp {

namespace {

enum Col {
  kSession, kScale, kRig, kOperator, kKind, kSetting, kTicket, kWeighedAt, kSteer, kDrive,
  kTrailer, kGross, kTicketScale, kEnteredBy, kEnteredAt, kVoidReason, kCorrectionReason,
  kNumCols
};
constexpr const char* kNames[kNumCols] = {
    "session", "scale", "rig", "operator", "kind", "setting", "ticket", "weighed_at", "steer",
    "drive", "trailer", "gross", "ticket_scale", "entered_by", "entered_at", "void_reason",
    "correction_reason"};
constexpr bool kRequired[kNumCols] = {true, false, false, false, true, false, true, true,
                                      true, true, false, false, false, false, false, false,
                                      false};
// How the validator judges each text column (format/validate.h); weights are numbers.
using validate::Text;
constexpr Text kText[kNumCols] = {Text::ticket, Text::label,  Text::label,  Text::label,
                                  Text::label,  Text::ticket, Text::ticket, Text::label,
                                  Text::label,  Text::label,  Text::label,  Text::label,
                                  Text::label,  Text::label,  Text::label,  Text::label,
                                  Text::label};

std::string shown(std::string_view v) {
  return validate::quoted(v);
}

bool starts_with_formula_trigger(std::string_view v) {
  return !v.empty() && std::string_view(kFormulaTriggers).find(v[0]) != std::string_view::npos;
}

}  // namespace

bool needs_text_prefix(std::string_view v) {
  return starts_with_formula_trigger(v) ||
         (v.size() > 1 && v[0] == '\'' &&
          (v[1] == '\'' || starts_with_formula_trigger(v.substr(1))));
}

std::string_view strip_text_prefix(std::string_view v) {
  return needs_text_prefix(v) && v[0] == '\'' ? v.substr(1) : v;
}

PassCsvReader::PassCsvReader(std::istream& in, std::string source)
    : in_(in), source_(std::move(source)), col_(kNumCols, -1) {
  if (!read_record()) fail("header", "expected a header line naming the columns (session, "
                                     "kind, ticket, weighed_at, steer, drive, ...), got an empty file");
  if (!fields_.empty() && fields_[0].rfind("\xEF\xBB\xBF", 0) == 0) fields_[0].erase(0, 3);
  for (size_t i = 0; i < fields_.size(); ++i) {
    const std::string& name = fields_[i];
    int id = -1;
    for (int k = 0; k < kNumCols; ++k) {
      if (name == kNames[k]) id = k;
    }
    if (id < 0) {
      std::string known;
      for (int k = 0; k < kNumCols; ++k) known += (k ? ", " : "") + std::string(kNames[k]);
      fail("header", fmt::format("column {}: unknown column {} (expected one of: {})", i + 1,
                                 shown(name), known));
    }
    if (col_[id] >= 0) fail("header", fmt::format("column {} appears twice", name));
    col_[id] = static_cast<int>(i);
  }
  for (int k = 0; k < kNumCols; ++k) {
    if (kRequired[k] && col_[k] < 0) fail("header", fmt::format("missing column {}", kNames[k]));
  }
}

bool PassCsvReader::has_column(std::string_view name) const {
  for (int k = 0; k < kNumCols; ++k) {
    if (name == kNames[k]) return col_[k] >= 0;
  }
  return false;
}

void PassCsvReader::fail(std::string_view column, const std::string& what) const {
  throw data_error(fmt::format("{}:{}: {}: {}", source_, record_line_, column, what));
}

// Reads one record (possibly spanning lines inside quotes) into fields_. Skips blank lines.
bool PassCsvReader::read_record() {
  for (;;) {
    if (!std::getline(in_, buf_)) return false;
    ++line_;
    bytes_ += buf_.size() + 1;
    if (!buf_.empty() && buf_.back() == '\r') buf_.pop_back();
    if (!buf_.empty()) break;
  }
  record_line_ = line_;
  multiline_ = false;
  size_t n = 0;  // fields used
  auto next_field = [&]() -> std::string& {
    if (n == fields_.size()) fields_.emplace_back();
    std::string& f = fields_[n++];
    f.clear();
    return f;
  };
  std::string* f = &next_field();
  size_t i = 0;
  bool quoted = false, was_quoted = false;
  for (;;) {
    if (i == buf_.size()) {
      if (!quoted) break;
      // A line break inside quotes belongs to the field.
      std::string more;
      if (!std::getline(in_, more)) fail("record", "unterminated quoted field at end of file");
      ++line_;
      bytes_ += more.size() + 1;
      if (!more.empty() && more.back() == '\r') more.pop_back();
      f->push_back('\n');
      multiline_ = true;
      buf_ = std::move(more);
      i = 0;
      continue;
    }
    char c = buf_[i++];
    if (quoted) {
      if (c == '"') {
        if (i < buf_.size() && buf_[i] == '"') {
          f->push_back('"');
          ++i;
        } else {
          quoted = false;
        }
      } else {
        f->push_back(c);
      }
    } else if (c == ',') {
      f = &next_field();
      was_quoted = false;
    } else if (c == '"' && f->empty() && !was_quoted) {
      quoted = was_quoted = true;
    } else if (was_quoted) {
      fail("record", fmt::format("field {}: text after a closing quote", n));
    } else {
      f->push_back(c);
    }
  }
  fields_.resize(n);
  return true;
}

const std::string* PassCsvReader::field(int col) const {
  int idx = col_[col];
  if (idx < 0 || fields_[idx].empty()) return nullptr;
  return &fields_[idx];
}

bool PassCsvReader::next(CsvPassRow& row) {
  if (!read_record()) return false;
  if (fields_.size() != static_cast<size_t>(std::count_if(col_.begin(), col_.end(),
                                                          [](int c) { return c >= 0; }))) {
    fail("record", fmt::format("expected {} fields as named in the header, got {}",
                               std::count_if(col_.begin(), col_.end(), [](int c) { return c >= 0; }),
                               fields_.size()));
  }
  row.line = record_line_;
  auto text = [&](int col) -> std::optional<std::string> {
    const std::string* v = field(col);
    if (v == nullptr) return std::nullopt;
    if (multiline_ && v->find('\n') != std::string::npos) {
      fail(kNames[col], "expected one line of text, got a newline inside a quoted field");
    }
    // A cell the writer guarded against spreadsheet formulas ("'=...") reads back as written
    // before the guard (docs/csv.md).
    const std::string_view t = strip_text_prefix(*v);
    if (std::string why = validate::text_fault(t, kText[col]); !why.empty()) {
      fail(kNames[col], why);
    }
    return std::string(t);
  };
  auto required = [&](int col) -> std::string {
    auto v = text(col);
    if (!v) fail(kNames[col], "expected a value, got an empty field");
    return *v;
  };
  // Weights are plain decimals (validate::parse_number); their range depends on the scale's
  // unit, so the store judges it (validate::pass). A negative number is read as one, so its
  // message is the range's; the formula guard never applies to these columns (docs/csv.md).
  auto weight = [&](int col) -> std::optional<double> {
    const std::string* v = field(col);
    if (v == nullptr) return std::nullopt;
    double x = 0;
    if (!validate::parse_number(*v, x)) {
      fail(kNames[col], "expected a number, got " + shown(*v));
    }
    return x;
  };
  row.session = required(kSession);
  row.scale = text(kScale);
  row.rig = text(kRig);
  row.operator_name = text(kOperator);
  row.void_reason = text(kVoidReason);
  row.correction_reason = text(kCorrectionReason);
  Pass& p = row.pass;
  std::string kind = required(kKind);
  auto k = parse_pass_kind(kind);
  if (!k) fail("kind", fmt::format("expected unhitched, hitched or tensioned, got {}", shown(kind)));
  p.kind = *k;
  p.setting = text(kSetting);
  p.ticket = required(kTicket);
  p.weighed_at = required(kWeighedAt);
  if (auto why = format::check_iso_date_time(p.weighed_at); !why.empty()) {
    fail("weighed_at", why + ", got " + shown(p.weighed_at));  // validate::pass's wording
  }
  auto steer = weight(kSteer);
  if (!steer) fail("steer", "expected a number, got an empty field");
  auto drive = weight(kDrive);
  if (!drive) fail("drive", "expected a number, got an empty field");
  p.steer = *steer;
  p.drive = *drive;
  p.trailer = weight(kTrailer);
  p.gross = weight(kGross);
  p.scale_id = text(kTicketScale);
  p.entered_by = text(kEnteredBy);
  p.entered_at = text(kEnteredAt);
  if (p.entered_at) {
    if (auto why = format::check_iso_date_time(*p.entered_at); !why.empty()) {
      fail("entered_at", why + ", got " + shown(*p.entered_at));
    }
  }
  p.id.reset();
  p.voided = row.void_reason.has_value();
  p.void_reason = row.void_reason;
  return true;
}

namespace {
// A cell a spreadsheet would take for a formula (it starts with = + - @ tab or CR) is written
// as "'=...": a leading single quote inside a quoted cell, which spreadsheets show as text
// (OWASP "CSV Injection"). A cell that starts with a quote before such a character (or before
// another quote) gets one too, so the reader's rule -- drop one leading quote before those --
// gives back exactly what was stored.
void put_text(std::string& out, std::string_view v) {
  const bool guard = needs_text_prefix(v);
  if (!guard && v.find_first_of(",\"\r\n") == std::string_view::npos) {
    out.append(v);
    return;
  }
  out.push_back('"');
  if (guard) out.push_back('\'');
  for (char c : v) {
    if (c == '"') out.push_back('"');
    out.push_back(c);
  }
  out.push_back('"');
}
void put_opt(std::string& out, const std::optional<std::string>& v) {
  if (v) put_text(out, *v);
}
// Shortest plain decimal that reads back to the same double: the reader takes no exponents, so
// the writer must never emit one (fmt's "{}" writes 1e-05; regression: fuzz pass_csv).
void put_num(std::string& out, const std::optional<double>& v) {
  if (!v) return;
  char buf[400];
  auto [end, ec] = std::to_chars(buf, buf + sizeof buf, *v, std::chars_format::fixed);
  if (ec != std::errc()) throw Error(ExitCode::internal, "pass CSV: cannot write a number");
  out.append(buf, end);
}
}  // namespace

std::string pass_csv_header() {
  std::string h;
  for (int k = 0; k < kNumCols; ++k) {
    if (k) h.push_back(',');
    h += kNames[k];
  }
  return h + "\n";
}

void write_pass_csv_row(std::string& out, const CsvPassRow& row) {
  const Pass& p = row.pass;
  put_text(out, row.session); out.push_back(',');
  put_opt(out, row.scale); out.push_back(',');
  put_opt(out, row.rig); out.push_back(',');
  put_opt(out, row.operator_name); out.push_back(',');
  out.append(to_string(p.kind)); out.push_back(',');
  put_opt(out, p.setting); out.push_back(',');
  put_text(out, p.ticket); out.push_back(',');
  put_text(out, p.weighed_at); out.push_back(',');
  put_num(out, p.steer); out.push_back(',');
  put_num(out, p.drive); out.push_back(',');
  put_num(out, p.trailer); out.push_back(',');
  put_num(out, p.gross); out.push_back(',');
  put_opt(out, p.scale_id); out.push_back(',');
  put_opt(out, p.entered_by); out.push_back(',');
  put_opt(out, p.entered_at); out.push_back(',');
  put_opt(out, p.voided ? std::optional<std::string>(p.void_reason.value_or("voided"))
                        : std::nullopt);
  out.push_back(',');
  put_opt(out, row.correction_reason);
  out.push_back('\n');
}

}  // namespace sp
