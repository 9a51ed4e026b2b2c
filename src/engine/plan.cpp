#include "engine/plan.h"

#include <cmath>
#include <functional>

#include <fmt/format.h>

#include "core/error.h"

namespace sp {

namespace {

// FALR target when the vehicle maker gives none: 50 % (SAE J2807 -- from memory).
constexpr double kDefaultFalr = 50.0;
// The default sweep runs past full restoration so over-restoration shows in the table.
constexpr double kSweepPastFull = 1.25;
// Default sweep end is rounded up to this many moment units (lbf·ft or N·m): bar makers'
// charts and torque wrenches are read to about this step (common practice).
constexpr double kSweepRound = 100.0;
// Tongue share of trailer weight (common practice, no source): 10-15 % conventional,
// 15-25 % fifth wheel.
constexpr double kTongueLowConv = 10, kTongueHighConv = 15, kTongueLowFifth = 15,
                 kTongueHighFifth = 25;

std::string num(double v) { return fmt::format("{:.0f}", v); }

void require_positive(double v, const char* field, const Units& u, bool length) {
  if (!(v > 0) || !std::isfinite(v))
    throw data_error(fmt::format("{}: expected a {} greater than 0 {}, got {}", field,
                                 length ? "length" : "weight",
                                 length ? to_string(u.length) : to_string(u.weight), v));
}

RigParams params_of(const TowVehicle& tow, const Trailer& trailer, const PlanBaseline& b) {
  return RigParams{b.steer0, b.drive0, b.axles0, b.tongue, tow.rear_axle_to_ball,
                   trailer.ball_to_axle, tow.wheelbase};
}

void check_geometry(const TowVehicle& tow, const Trailer& trailer, const Units& u) {
  require_positive(tow.wheelbase, "tow_vehicle.wheelbase", u, true);
  require_positive(trailer.ball_to_axle, "trailer.ball_to_axle", u, true);
  if (trailer.type == TrailerType::conventional && !(tow.rear_axle_to_ball > 0))
    throw data_error(fmt::format(
        "tow_vehicle.rear_axle_to_ball: expected a length greater than 0 {} for a conventional "
        "trailer (the ball sits behind the drive axle), got {}",
        to_string(u.length), tow.rear_axle_to_ball));
}

}  // namespace

std::string_view to_string(Exceeded e) {
  switch (e) {
    case Exceeded::never: return "never";
    case Exceeded::always: return "always";
    case Exceeded::above: return "above";
    case Exceeded::below: return "below";
  }
  return "never";
}

PlanBaseline make_baseline(const TowVehicle& tow, const Trailer& trailer, const PlanLoads& in,
                           const Units& units) {
  check_geometry(tow, trailer, units);
  const std::string wu(to_string(units.weight));
  PlanBaseline b;
  if (in.unhitched && in.hitched) {
    b.steer0 = in.unhitched->steer;
    b.drive0 = in.unhitched->drive;
    b.axles0 = in.hitched->trailer;
    // Total weight is conserved: what the tow vehicle gained on hitching is the tongue load.
    b.tongue = in.hitched->steer + in.hitched->drive - in.unhitched->steer - in.unhitched->drive;
    b.source = "unhitched and hitched (bars slack) axle loads";
  } else if (in.hitched && (in.tongue || in.trailer_weight)) {
    b.tongue = in.tongue ? *in.tongue : *in.trailer_weight - in.hitched->trailer;
    // Undo the hitch with the forward model: the change hitching makes to a tow vehicle of
    // zero weight is exactly the change it makes to this one (the model is linear in S0, D0).
    RigParams p0{0, 0, 0, b.tongue, tow.rear_axle_to_ball, trailer.ball_to_axle, tow.wheelbase};
    const AxleLoads delta = predict_hitched(p0, 0);
    b.steer0 = in.hitched->steer - delta.steer;
    b.drive0 = in.hitched->drive - delta.drive;
    b.axles0 = in.hitched->trailer - delta.trailer;
    b.source = in.tongue ? "hitched (bars slack) axle loads and an estimated tongue load"
                         : "hitched (bars slack) axle loads and the trailer's own weight";
  } else if (in.unhitched && in.tongue && in.trailer_weight) {
    b.steer0 = in.unhitched->steer;
    b.drive0 = in.unhitched->drive;
    b.tongue = *in.tongue;
    b.axles0 = *in.trailer_weight - *in.tongue;
    b.source = "unhitched axle loads, an estimated tongue load and the trailer weight";
  } else {
    throw usage_error(
        "plan: not enough loads to start from; give one of: an unhitched and a hitched pass; "
        "a hitched pass and a tongue load (or the trailer weight); or an unhitched pass, a "
        "tongue load and the trailer weight");
  }
  if (!(b.tongue > 0))
    throw data_error(fmt::format("tongue load: expected more than 0 {}, got {} from the {}", wu,
                                 num(b.tongue), b.source));
  if (!(b.steer0 > 0) || !(b.drive0 > 0) || !(b.axles0 > 0))
    throw data_error(fmt::format(
        "baseline: the {} give steer {} {}, drive {} {}, trailer axles {} {}; every one must be "
        "more than 0 (check the loads and the geometry)",
        b.source, num(b.steer0), wu, num(b.drive0), wu, num(b.axles0), wu));
  return b;
}

PlanResult plan(const TowVehicle& tow, const Trailer& trailer, const PlanBaseline& baseline,
                const Units& units, const PlanOptions& options) {
  check_geometry(tow, trailer, units);
  if (options.steps < 1 || options.steps > 200)
    throw usage_error(fmt::format("plan: --steps: expected 1 to 200, got {}", options.steps));
  PlanResult r;
  r.units = units;
  r.moment_unit = std::string(moment_unit_name(units.weight));
  r.trailer_type = trailer.type;
  r.wheelbase = tow.wheelbase;
  r.rear_axle_to_ball = tow.rear_axle_to_ball;
  r.ball_to_axle = trailer.ball_to_axle;
  r.baseline = baseline;
  r.trailer_weight = baseline.tongue + baseline.axles0;
  r.tongue_percent = 100.0 * baseline.tongue / r.trailer_weight;
  r.falr_from_rig = !options.falr_target && tow.falr_target;
  r.falr_target = options.falr_target ? *options.falr_target
                                      : tow.falr_target.value_or(kDefaultFalr);
  if (!(r.falr_target >= 0 && r.falr_target <= 100))
    throw usage_error(fmt::format("plan: --falr: expected 0 to 100 %, got {}", r.falr_target));

  const RigParams p = params_of(tow, trailer, baseline);
  // Bar moments are shown in lbf·ft / N·m; the model takes weight·length.
  const double mf = moment_factor(units.weight, units.length);
  const bool takes_bars = tow.rear_axle_to_ball > 0 && trailer.type == TrailerType::conventional;

  auto row_at = [&](double m) {
    PlanRow row;
    row.bar_moment = m;
    row.loads = predict_hitched(p, m / mf);
    row.ball_load = ball_load(p, m / mf);
    if (takes_bars) row.falr = falr_percent(p, m / mf);
    row.tow_total = row.loads.steer + row.loads.drive;
    row.combined = row.tow_total + row.loads.trailer;
    return row;
  };

  double max_m = 0;
  if (takes_bars) {
    r.full_restoration = moment_for_falr(p, 100.0) * mf;
    r.target_moment = moment_for_falr(p, r.falr_target) * mf;
    max_m = options.max_moment
                ? *options.max_moment
                : std::ceil(kSweepPastFull * *r.full_restoration / kSweepRound) * kSweepRound;
    if (!(max_m > 0))
      throw usage_error(fmt::format("plan: --max-moment: expected more than 0 {}, got {}",
                                    r.moment_unit, max_m));
  } else {
    r.notes.push_back(
        "A fifth-wheel or gooseneck coupling sits over or ahead of the drive axle and takes no "
        "weight-distributing bars: the table shows the rig as hitched.");
  }
  const int steps = takes_bars ? options.steps : 0;
  for (int k = 0; k <= steps; ++k)
    r.rows.push_back(row_at(steps == 0 ? 0.0 : max_m * k / steps));
  if (r.target_moment) r.at_target = row_at(*r.target_moment);

  struct Spec {
    const char* key;
    const char* label;
    std::optional<double> limit;
    std::function<double(const PlanRow&)> value;
  };
  const double tongue = baseline.tongue, tw = r.trailer_weight;
  const Spec specs[] = {
      {"front_gawr", "Steer axle vs front GAWR", tow.front_gawr,
       [](const PlanRow& w) { return w.loads.steer; }},
      {"rear_gawr", "Drive axle vs rear GAWR", tow.rear_gawr,
       [](const PlanRow& w) { return w.loads.drive; }},
      {"gvwr", "Tow vehicle vs GVWR", tow.gvwr, [](const PlanRow& w) { return w.tow_total; }},
      {"gcwr", "Whole rig vs GCWR", tow.gcwr, [](const PlanRow& w) { return w.combined; }},
      {"trailer_gvwr", "Trailer weight vs trailer GVWR", trailer.gvwr,
       [tw](const PlanRow&) { return tw; }},
      {"trailer_axle_gawr", "Trailer axles vs trailer axle GAWR", trailer.axle_gawr,
       [](const PlanRow& w) { return w.loads.trailer; }},
      {"hitch_tongue_rating", "Tongue load (bars slack) vs hitch tongue rating",
       tow.hitch_tongue_rating, [tongue](const PlanRow&) { return tongue; }},
      {"hitch_trailer_rating", "Trailer weight vs hitch trailer rating",
       tow.hitch_trailer_rating, [tw](const PlanRow&) { return tw; }},
  };
  // Every load is linear in the bar moment (engine/statics.h), so two evaluations give the
  // line exactly and its crossing with the limit is where the rating starts or stops being
  // exceeded.
  const double ref = takes_bars ? (max_m > 0 ? max_m : 1.0) : 1.0;
  const PlanRow zero = row_at(0), far = row_at(takes_bars ? ref : 0);
  for (const Spec& s : specs) {
    if (!s.limit) continue;
    PlanRating pr;
    pr.rating = s.key;
    pr.label = s.label;
    pr.limit = *s.limit;
    pr.at_zero = s.value(zero);
    pr.slope = takes_bars ? (s.value(far) - pr.at_zero) / ref : 0.0;
    const bool over0 = pr.at_zero > pr.limit;
    // A change under a millionth of the limit over the whole sweep is rounding, not a trend.
    if (std::fabs(pr.slope * ref) <= 1e-6 * std::fabs(pr.limit)) {
      pr.slope = 0;
      pr.exceeded = over0 ? Exceeded::always : Exceeded::never;
    } else {
      // The crossing, kept even when it lies beyond the table; the classification is for the
      // table's range of moments [0, max].
      const double cross = (pr.limit - pr.at_zero) / pr.slope;
      if (cross > 0) pr.boundary = cross;
      const bool inside = cross > 0 && cross < max_m;
      if (pr.slope > 0) {
        pr.exceeded = over0 ? Exceeded::always : (inside ? Exceeded::above : Exceeded::never);
      } else {
        pr.exceeded = !over0 ? Exceeded::never : (inside ? Exceeded::below : Exceeded::always);
      }
    }
    for (PlanRow& row : r.rows)
      if (s.value(row) > pr.limit) row.over.push_back(s.key);
    if (r.at_target && s.value(*r.at_target) > pr.limit) r.at_target->over.push_back(s.key);
    r.ratings.push_back(pr);
  }

  const bool fifth = trailer.type == TrailerType::fifth_wheel;
  const double lo = fifth ? kTongueLowFifth : kTongueLowConv;
  const double hi = fifth ? kTongueHighFifth : kTongueHighConv;
  if (r.tongue_percent < lo || r.tongue_percent > hi)
    r.notes.push_back(fmt::format(
        "The tongue load is {:.1f} % of the trailer weight; {:.0f}-{:.0f} % is usual for a {} "
        "trailer (common practice). Check how the trailer is loaded.",
        r.tongue_percent, lo, hi, fifth ? "fifth-wheel" : "conventional"));
  if (takes_bars && !r.falr_from_rig && !options.falr_target)
    r.notes.push_back(
        "No FALR target was given: 50 % is used, the figure commonly applied when the vehicle "
        "maker gives none. Use the maker's figure when there is one.");
  if (r.at_target && !r.at_target->over.empty())
    r.notes.push_back("At the target moment some ratings are exceeded: bars cannot fix an "
                      "overload; reduce or move the load.");
  r.notes.push_back(
      "These are predictions from the statics, without uncertainty: weigh the rig at the chosen "
      "setting to confirm (scaleproof reconcile).");
  return r;
}

}  // namespace sp
