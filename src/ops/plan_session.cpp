#include "ops/plan_session.h"

#include "core/error.h"
#include "engine/reconcile.h"

namespace sp::ops {

// The loads with the bars slack from a session: the reconciled values when the engine can
// solve them (they use every pass), else the first unhitched and hitched readings as keyed.
// A passed fit also gives the back-solved lengths, so the plan's target moment is the one
// `reconcile` recommends (the same model on the same numbers); `labels` gets the verdict.
PlanLoads loads_from_session(const Session& s, std::vector<std::string>& notes, TowVehicle& tow,
                             Trailer& trailer, PlanLabels& labels) {
  PlanLoads l;
  try {
    const ReconcileResult r = reconcile(s);
    labels.weighed = true;
    labels.verdict = r.verdict;
    labels.verdict_reason = r.verdict_reason;
    if (r.tow_steer && r.tow_drive && r.tongue_load && r.trailer_weight) {
      const double t = r.tongue_load->value;
      l.unhitched = AxleLoads{r.tow_steer->value, r.tow_drive->value, 0};
      l.tongue = t;
      l.trailer_weight = r.trailer_weight->value;
      if (r.fit && !r.fit->passed) {
        notes.push_back(
            "The session's readings fail their fit test (see scaleproof reconcile): "
            "fix the flagged reading or length before relying on this plan.");
      } else {
        if (r.rear_axle_to_ball) tow.rear_axle_to_ball = r.rear_axle_to_ball->value;
        if (r.ball_to_axle) trailer.ball_to_axle = r.ball_to_axle->value;
      }
      return l;
    }
  } catch (const Error&) {
    // Fall through to the raw readings; parse errors were already raised by the reader.
  }
  for (const Pass& p : s.passes) {
    if (p.voided) continue;
    if (p.kind == PassKind::unhitched && !l.unhitched) l.unhitched = AxleLoads{p.steer, p.drive, 0};
    if (p.kind == PassKind::hitched && !l.hitched)
      l.hitched = AxleLoads{p.steer, p.drive, p.trailer.value_or(0)};
  }
  return l;
}

SessionPlan plan_of_session(const Session& s, const std::string& source,
                            const PlanOptions& options) {
  SessionPlan out;
  TowVehicle tow = s.tow_vehicle;
  Trailer trailer = s.trailer;
  std::vector<std::string> notes;
  const PlanLoads loads = loads_from_session(s, notes, tow, trailer, out.labels);
  const bool reconciled = loads.unhitched && loads.tongue && loads.trailer_weight && !loads.hitched;
  PlanBaseline base = make_baseline(tow, trailer, loads, s.units);
  if (reconciled) base.source = "the passes of " + source + ", reconciled";
  out.plan = plan(tow, trailer, base, s.units, options);
  out.plan.notes.insert(out.plan.notes.begin(), notes.begin(), notes.end());
  out.labels.tow = tow.label;
  out.labels.trailer = trailer.label;
  return out;
}

}  // namespace sp::ops
