// `scaleproof reconcile --json`: one object per session. Key order is fixed (ordered_json);
// numbers are rounded per format/rounding.h (one decimal more than the text summary), so the
// output is deterministic and free of float noise. Unsolved quantities are null.
//
//   units {weight, length}, moment_unit,
//   tongue_load, trailer_weight, tongue_percent          {value, u} | null
//   rear_axle_to_ball, ball_to_axle                      {value, u, entered} | null
//   tensioned [{ticket, setting, bar_moment, ball_load, falr, steer, drive, trailer}]
//   target {falr, falr_from_rig, bar_moment, setting, steer, drive, trailer, ball_load, note}|null
//   fit {chi_square, dof, p_value, critical, passed} | null
//   flags [{code, severity, message, [ticket], [platform], [field], [needed]}]
//   compliance [{rating, label, limit, value, u, margin, status}]
//   travel_pass, unsolved [text]
// Every u is a standard uncertainty (k = 1).
#include "format/result_json.h"

#include <cmath>

#include "format/rounding.h"

namespace sp {

namespace {

using nlohmann::ordered_json;
using format::kJsonExtraDecimals;
using format::round_to;

struct Places {
  int weight, length, moment, percent;
};

Places places_for(const Units& u) {
  return {format::weight_decimals(u.weight) + kJsonExtraDecimals,
          format::length_decimals(u.length) + kJsonExtraDecimals,
          format::kMomentDecimals + kJsonExtraDecimals,
          format::kPercentDecimals + kJsonExtraDecimals};
}

ordered_json est(const Estimate& e, int places) {
  return {{"value", round_to(e.value, places)}, {"u", round_to(e.u, places)}};
}

ordered_json est(const std::optional<Estimate>& e, int places) {
  return e ? est(*e, places) : ordered_json(nullptr);
}

ordered_json length(const std::optional<LengthEstimate>& e, int places) {
  if (!e) return nullptr;
  return {{"value", round_to(e->value, places)},
          {"u", round_to(e->u, places)},
          {"entered", round_to(e->entered, places)}};
}

// p-values span many decades; keep four significant digits instead of fixed decimals.
double significant(double v, int digits) {
  if (v == 0 || !std::isfinite(v)) return 0;
  const int exp10 = static_cast<int>(std::floor(std::log10(std::fabs(v))));
  return round_to(v, digits - 1 - exp10);
}

ordered_json target_json(const TargetResult& t, const Places& p) {
  ordered_json j;
  j["falr"] = round_to(t.falr, p.percent);
  j["falr_from_rig"] = t.falr_from_rig;
  j["bar_moment"] = est(t.bar_moment, p.moment);
  // Settings are the owner's own scale (links, turns): two decimals are plenty.
  j["setting"] = est(t.setting, 2);
  j["steer"] = est(t.steer, p.weight);
  j["drive"] = est(t.drive, p.weight);
  j["trailer"] = est(t.trailer, p.weight);
  j["ball_load"] = est(t.ball_load, p.weight);
  j["note"] = t.note ? ordered_json(*t.note) : ordered_json(nullptr);
  return j;
}

ordered_json flag_json(const Flag& f, const Places& p) {
  ordered_json j;
  j["code"] = f.code;
  j["severity"] = to_string(f.severity);
  j["message"] = f.message;
  if (f.ticket) j["ticket"] = *f.ticket;
  if (f.platform) j["platform"] = *f.platform;
  if (f.field) j["field"] = *f.field;
  if (f.needed) j["needed"] = round_to(*f.needed, f.field ? p.length : p.weight);
  return j;
}

}  // namespace

ordered_json result_to_json(const ReconcileResult& r) {
  const Places p = places_for(r.units);
  ordered_json j;
  j["units"] = {{"weight", to_string(r.units.weight)}, {"length", to_string(r.units.length)}};
  j["moment_unit"] = r.moment_unit;
  j["tongue_load"] = est(r.tongue_load, p.weight);
  j["trailer_weight"] = est(r.trailer_weight, p.weight);
  j["tongue_percent"] = est(r.tongue_percent, p.percent);
  j["rear_axle_to_ball"] = length(r.rear_axle_to_ball, p.length);
  j["ball_to_axle"] = length(r.ball_to_axle, p.length);
  ordered_json tensioned = ordered_json::array();
  for (const TensionedResult& t : r.tensioned) {
    ordered_json tj;
    tj["ticket"] = t.ticket;
    tj["setting"] = t.setting ? ordered_json(*t.setting) : ordered_json(nullptr);
    tj["bar_moment"] = est(t.bar_moment, p.moment);
    tj["ball_load"] = est(t.ball_load, p.weight);
    tj["falr"] = est(t.falr, p.percent);
    tj["steer"] = est(t.steer, p.weight);
    tj["drive"] = est(t.drive, p.weight);
    tj["trailer"] = est(t.trailer, p.weight);
    tensioned.push_back(tj);
  }
  j["tensioned"] = tensioned;
  j["target"] = r.target ? target_json(*r.target, p) : ordered_json(nullptr);
  if (r.fit) {
    j["fit"] = {{"chi_square", round_to(r.fit->chi_square, 3)},
                {"dof", r.fit->dof},
                {"p_value", significant(r.fit->p_value, 4)},
                {"critical", round_to(r.fit->critical, 3)},
                {"passed", r.fit->passed}};
  } else {
    j["fit"] = nullptr;
  }
  ordered_json flags = ordered_json::array();
  for (const Flag& f : r.flags) flags.push_back(flag_json(f, p));
  j["flags"] = flags;
  ordered_json compliance = ordered_json::array();
  for (const ComplianceRow& c : r.compliance) {
    compliance.push_back({{"rating", c.rating},
                          {"label", c.label},
                          {"limit", round_to(c.limit, p.weight)},
                          {"value", round_to(c.value, p.weight)},
                          {"u", round_to(c.u, p.weight)},
                          {"margin", round_to(c.margin, p.weight)},
                          {"status", to_string(c.status)}});
  }
  j["compliance"] = compliance;
  j["travel_pass"] = r.travel_pass.empty() ? ordered_json(nullptr) : ordered_json(r.travel_pass);
  j["unsolved"] = r.unsolved;
  return j;
}

}  // namespace sp
