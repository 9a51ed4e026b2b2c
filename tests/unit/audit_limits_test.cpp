// Each configurable limit at its boundary: exactly at the limit gives no finding, one unit past
// it gives the finding. Also the calendar arithmetic the limits rest on.
#include <doctest/doctest.h>

#include <algorithm>
#include <cmath>

#include "audit/calendar.h"
#include "engine/scale_tolerance.h"
#include "unit/audit_fixture.h"

using namespace sp;
using namespace sp::audit;
using namespace sp::audit::test;

namespace {

bool has(const std::vector<Finding>& fs, const std::string& code) {
  return std::any_of(fs.begin(), fs.end(), [&](const Finding& f) { return f.code == code; });
}

}  // namespace

TEST_CASE("calendar: day numbers and month steps") {
  // Day numbers: Python's datetime.date arithmetic (general-purpose reference library).
  struct D {
    const char* text;
    long long days;
  };
  for (const D& d : {D{"1970-01-01", 0}, D{"1969-12-31", -1}, D{"2000-03-01", 11017},
                     D{"2026-10-14", 20740}}) {
    CAPTURE(d.text);
    REQUIRE(parse_date(d.text).has_value());
    CHECK(*parse_date(d.text) == d.days);
    CHECK(format_date(d.days) == d.text);
  }
  for (const char* bad : {"2026-02-29", "2026-13-01", "2026-1-01", "2026-10-14x", ""}) {
    CAPTURE(bad);
    CHECK_FALSE(parse_date(bad).has_value());
  }
  // Python datetime: 2026-10-14T09:12:00-05:00 is 1791987120 s after the epoch.
  auto t = parse_date_time("2026-10-14T09:12:00-05:00");
  REQUIRE(t.has_value());
  CHECK(t->utc_seconds == 1791987120);
  CHECK(t->local_day == 20740);
  CHECK(parse_date_time("2026-10-14T14:12:00.250Z")->utc_seconds == 1791987120);
  CHECK_FALSE(parse_date_time("2026-10-14T09:12:00").has_value());  // no offset: ambiguous
  // Month steps clamp to the month's end (common practice for "N months before").
  struct M {
    const char* from;
    int months;
    const char* to;
  };
  for (const M& m : {M{"2026-10-14", -12, "2025-10-14"}, M{"2026-03-31", -1, "2026-02-28"},
                     M{"2024-02-29", -12, "2023-02-28"}, M{"2026-01-15", -1, "2025-12-15"},
                     M{"2026-01-15", -13, "2024-12-15"}, M{"2025-11-30", 3, "2026-02-28"}}) {
    CAPTURE(m.from);
    CAPTURE(m.months);
    CHECK(format_date(add_months(*parse_date(m.from), m.months)) == m.to);
  }
}

TEST_CASE("limits: passes-span at its boundary, default and configured") {
  struct C {
    int limit;
    const char* last;  // weighed_at of the last pass; the first is 09:12-05:00
    bool finding;
  };
  for (const C& c : {C{60, "2026-10-14T10:12:00-05:00", false},
                     C{60, "2026-10-14T10:13:00-05:00", true},
                     C{60, "2026-10-14T10:12:01-05:00", true},
                     C{30, "2026-10-14T09:42:00-05:00", false},
                     C{30, "2026-10-14T09:43:00-05:00", true}}) {
    CAPTURE(c.limit);
    CAPTURE(c.last);
    AuditItem it = clean_item();
    it.session.passes[2].weighed_at = c.last;
    AuditOptions o = clean_options();
    o.max_span_minutes = c.limit;
    CHECK(has(audit_item(it, o), "passes-span") == c.finding);
  }
}

