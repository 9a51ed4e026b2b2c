// Calendar arithmetic for the audit rules: ISO 8601 dates and date-times with offsets.
//
// Days are counted from 1970-01-01 in the proleptic Gregorian calendar (ISO 8601 §4.3.2.1),
// using the civil-from-days / days-from-civil algorithms published by H. Hinnant,
// "chrono-Compatible Low-Level Date Algorithms" (public domain). Pure; nothing reads a clock.
#pragma once
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>

namespace sp::audit {

struct CivilDate {
  int year = 1970;
  int month = 1;  // 1..12
  int day = 1;    // 1..31
};

// Days since 1970-01-01 of a valid civil date.
std::int64_t days_from_civil(const CivilDate& d);
CivilDate civil_from_days(std::int64_t days);

// "YYYY-MM-DD" -> days since 1970-01-01; nullopt when malformed or not a real date.
std::optional<std::int64_t> parse_date(std::string_view text);

// A parsed "YYYY-MM-DDThh:mm[:ss[.fff]](Z|±hh:mm)".
struct DateTime {
  std::int64_t utc_seconds = 0;  // seconds since 1970-01-01T00:00:00Z
  std::int64_t local_day = 0;    // the date as printed (local to the offset), days since epoch
};
std::optional<DateTime> parse_date_time(std::string_view text);

// `day` moved by `months` calendar months (negative: back); a day past the end of the target
// month clamps to its last day (2026-03-31 minus 1 month = 2026-02-28).
std::int64_t add_months(std::int64_t day, int months);

// "YYYY-MM-DD" of a day count.
std::string format_date(std::int64_t day);

}  // namespace sp::audit

namespace sp::audit {
// "YYYY-MM-DDThh:mm:ssZ" of seconds since the epoch.
std::string format_utc(std::int64_t seconds);
}  // namespace sp::audit
