// Audit rules on the physics, the ratings and the timing of one weighing.
//
// Codes and severities:
//   (engine flags)       as the engine rates them: inconsistent-reading, geometry-mismatch,
//                        over-restored, under-restored, rear-unloaded, tongue-percent, ...
//                        (off-division and gross-mismatch are the audit's own ticket rules)
//   unsolvable           error    the engine could not solve the session at all
//   not-solved           note     one quantity the engine could not solve, and why
//   compliance-over      error    a rating exceeded beyond the measurement uncertainty
//   compliance-undecided warning  a rating within reach of the uncertainty (engine: GUM k = 2)
//   weight-drift         error    the rig's total changes between hitched/tensioned passes by
//                                 more than the scale tolerances allow (passes whose reading the
//                                 engine already named as inconsistent are left out: one
//                                 finding per cause, so one keying error is one finding)
//   stale-weighing       warning  weighing more than --stale-days before --claim-date
//   weighed-after-claim  note     the weighing is later than the claim date
#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "audit/rules_internal.h"
#include "engine/scale_tolerance.h"

namespace sp::audit::detail {
namespace {

// The in-service tolerance bounding one reading, in the weight unit: NIST HB 44 §2.20 Table 6
// maintenance tolerance (or the OIML R 76 in-service MPE) at that load, via the engine.
double reading_tolerance(ScaleClass c, double reading, double division) {
  return in_service_tolerance(c, std::fabs(reading) / division) * division;
}

// weight-drift. Rule: with the trailer hitched, the bars only move load between axles, so the
// sum steer + drive + trailer of every hitched and tensioned pass weighs the same rig. Each
// pass's total is allowed the root-sum-square of its three platforms' in-service tolerances
// (independent platform errors; common practice for combining tolerances), and the difference
// of two totals the root-sum-square of the two passes' allowances. A larger difference means
// someone or something got on or off between the passes.
void weight_drift_rule(const Session& s, const std::vector<TimedPass>& live,
                       const std::vector<std::string>& named, std::vector<Finding>& out) {
  const double d = s.scale.division;
  if (!(d > 0)) return;
  const ScaleClass c = parse_scale_class(s.scale.accuracy_class).value_or(ScaleClass::hb44_iii_l);
  struct Total {
    const Pass* pass;
    double total, tol;
  };
  std::vector<Total> totals;
  for (const auto& tp : live) {
    const Pass& p = *tp.pass;
    if (p.kind == PassKind::unhitched || !p.trailer) continue;
    if (std::find(named.begin(), named.end(), p.ticket) != named.end()) continue;
    const double ts = reading_tolerance(c, p.steer, d);
    const double td = reading_tolerance(c, p.drive, d);
    const double tt = reading_tolerance(c, *p.trailer, d);
    totals.push_back(
        Total{&p, p.steer + p.drive + *p.trailer, std::sqrt(ts * ts + td * td + tt * tt)});
  }
  const Total* wa = nullptr;
  const Total* wb = nullptr;
  double worst_excess = 0;
  double worst_allow = 0;
  for (std::size_t i = 0; i < totals.size(); ++i) {
    for (std::size_t j = i + 1; j < totals.size(); ++j) {
      const double diff = std::fabs(totals[i].total - totals[j].total);
      const double allow = std::hypot(totals[i].tol, totals[j].tol);
      if (diff - allow > worst_excess) {
        worst_excess = diff - allow;
        worst_allow = allow;
        wa = &totals[i];
        wb = &totals[j];
      }
    }
  }
  if (!wa) return;
  const WeightUnit u = s.units.weight;
  const double diff = wb->total - wa->total;
  Finding f = make_finding(
      "weight-drift", Severity::error,
      fmt::format("The rig's total weight changed by {} between ticket {} ({}) and ticket {} "
                  "({}), more than the {} the scale's tolerances allow: someone or something got "
                  "on or off the rig between the passes, so the passes do not weigh the same "
                  "load.",
                  weight_text(diff, u), wa->pass->ticket, weight_text(wa->total, u),
                  wb->pass->ticket, weight_text(wb->total, u), weight_text(worst_allow, u)),
      "hitched/tensioned totals agree within the root-sum-square of the per-platform "
      "in-service tolerances of both passes (NIST HB 44 §2.20 Table 6; RSS: common practice)");
  f.ticket = wb->pass->ticket;
  f.values = {weight_value(wa->pass->ticket + " total", wa->total, u),
              weight_value(wb->pass->ticket + " total", wb->total, u),
              weight_value("difference", diff, u), weight_value("allowed", worst_allow, u)};
  out.push_back(std::move(f));
}

void unsolved_rules(const ReconcileResult& r, std::vector<Finding>& out) {
  for (const std::string& line : r.unsolved) {
    out.push_back(make_finding("not-solved", Severity::note, line,
                               "the engine solves only what the passes determine"));
  }
}

void engine_rules(const AuditItem& item, std::vector<Finding>& out) {
  if (item.reconcile_error) {
    out.push_back(make_finding("unsolvable", Severity::error,
                               "The weighing could not be reconciled: " + *item.reconcile_error,
                               "the engine must solve the session (scaleproof reconcile)"));
    return;
  }
  if (!item.result) return;
  const ReconcileResult& r = *item.result;
  for (const Flag& fl : r.flags) {
    if (fl.code == "off-division" || fl.code == "gross-mismatch") continue;  // audit's own
    // One finding per cause: a rating over is the audit's compliance-over (below).
    if (fl.code == kRatingOverFlag) continue;
    Finding f = make_finding(fl.code, fl.severity, fl.message,
                             "engine check (scaleproof reconcile; see its documentation)");
    f.ticket = fl.ticket;
    f.platform = fl.platform;
    if (fl.field) f.values.push_back(text_value("field", *fl.field));
    if (fl.needed) {
      // A reading needs a weight, a tape length a length (engine/result.h Flag).
      const std::string unit(fl.field ? to_string(r.units.length) : to_string(r.units.weight));
      f.values.push_back(number_value("would need", *fl.needed, unit, 1));
    }
    out.push_back(std::move(f));
  }
  // On a failed fit the ratings follow from the value the fit rejects: that is one cause, and
  // one finding (above). What the ratings would be without it (the engine's if_excluded
  // re-solve) is told as a warning, since it rests on that value being the error.
  const bool failed = r.fit && !r.fit->passed;
  const ReconcileResult* judged = &r;
  std::string prefix;
  if (failed) {
    if (!r.if_excluded || !r.if_excluded->result) return unsolved_rules(r, out);
    judged = r.if_excluded->result.get();
    const ExcludedMeasurement& ex = r.if_excluded->excluded;
    prefix = "If " +
             (ex.field ? "the tape length " + *ex.field
                       : "the " + ex.platform.value_or("") + " reading of ticket " +
                             ex.ticket.value_or("")) +
             " is the error (re-solved without it; not proven): ";
  }
  for (const ComplianceRow& row : judged->compliance) {
    if (row.status == ComplianceStatus::within) continue;
    const bool over = row.status == ComplianceStatus::over;
    const WeightUnit u = r.units.weight;
    Finding f = make_finding(
        over ? "compliance-over" : "compliance-undecided",
        over && !failed ? Severity::error : Severity::warning,
        prefix +
            (over
                 ? fmt::format("{}: {} ± {} exceeds the rating {} by {}, beyond the measurement "
                               "uncertainty.",
                               row.label, weight_text(row.value, u), weight_text(2 * row.u, u),
                               weight_text(row.limit, u), weight_text(-row.margin, u))
                 : fmt::format("{}: {} ± {} against the rating {} (margin {}): within reach of the "
                               "measurement uncertainty, so the weighing cannot show it is within.",
                               row.label, weight_text(row.value, u), weight_text(2 * row.u, u),
                               weight_text(row.limit, u), weight_text(row.margin, u))),
        "over: value - 2u > limit; undecided: neither that nor value + 2u <= limit (JCGM "
        "100:2008 §6.3, k = 2)");
    if (!judged->travel_pass.empty()) f.ticket = judged->travel_pass;
    f.values = {text_value("rating", row.rating), weight_value("limit", row.limit, u),
                weight_value("value", row.value, u), weight_value("2u", 2 * row.u, u),
                weight_value("margin", row.margin, u)};
    out.push_back(std::move(f));
  }
  unsolved_rules(r, out);
}

}  // namespace

void physics_rules(const AuditItem& item, const AuditOptions& o, const std::vector<TimedPass>& live,
                   std::vector<Finding>& out) {
  (void)o;
  engine_rules(item, out);
  // A reading the engine's measurement test named explains a total that moved: that pass's
  // error is already one finding (inconsistent-reading), so the drift rule weighs the others.
  std::vector<std::string> named;
  if (item.result)
    for (const Flag& fl : item.result->flags)
      if (fl.code == "inconsistent-reading" && fl.ticket) named.push_back(*fl.ticket);
  weight_drift_rule(item.session, live, named, out);
}

void timing_rules(const AuditItem& item, const AuditOptions& o, const std::vector<TimedPass>& live,
                  std::vector<Finding>& out) {
  (void)item;
  if (!o.claim_date) return;
  auto claim = parse_date(*o.claim_date);
  if (!claim) return;  // the CLI validates --claim-date
  std::optional<std::int64_t> first, last;
  for (const auto& tp : live) {
    if (!tp.time) continue;
    if (!first || tp.time->local_day < *first) first = tp.time->local_day;
    if (!last || tp.time->local_day > *last) last = tp.time->local_day;
  }
  if (!last) return;
  // Days between the date printed on the last ticket and the claim date. Exactly stale_days
  // is still fresh; one day more is stale.
  const std::int64_t age = *claim - *last;
  if (age > o.stale_days) {
    Finding f = make_finding(
        "stale-weighing", Severity::warning,
        fmt::format("The weighing ({}) is {} days before the claim date {}, more than {} days: "
                    "the load may have changed since.",
                    format_date(*last), age, *o.claim_date, o.stale_days),
        fmt::format("weighing at most {} days before the claim date (--stale-days)", o.stale_days));
    f.values = {text_value("weighed", format_date(*last)), text_value("claim date", *o.claim_date),
                number_value("age", static_cast<double>(age), "days", 0),
                number_value("limit", o.stale_days, "days", 0)};
    out.push_back(std::move(f));
  } else if (*first > *claim) {
    Finding f = make_finding(
        "weighed-after-claim", Severity::note,
        fmt::format("The weighing ({}) is after the claim date {}: it shows the rig as weighed "
                    "then, not as it was on the claim date.",
                    format_date(*first), *o.claim_date),
        "a weighing documents the rig on its own date only");
    f.values = {text_value("weighed", format_date(*first)),
                text_value("claim date", *o.claim_date)};
    out.push_back(std::move(f));
  }
}

}  // namespace sp::audit::detail
