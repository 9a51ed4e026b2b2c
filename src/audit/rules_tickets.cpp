// Audit rules on the tickets of one session (ticket-reuse across sessions is in auditor.cpp).
//
// Codes and severities:
//   unreadable-time  error    a pass's weighed_at is not an ISO 8601 date-time with offset
//   off-division     error    a printed reading is not a whole number of scale divisions
//   gross-mismatch   error    printed gross differs from the sum of the platform readings
//   mixed-scale      error    passes of one session printed by different scales
//   passes-span      warning  first to last pass longer than --max-span-minutes
//   future-time      error    a pass weighed after the audit clock (beyond clock drift)
//   duplicate-pass   error    the same ticket twice, or two passes with identical time and
//                             readings, in one session
// Voided passes are corrections already made on the record: they are left out of every rule.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <map>

#include "audit/rules_internal.h"

namespace sp::audit::detail {
namespace {

// A reading printed by a certified scale is a whole number of divisions. Float noise from
// decimal input (e.g. 0.1 kg divisions) stays far below 1e-6 d.
constexpr double kDivisionNoise = 1e-6;

struct Reading {
  const char* platform;
  double value;
};

std::vector<Reading> readings_of(const Pass& p) {
  std::vector<Reading> r{{"steer", p.steer}, {"drive", p.drive}};
  if (p.trailer) r.push_back({"trailer", *p.trailer});
  if (p.gross) r.push_back({"gross", *p.gross});
  return r;
}

void division_rules(const Session& s, const std::vector<TimedPass>& live,
                    std::vector<Finding>& out) {
  const double d = s.scale.division;
  const WeightUnit u = s.units.weight;
  if (!(d > 0)) return;  // the parser rejects this; nothing to check against
  for (const auto& tp : live) {
    const Pass& p = *tp.pass;
    for (const auto& r : readings_of(p)) {
      const double n = r.value / d;
      if (std::fabs(n - std::round(n)) <= kDivisionNoise) continue;
      Finding f = make_finding(
          "off-division", Severity::error,
          fmt::format("Ticket {}: the {} reading {} is not a multiple of the scale division {}; "
                      "a certified scale cannot print it, so it was entered or changed by hand.",
                      p.ticket, r.platform, weight_text(r.value, u), weight_text(d, u)),
          "a digital scale indicates in whole steps of its division d (common practice)");
      f.ticket = p.ticket;
      f.platform = r.platform;
      f.values = {weight_value("reading", r.value, u), weight_value("division", d, u)};
      out.push_back(std::move(f));
    }
    if (p.gross) {
      const double sum = p.steer + p.drive + p.trailer.value_or(0);
      // The printed gross of a multi-platform ticket is the sum of the printed platform
      // weights; each is a whole division, so any real difference is at least one division.
      if (std::fabs(*p.gross - sum) >= 0.5 * d) {
        Finding f = make_finding(
            "gross-mismatch", Severity::error,
            fmt::format("Ticket {}: printed gross {} differs from the sum of the platforms {} by "
                        "{}.",
                        p.ticket, weight_text(*p.gross, u), weight_text(sum, u),
                        weight_text(*p.gross - sum, u)),
            "printed gross = steer + drive + trailer (common practice; tolerance half a "
            "division for decimal noise)");
        f.ticket = p.ticket;
        f.values = {weight_value("gross", *p.gross, u), weight_value("sum", sum, u)};
        out.push_back(std::move(f));
      }
    }
  }
}

void mixed_scale_rule(const Session& s, const std::vector<TimedPass>& live,
                      std::vector<Finding>& out) {
  std::vector<std::string> others;
  std::vector<std::string> scales;
  for (const auto& tp : live) {
    const std::string& sc = pass_scale(s, *tp.pass);
    if (sc != s.scale.id) {
      others.push_back(fmt::format("{} on {}", tp.pass->ticket, sc));
      if (std::find(scales.begin(), scales.end(), sc) == scales.end()) scales.push_back(sc);
    }
  }
  if (others.empty()) return;
  Finding f = make_finding(
      "mixed-scale", Severity::error,
      fmt::format("Passes of this session were weighed on different scales (session scale {}; "
                  "{}). Tongue load and bar moment come from differences between passes, which "
                  "only cancel the scale's own error when every pass is on the same scale.",
                  s.scale.id, fmt::join(others, ", ")),
      "all passes of one session on one scale (common practice)");
  f.values.push_back(text_value("session scale", s.scale.id));
  f.values.push_back(text_value("other scales", fmt::format("{}", fmt::join(scales, ", "))));
  out.push_back(std::move(f));
}

void time_rules(const Session& s, const AuditOptions& o, const std::vector<TimedPass>& live,
                std::vector<Finding>& out) {
  const TimedPass* first = nullptr;
  const TimedPass* last = nullptr;
  for (const auto& tp : live) {
    if (!tp.time) {
      Finding f = make_finding(
          "unreadable-time", Severity::error,
          fmt::format("Ticket {}: weighed_at '{}' is not a date-time with a UTC offset, so the "
                      "time rules cannot be applied to it.",
                      tp.pass->ticket, tp.pass->weighed_at),
          "weighed_at: YYYY-MM-DDThh:mm[:ss](Z|+hh:mm) (ISO 8601)");
      f.ticket = tp.pass->ticket;
      out.push_back(std::move(f));
      continue;
    }
    if (!first || tp.time->utc_seconds < first->time->utc_seconds) first = &tp;
    if (!last || tp.time->utc_seconds > last->time->utc_seconds) last = &tp;
    const std::int64_t ahead = tp.time->utc_seconds - o.now;
    if (ahead > static_cast<std::int64_t>(o.future_slack_minutes) * 60) {
      Finding f = make_finding(
          "future-time", Severity::error,
          fmt::format("Ticket {}: weighed at {}, which is {} minutes after the time of this audit.",
                      tp.pass->ticket, tp.pass->weighed_at, number_text(static_cast<double>(ahead) / 60.0, 0)),
          fmt::format("weighed_at no later than the audit clock plus {} min for clock drift "
                      "(common practice)",
                      o.future_slack_minutes));
      f.ticket = tp.pass->ticket;
      f.values.push_back(text_value("weighed at", tp.pass->weighed_at));
      out.push_back(std::move(f));
    }
  }
  if (first && last) {
    const std::int64_t span = last->time->utc_seconds - first->time->utc_seconds;
    if (span > static_cast<std::int64_t>(o.max_span_minutes) * 60) {
      Finding f = make_finding(
          "passes-span", Severity::warning,
          fmt::format("The passes span {} minutes, from ticket {} at {} to ticket {} at {}: "
                      "more than {} minutes, time enough for the load to change between passes.",
                      number_text(static_cast<double>(span) / 60.0, 1), first->pass->ticket, first->pass->weighed_at,
                      last->pass->ticket, last->pass->weighed_at, o.max_span_minutes),
          fmt::format("first to last pass within {} minutes (--max-span-minutes; common "
                      "practice)",
                      o.max_span_minutes));
      f.values = {number_value("span", static_cast<double>(span) / 60.0, "min"),
                  number_value("limit", o.max_span_minutes, "min", 0)};
      out.push_back(std::move(f));
    }
  }
  (void)s;
}

void duplicate_rule(const Session& s, const std::vector<TimedPass>& live,
                    std::vector<Finding>& out) {
  const WeightUnit u = s.units.weight;
  std::map<std::string, const Pass*> by_ticket;
  for (std::size_t i = 0; i < live.size(); ++i) {
    const Pass& p = *live[i].pass;
    auto [it, fresh] = by_ticket.emplace(p.ticket, &p);
    if (!fresh) {
      Finding f = make_finding(
          "duplicate-pass", Severity::error,
          fmt::format("Ticket {} appears twice in this session: the same pass was entered twice.",
                      p.ticket),
          "each ticket once per session");
      f.ticket = p.ticket;
      out.push_back(std::move(f));
      continue;
    }
    for (std::size_t j = 0; j < i; ++j) {
      const Pass& q = *live[j].pass;
      if (q.ticket == p.ticket) continue;  // reported above
      const bool same_time = live[i].time && live[j].time
                                 ? live[i].time->utc_seconds == live[j].time->utc_seconds
                                 : p.weighed_at == q.weighed_at;
      if (same_time && p.steer == q.steer && p.drive == q.drive &&
          p.trailer.value_or(0) == q.trailer.value_or(0)) {
        Finding f = make_finding(
            "duplicate-pass", Severity::error,
            fmt::format("Tickets {} and {} carry the same time ({}) and identical readings "
                        "({} / {} / {}): one weighing was entered twice under two tickets.",
                        q.ticket, p.ticket, p.weighed_at, weight_text(p.steer, u),
                        weight_text(p.drive, u), weight_text(p.trailer.value_or(0), u)),
            "two passes cannot be weighed at the same moment on one scale");
        f.ticket = p.ticket;
        f.values = {text_value("tickets", q.ticket + ", " + p.ticket),
                    text_value("weighed at", p.weighed_at)};
        out.push_back(std::move(f));
      }
    }
  }
}

}  // namespace

void ticket_rules(const AuditItem& item, const AuditOptions& o, const std::vector<TimedPass>& live,
                  std::vector<Finding>& out) {
  const Session& s = item.session;
  if (live.empty()) {
    out.push_back(make_finding("no-passes", Severity::error,
                               "The session holds no (non-voided) pass: there is nothing to audit.",
                               "a weighing has at least one pass"));
    return;
  }
  time_rules(s, o, live, out);
  division_rules(s, live, out);
  mixed_scale_rule(s, live, out);
  duplicate_rule(s, live, out);
}

}  // namespace sp::audit::detail