TEST_CASE("limits: inspection-lapsed at its boundary, default and configured") {
  // Weighed 2026-10-14. 12 months back is 2025-10-14 (still inside); the day before is not.
  struct C {
    int months;
    const char* inspected;
    bool finding;
  };
  for (const C& c : {C{12, "2025-10-14", false}, C{12, "2025-10-13", true},
                     C{12, "2026-10-14", false}, C{6, "2026-04-14", false},
                     C{6, "2026-04-13", true}, C{24, "2024-10-14", false},
                     C{24, "2024-10-13", true}}) {
    CAPTURE(c.months);
    CAPTURE(c.inspected);
    AuditItem it = clean_item();
    it.session.scale.last_inspected = c.inspected;
    AuditOptions o = clean_options();
    o.inspection_months = c.months;
    auto fs = audit_item(it, o);
    CHECK(has(fs, "inspection-lapsed") == c.finding);
    if (c.finding) {
      // Jurisdictions differ: the message must say so.
      auto f = std::find_if(fs.begin(), fs.end(),
                            [](const Finding& x) { return x.code == "inspection-lapsed"; });
      CHECK(f->message.find("jurisdictions") != std::string::npos);
    }
  }
}

TEST_CASE("limits: stale-weighing at its boundary, default and configured") {
  // Weighed 2026-10-14; 2027-04-12 is 180 days later (Python datetime).
  struct C {
    int days;
    const char* claim;
    bool finding;
  };
  for (const C& c : {C{180, "2027-04-12", false}, C{180, "2027-04-13", true},
                     C{30, "2026-11-13", false}, C{30, "2026-11-14", true},
                     C{0, "2026-10-14", false}, C{0, "2026-10-15", true}}) {
    CAPTURE(c.days);
    CAPTURE(c.claim);
    AuditItem it = clean_item();
    AuditOptions o = clean_options();
    o.claim_date = c.claim;
    o.stale_days = c.days;
    CHECK(has(audit_item(it, o), "stale-weighing") == c.finding);
  }
}

TEST_CASE("limits: future-time at the clock-drift boundary") {
  // A-1003 is weighed at 14:28:00Z = 1791988080 s (Python datetime); 5 min drift allowed.
  struct C {
    long long now;
    bool finding;
  };
  for (const C& c : {C{1791988080 - 300, false}, C{1791988080 - 301, true},
                     C{1791988080, false}}) {
    CAPTURE(c.now);
    AuditItem it = clean_item();
    AuditOptions o = clean_options();
    o.now = c.now;
    CHECK(has(audit_item(it, o), "future-time") == c.finding);
  }
}

TEST_CASE("limits: weight-drift at the root-sum-square of the scale tolerances") {
  // Every hitched/tensioned reading here is under 500 d, so each platform is allowed 1 d = 20 lb
  // (NIST HB 44 §2.20 Table 6, Class III L -- from memory); a pass total RSS 20*sqrt(3), the
  // difference of two totals 20*sqrt(6) = 48.99 lb.
  const double allowed = 20.0 * std::sqrt(6.0);
  CHECK(in_service_tolerance(ScaleClass::hb44_iii_l, 8240.0 / 20) == doctest::Approx(1.0));
  struct C {
    double trailer;  // tensioned trailer reading; 8240 balances the hitched total exactly
    bool finding;
  };
  for (const C& c : {C{8240, false}, C{8280, false}, C{8300, true}, C{8180, true},
                     C{8200, false}}) {
    CAPTURE(c.trailer);
    AuditItem it = clean_item();
    *it.session.passes[2].trailer = c.trailer;
    auto fs = audit_item(it, clean_options());
    CHECK(has(fs, "weight-drift") == c.finding);
    CHECK((std::fabs(c.trailer - 8240) > allowed) == c.finding);
    if (c.finding) {
      auto f = std::find_if(fs.begin(), fs.end(),
                            [](const Finding& x) { return x.code == "weight-drift"; });
      REQUIRE(f->values.size() == 4);
      CHECK(f->values[3].number.value_or(0) == doctest::Approx(allowed));
    }
  }
}
