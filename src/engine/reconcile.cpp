#include "engine/reconcile.h"

#include <fmt/format.h>

#include <charconv>
#include <cmath>

#include "core/error.h"
#include "engine/derived.h"
#include "engine/reconcile_parts.h"
#include "engine/verdict.h"

namespace sp {

std::optional<TravelConfig> travel_config(const RigFit& fit) {
  if (!fit.tensioned.empty())
    return TravelConfig{fit.tensioned.back(), static_cast<int>(fit.tensioned.size()) - 1};
  if (!fit.hitched.empty()) return TravelConfig{fit.hitched.back(), -1};
  return std::nullopt;
}

std::optional<Estimate> estimate(const RigFit& fit, const Linearized& q) {
  return fit.propagate(q.value, q.g);
}

std::optional<Estimate> fitted_load(const RigFit& fit, int slot, int platform) {
  return estimate(fit, hitched_load(fit, slot, platform));
}

std::string fmt_weight(double v, WeightUnit u) {
  return fmt::format("{:.0f} {}", v, to_string(u));
}

std::string fmt_estimate(const Estimate& e, std::string_view unit) {
  return fmt::format("{:.0f} ± {:.0f} {}", e.value, e.u, unit);
}

namespace {

std::optional<double> parse_number(const std::string& s) {
  // Plain decimal only ("4", "4.5", "-2"); anything else is a label, not a number.
  double v = 0;
  const char* b = s.data();
  const char* e = b + s.size();
  auto [ptr, ec] = std::from_chars(b, e, v);
  if (ec != std::errc() || ptr != e || !std::isfinite(v)) return std::nullopt;
  return v;
}

// A tensioned bar pushes the front of the tow vehicle down: its moment and FALR are >= 0 by
// construction (statics, engine/statics.h). A negative value within 2u of zero is a setting
// that barely loads the bars; one beyond it cannot be, so a number of the session is wrong.
// On a failed fit a negative value is first of all a symptom of the value the flags name.
std::optional<std::string> negative_note(const TensionedResult& t, bool fit_failed) {
  const bool m_neg = t.bar_moment.value < 0;
  const bool f_neg = t.falr && t.falr->value < 0;
  if (!m_neg && !f_neg) return std::nullopt;
  const std::string what = m_neg && f_neg ? "bar moment and FALR" : m_neg ? "bar moment" : "FALR";
  const bool near_zero =
      m_neg ? t.bar_moment.value + 2 * t.bar_moment.u >= 0 : t.falr->value + 2 * t.falr->u >= 0;
  if (fit_failed)
    return fmt::format(
        "ticket {}: the {} come{} out below zero, which tensioned bars cannot do (they press the "
        "steer axle down, never lift it): the fit failed, and the value the flags name is the "
        "likely cause.",
        t.ticket, what, m_neg && f_neg ? "" : "s");
  if (near_zero)
    return fmt::format(
        "ticket {}: the {} come{} out below zero but within the uncertainty of zero: the bars "
        "carry next to no load at this setting.",
        t.ticket, what, m_neg && f_neg ? "" : "s");
  return fmt::format(
      "ticket {}: the {} come{} out below zero, which tensioned bars cannot do (they press the "
      "steer axle down, never lift it): a reading or a tape length of this weighing is probably "
      "wrong; see the fit test and the flags.",
      t.ticket, what, m_neg && f_neg ? "" : "s");
}

// Which pass would make the slack tongue load solvable.
// A fifth wheel has no bars: "hitched" is the whole story.
std::string hitched_words(const Session& s) {
  return s.trailer.type == TrailerType::fifth_wheel ? "weigh the rig hitched"
                                                    : "weigh the rig hitched with the bars slack";
}

std::string tongue_advice(const RigFit& fit) {
  if (fit.unhitched.empty()) return "no unhitched pass; weigh the tow vehicle alone";
  if (fit.hitched.empty() && fit.tensioned.empty())
    return "no hitched pass; " + hitched_words(*fit.session);
  return "the passes do not determine it; " + hitched_words(*fit.session);
}

}  // namespace

ReconcileResult reconcile(const Session& session, const ReconcileOptions& options) {
  if (!(options.alpha > 0 && options.alpha < 1))
    throw usage_error(fmt::format("alpha: expected a significance level between 0 and 1, got {:g}",
                                  options.alpha));
  if (!(options.tape_u_inches > 0) || !std::isfinite(options.tape_u_inches))
    throw usage_error(
        fmt::format("tape uncertainty: expected a length > 0 in, got {:g}", options.tape_u_inches));
  const RigFit fit = fit_rig(session, options);
  const WeightUnit wu = session.units.weight;
  const double mf = moment_factor(wu, session.units.length);

  ReconcileResult out;
  out.units = session.units;
  out.moment_unit = std::string(moment_unit_name(wu));
  out.wheelbase = fit.wheelbase;

  // Tow vehicle alone.
  out.tow_steer = estimate(fit, parameter(fit, xS0));
  out.tow_drive = estimate(fit, parameter(fit, xD0));
  if (!out.tow_steer || !out.tow_drive)
    out.unsolved.push_back(
        "tow vehicle axle loads: no unhitched pass; weigh the tow vehicle alone");

  // Tongue load, trailer weight, tongue percent.
  out.tongue_load = estimate(fit, parameter(fit, xT));
  out.trailer_weight = estimate(fit, trailer_weight(fit));
  out.tongue_percent = estimate(fit, tongue_percent(fit));
  const std::string tongue_name =
      session.trailer.type == TrailerType::fifth_wheel ? "pin load" : "tongue load";
  if (!out.tongue_load) out.unsolved.push_back(tongue_name + ": " + tongue_advice(fit));
  if (!out.trailer_weight) {
    const bool no_trailer_reading = fit.hitched.empty() && fit.tensioned.empty();
    out.unsolved.push_back(
        std::string("trailer weight: ") +
        (no_trailer_reading ? "no hitched pass; " + hitched_words(session) : tongue_advice(fit)));
  }
  if (!out.tongue_percent && out.trailer_weight)
    out.unsolved.push_back("tongue percent: trailer weight is zero");

  // Lengths as back-solved.
  if (auto o = estimate(fit, parameter(fit, xO)))
    out.rear_axle_to_ball = LengthEstimate{o->value, o->u, session.tow_vehicle.rear_axle_to_ball};
  if (auto l = estimate(fit, parameter(fit, xL)))
    out.ball_to_axle = LengthEstimate{l->value, l->u, session.trailer.ball_to_axle};

  // Tensioned passes.
  if (fit.tensioned.empty() && session.trailer.type == TrailerType::conventional)
    out.unsolved.push_back(
        "bar moment and FALR: no tensioned pass; weigh the rig with the bars tensioned");
  out.tensioned.reserve(fit.tensioned.size());
  for (size_t k = 0; k < fit.tensioned.size(); ++k) {
    const Pass& p = session.passes[static_cast<size_t>(fit.tensioned[k])];
    const int slot = static_cast<int>(k);
    TensionedResult t;
    t.ticket = p.ticket;
    t.setting = p.setting;
    if (p.setting) t.setting_number = parse_number(*p.setting);
    auto m = estimate(fit, parameter(fit, xM0 + static_cast<Eigen::Index>(k), mf));
    auto s = fitted_load(fit, slot, 0), d = fitted_load(fit, slot, 1),
         tr = fitted_load(fit, slot, 2);
    if (!m || !s || !d || !tr) {
      out.unsolved.push_back(fmt::format(
          "bar moment of ticket {}: the passes do not determine it; weigh the rig hitched with "
          "the bars slack (and the trailer platform reading of every hitched pass)",
          p.ticket));
      continue;  // a TensionedResult needs a solved moment and loads
    }
    t.bar_moment = *m;
    t.steer = *s;
    t.drive = *d;
    t.trailer = *tr;
    t.ball_load = estimate(fit, ball_load_at(fit, slot));
    t.falr = estimate(fit, falr_at(fit, slot));
    if (!t.ball_load)
      out.unsolved.push_back(fmt::format("ball load of ticket {}: needs the tongue load ({})",
                                         p.ticket, tongue_advice(fit)));
    if (!t.falr)
      out.unsolved.push_back(
          fmt::format("FALR of ticket {}: needs the tow vehicle alone and the tongue load ({})",
                      p.ticket, tongue_advice(fit)));
    out.tensioned.push_back(std::move(t));
  }

  if (auto tc = travel_config(fit))
    out.travel_pass = session.passes[static_cast<size_t>(tc->pass)].ticket;

  const std::optional<ExcludedMeasurement> named = add_fit_results(fit, options, out);
  add_reading_flags(session, out);
  add_target(fit, out);
  add_load_flags(fit, options, out);
  const int ratings_unsolved = add_compliance(fit, out);
  add_rating_over_flags(out);
  const bool fit_failed = out.fit && !out.fit->passed;
  for (TensionedResult& t : out.tensioned) t.note = negative_note(t, fit_failed);
  // No advice offered as sound on a failed fit, nor on a what-if re-solve (RULES.md).
  if (out.target && (fit_failed || options.exclude)) out.target->provisional = true;
  VerdictDecision v = decide_verdict(out, ratings_unsolved);
  out.verdict = v.verdict;
  out.verdict_reason = std::move(v.reason);
  // Serial elimination (Narasimhan & Jordache 2000, ch. 7): one step, without the value the
  // measurement test names, reported beside the result and never in its place.
  if (fit_failed && named && !options.exclude) {
    ReconcileOptions again = options;
    again.exclude = named;
    out.if_excluded =
        IfExcluded{*named, std::make_shared<const ReconcileResult>(reconcile(session, again))};
  }
  return out;
}

}  // namespace sp
