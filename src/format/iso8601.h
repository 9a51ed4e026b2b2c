// Validation of the ISO 8601 date and date-time forms our files use.
//
//   date       YYYY-MM-DD                                      e.g. 2026-04-02
//   date-time  YYYY-MM-DDThh:mm[:ss[.fff...]](Z|+hh:mm|-hh:mm)   e.g. 2026-10-14T09:12:00-05:00
// A date-time must carry its UTC offset: a scale ticket is evidence, and a time without a
// zone cannot be ordered against another station's. Seconds 60 is accepted (leap second).
// Pure; returns "" when valid, else what is wrong, in words, for an error message.
#pragma once
#include <string>
#include <string_view>

namespace sp::format {

std::string check_iso_date(std::string_view s);
std::string check_iso_date_time(std::string_view s);

}  // namespace sp::format
