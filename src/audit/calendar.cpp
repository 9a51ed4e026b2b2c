#include "audit/calendar.h"

#include <fmt/format.h>

#include <algorithm>

namespace sp::audit {
namespace {

bool is_leap(int y) { return (y % 4 == 0 && y % 100 != 0) || y % 400 == 0; }

int days_in_month(int y, int m) {
  static constexpr int kDays[] = {31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31};
  return m == 2 && is_leap(y) ? 29 : kDays[m - 1];
}

// Reads exactly `n` decimal digits at `pos`; advances pos.
std::optional<int> digits(std::string_view s, std::size_t& pos, std::size_t n) {
  if (pos + n > s.size()) return std::nullopt;
  int v = 0;
  for (std::size_t i = 0; i < n; ++i) {
    char c = s[pos + i];
    if (c < '0' || c > '9') return std::nullopt;
    v = v * 10 + (c - '0');
  }
  pos += n;
  return v;
}

bool expect(std::string_view s, std::size_t& pos, char c) {
  if (pos >= s.size() || s[pos] != c) return false;
  ++pos;
  return true;
}

std::optional<CivilDate> read_date(std::string_view s, std::size_t& pos) {
  auto y = digits(s, pos, 4);
  if (!y || !expect(s, pos, '-')) return std::nullopt;
  auto m = digits(s, pos, 2);
  if (!m || !expect(s, pos, '-')) return std::nullopt;
  auto d = digits(s, pos, 2);
  if (!d || *m < 1 || *m > 12 || *d < 1 || *d > days_in_month(*y, *m)) return std::nullopt;
  return CivilDate{*y, *m, *d};
}

}  // namespace

// Hinnant, days_from_civil (public domain).
std::int64_t days_from_civil(const CivilDate& d) {
  const std::int64_t y = d.year - (d.month <= 2 ? 1 : 0);
  const std::int64_t era = (y >= 0 ? y : y - 399) / 400;
  const std::int64_t yoe = y - era * 400;
  const std::int64_t mp = d.month > 2 ? d.month - 3 : d.month + 9;
  const std::int64_t doy = (153 * mp + 2) / 5 + d.day - 1;
  const std::int64_t doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
  return era * 146097 + doe - 719468;
}

// Hinnant, civil_from_days (public domain).
CivilDate civil_from_days(std::int64_t z) {
  z += 719468;
  const std::int64_t era = (z >= 0 ? z : z - 146096) / 146097;
  const std::int64_t doe = z - era * 146097;
  const std::int64_t yoe = (doe - doe / 1460 + doe / 36524 - doe / 146096) / 365;
  const std::int64_t doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
  const std::int64_t mp = (5 * doy + 2) / 153;
  const std::int64_t d = doy - (153 * mp + 2) / 5 + 1;
  const std::int64_t m = mp < 10 ? mp + 3 : mp - 9;
  const std::int64_t y = yoe + era * 400 + (m <= 2 ? 1 : 0);
  return CivilDate{static_cast<int>(y), static_cast<int>(m), static_cast<int>(d)};
}

std::optional<std::int64_t> parse_date(std::string_view text) {
  std::size_t pos = 0;
  auto d = read_date(text, pos);
  if (!d || pos != text.size()) return std::nullopt;
  return days_from_civil(*d);
}

std::optional<DateTime> parse_date_time(std::string_view s) {
  std::size_t pos = 0;
  auto d = read_date(s, pos);
  if (!d || !expect(s, pos, 'T')) return std::nullopt;
  auto hh = digits(s, pos, 2);
  if (!hh || !expect(s, pos, ':')) return std::nullopt;
  auto mi = digits(s, pos, 2);
  if (!mi) return std::nullopt;
  int ss = 0;
  if (pos < s.size() && s[pos] == ':') {
    ++pos;
    auto sec = digits(s, pos, 2);
    if (!sec) return std::nullopt;
    ss = *sec;
    if (pos < s.size() && (s[pos] == '.' || s[pos] == ',')) {  // fraction: ignored
      ++pos;
      std::size_t start = pos;
      while (pos < s.size() && s[pos] >= '0' && s[pos] <= '9') ++pos;
      if (pos == start) return std::nullopt;
    }
  }
  if (*hh > 23 || *mi > 59 || ss > 60) return std::nullopt;  // 60: a leap second
  int offset_min = 0;
  if (pos < s.size() && (s[pos] == 'Z' || s[pos] == 'z')) {
    ++pos;
  } else if (pos < s.size() && (s[pos] == '+' || s[pos] == '-')) {
    int sign = s[pos] == '-' ? -1 : 1;
    ++pos;
    auto oh = digits(s, pos, 2);
    if (!oh || !expect(s, pos, ':')) return std::nullopt;
    auto om = digits(s, pos, 2);
    if (!om || *oh > 23 || *om > 59) return std::nullopt;
    offset_min = sign * (*oh * 60 + *om);
  } else {
    return std::nullopt;  // an offset is required: a bare local time is ambiguous
  }
  if (pos != s.size()) return std::nullopt;
  DateTime out;
  out.local_day = days_from_civil(*d);
  const std::int64_t local = out.local_day * 86400 + *hh * 3600 + *mi * 60 + ss;
  out.utc_seconds = local - static_cast<std::int64_t>(offset_min) * 60;
  return out;
}

std::int64_t add_months(std::int64_t day, int months) {
  CivilDate d = civil_from_days(day);
  std::int64_t index = static_cast<std::int64_t>(d.year) * 12 + (d.month - 1) + months;
  std::int64_t y = index >= 0 ? index / 12 : (index - 11) / 12;
  int m = static_cast<int>(index - y * 12) + 1;
  CivilDate out{static_cast<int>(y), m, 1};
  out.day = std::min(d.day, days_in_month(out.year, m));
  return days_from_civil(out);
}

std::string format_date(std::int64_t day) {
  CivilDate d = civil_from_days(day);
  if (d.year < 0 || d.year > 9999) {
    return fmt::format("{:04d}-{:02d}-{:02d}", d.year, d.month, d.day);
  }
  // Digits by hand: the audit formats a few dates per session, fmt's parsing costs 10x this.
  std::string out = "0000-00-00";
  const auto put = [&out](std::size_t end, int v, int width) {
    for (int i = 0; i < width; ++i, v /= 10) {
      out[end - static_cast<std::size_t>(i)] = static_cast<char>('0' + v % 10);
    }
  };
  put(3, d.year, 4);
  put(6, d.month, 2);
  put(9, d.day, 2);
  return out;
}

}  // namespace sp::audit

namespace sp::audit {
std::string format_utc(std::int64_t seconds) {
  std::int64_t day = seconds >= 0 ? seconds / 86400 : (seconds - 86399) / 86400;
  std::int64_t rest = seconds - day * 86400;
  return fmt::format("{}T{:02d}:{:02d}:{:02d}Z", format_date(day), rest / 3600, rest / 60 % 60,
                     rest % 60);
}
}  // namespace sp::audit
