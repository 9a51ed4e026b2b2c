#include "format/iso8601.h"

namespace sp::format {

namespace {

// Reads exactly `n` digits at s[pos]; -1 when any is not a digit.
int digits(std::string_view s, std::size_t pos, std::size_t n) {
  if (pos + n > s.size()) return -1;
  int v = 0;
  for (std::size_t i = pos; i < pos + n; ++i) {
    if (s[i] < '0' || s[i] > '9') return -1;
    v = v * 10 + (s[i] - '0');
  }
  return v;
}

bool leap(int y) { return (y % 4 == 0 && y % 100 != 0) || y % 400 == 0; }

int days_in_month(int y, int m) {
  static const int kDays[] = {31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31};
  return m == 2 && leap(y) ? 29 : kDays[m - 1];
}

// Checks YYYY-MM-DD at the start of s.
std::string date_part(std::string_view s) {
  const int y = digits(s, 0, 4), m = digits(s, 5, 2), d = digits(s, 8, 2);
  if (s.size() < 10 || y < 0 || m < 0 || d < 0 || s[4] != '-' || s[7] != '-') {
    return "expected a date YYYY-MM-DD";
  }
  if (m < 1 || m > 12) return "month " + std::to_string(m) + " is not 01-12";
  if (d < 1 || d > days_in_month(y, m)) {
    return "day " + std::to_string(d) + " does not exist in " + std::string(s.substr(0, 7));
  }
  return "";
}

}  // namespace

std::string check_iso_date(std::string_view s) {
  if (s.size() != 10) return "expected a date YYYY-MM-DD";
  return date_part(s);
}

std::string check_iso_date_time(std::string_view s) {
  // A const char*, not a std::string: a valid date-time allocates nothing (it is checked on
  // every row of a CSV import).
  const char* const form =
      "expected an ISO 8601 date-time with UTC offset, "
      "e.g. 2026-10-14T09:12:00-05:00";
  if (s.size() < 17) return form;
  if (auto e = date_part(s); !e.empty()) return e + " (" + form + ")";
  if (s[10] != 'T' || s[13] != ':') return form;
  const int hh = digits(s, 11, 2), mm = digits(s, 14, 2);
  if (hh < 0 || mm < 0) return form;
  if (hh > 23) return "hour " + std::to_string(hh) + " is not 00-23";
  if (mm > 59) return "minute " + std::to_string(mm) + " is not 00-59";
  std::size_t pos = 16;
  if (pos < s.size() && s[pos] == ':') {
    const int ss = digits(s, pos + 1, 2);
    if (ss < 0) return form;
    if (ss > 60) return "second " + std::to_string(ss) + " is not 00-60";
    pos += 3;
    if (pos < s.size() && s[pos] == '.') {
      std::size_t frac = pos + 1;
      while (frac < s.size() && s[frac] >= '0' && s[frac] <= '9') ++frac;
      if (frac == pos + 1) return form;
      pos = frac;
    }
  }
  if (pos == s.size()) {
    return std::string("missing the UTC offset (Z or +hh:mm / -hh:mm); ") + form;
  }
  if (s[pos] == 'Z') return pos + 1 == s.size() ? "" : form;
  if (s[pos] != '+' && s[pos] != '-') return form;
  const int oh = digits(s, pos + 1, 2), om = digits(s, pos + 4, 2);
  if (pos + 6 != s.size() || oh < 0 || om < 0 || s[pos + 3] != ':') return form;
  if (oh > 14 || om > 59) return "UTC offset " + std::string(s.substr(pos)) + " is out of range";
  return "";
}

}  // namespace sp::format
