#include "format/pass_csv.h"

#include <algorithm>
#include <charconv>
#include <iterator>
#include <cmath>
#include <fmt/format.h>

#include "core/error.h"
#include "format/iso8601.h"

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

std::string shown(std::string_view v) {
  if (v.size() > 40) return "'" + std::string(v.substr(0, 40)) + "...' (" +
                            std::to_string(v.size()) + " bytes)";
  return "'" + std::string(v) + "'";
}

}  // namespace

bool is_clean_utf8(std::string_view s) {
  size_t i = 0;
  while (i < s.size()) {
    auto c = static_cast<unsigned char>(s[i]);
    if (c < 0x80) {
      if ((c < 0x20 && c != '\t') || c == 0x7f) return false;
      ++i;
      continue;
    }
    size_t n = (c & 0xe0) == 0xc0 ? 1 : (c & 0xf0) == 0xe0 ? 2 : (c & 0xf8) == 0xf0 ? 3 : 9;
    if (n == 9 || c == 0xc0 || c == 0xc1 || c > 0xf4) return false;
    if (i + n >= s.size()) return false;  // truncated sequence
    unsigned cp = c & (0x3f >> n);
    for (size_t k = 1; k <= n; ++k) {
      auto cc = static_cast<unsigned char>(s[i + k]);
      if ((cc & 0xc0) != 0x80) return false;
      cp = (cp << 6) | (cc & 0x3f);
    }
    if ((n == 2 && cp < 0x800) || (n == 3 && (cp < 0x10000 || cp > 0x10ffff)) ||
        (cp >= 0xd800 && cp <= 0xdfff)) {
      return false;
    }
    i += n + 1;
  }
  return true;
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
    if (v->size() > kMaxCsvText) {
      fail(kNames[col], fmt::format("expected at most {} bytes, got {}", kMaxCsvText, shown(*v)));
    }
    if (!is_clean_utf8(*v)) {
      fail(kNames[col], "expected UTF-8 text without control characters, got invalid bytes");
    }
    return *v;
  };
  auto required = [&](int col) -> std::string {
    auto v = text(col);
    if (!v) fail(kNames[col], "expected a value, got an empty field");
    return *v;
  };
  auto weight = [&](int col) -> std::optional<double> {
    const std::string* v = field(col);
    if (v == nullptr) return std::nullopt;
    double x = 0;
    const char* b = v->data();
    const char* e = b + v->size();
    bool plain = true;  // decimal digits with an optional fraction: no signs, exponents, spaces
    int dots = 0;
    for (char c : *v) {
      if (c == '.') ++dots;
      else if (c < '0' || c > '9') plain = false;
    }
    auto [p, ec] = std::from_chars(b, e, x, std::chars_format::fixed);
    if (!plain || dots > 1 || ec != std::errc() || p != e || !std::isfinite(x)) {
      fail(kNames[col], fmt::format("expected a weight >= 0 (digits, optional decimals), got {}",
                                    shown(*v)));
    }
    // No vehicle scale reads a billion of anything; past that a value is a typo, and keeping it
    // out also keeps every accepted number writable in plain (non-exponent) form, so export and
    // import round-trip (regression: huge_integer_written_in_exponent_form.csv).
    if (x > 1e9) {
      fail(kNames[col], fmt::format("expected a weight below 1000000000, got {}", shown(*v)));
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
    fail("weighed_at", fmt::format("expected an ISO 8601 date-time with offset such as "
                                   "2026-11-03T09:14:00-06:00, got {} ({})", shown(p.weighed_at), why));
  }
  auto steer = weight(kSteer);
  if (!steer) fail("steer", "expected a weight, got an empty field");
  auto drive = weight(kDrive);
  if (!drive) fail("drive", "expected a weight, got an empty field");
  p.steer = *steer;
  p.drive = *drive;
  p.trailer = weight(kTrailer);
  p.gross = weight(kGross);
  p.scale_id = text(kTicketScale);
  p.entered_by = text(kEnteredBy);
  p.entered_at = text(kEnteredAt);
  if (p.entered_at) {
    if (auto why = format::check_iso_date_time(*p.entered_at); !why.empty()) {
      fail("entered_at", fmt::format("expected an ISO 8601 date-time with offset, got {} ({})",
                                     shown(*p.entered_at), why));
    }
  }
  p.id.reset();
  p.voided = row.void_reason.has_value();
  p.void_reason = row.void_reason;
  return true;
}

namespace {
void put_text(std::string& out, std::string_view v) {
  if (v.find_first_of(",\"\r\n") == std::string_view::npos) {
    out.append(v);
    return;
  }
  out.push_back('"');
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
