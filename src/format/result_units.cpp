#include "format/result_units.h"

namespace sp {

namespace {

// 1 lbf·ft in N·m: lb -> kg (0.45359237), kgf -> N (g_n = 9.80665), ft -> m (0.3048), all exact
// (NIST SP 811 B.8); the product is 1.355 817 948... N·m, the factor SP 811 lists.
constexpr double kNewtonMetresPerLbfFt = kKgPerLb * kStandardGravity * kMetresPerFoot;

void scale(Estimate& e, double f) {
  e.value *= f;
  e.u *= f;
}
void scale(std::optional<Estimate>& e, double f) {
  if (e) scale(*e, f);
}
void scale(std::optional<LengthEstimate>& e, double f) {
  if (!e) return;
  e->value *= f;
  e->u *= f;
  e->entered *= f;
}

}  // namespace

std::optional<UnitSystem> parse_unit_system(std::string_view s) {
  if (s == "us") return UnitSystem::us;
  if (s == "metric") return UnitSystem::metric;
  return std::nullopt;
}

Units units_of(UnitSystem system) {
  if (system == UnitSystem::us) return Units{WeightUnit::lb, LengthUnit::in};
  return Units{WeightUnit::kg, LengthUnit::mm};
}

double convert_moment(double value, WeightUnit from, WeightUnit to) {
  if (from == to) return value;
  return from == WeightUnit::lb ? value * kNewtonMetresPerLbfFt : value / kNewtonMetresPerLbfFt;
}

void convert_rig_units(TowVehicle& tow, Trailer& trailer, const Units& from, const Units& to) {
  const double wf = weight_factor(from.weight, to.weight);
  const double lf = length_factor(from.length, to.length);
  auto w = [wf](std::optional<double>& v) {
    if (v) *v *= wf;
  };
  tow.wheelbase *= lf;
  tow.rear_axle_to_ball *= lf;
  w(tow.gvwr);
  w(tow.front_gawr);
  w(tow.rear_gawr);
  w(tow.gcwr);
  w(tow.hitch_tongue_rating);
  w(tow.hitch_trailer_rating);
  trailer.ball_to_axle *= lf;
  w(trailer.gvwr);
  w(trailer.axle_gawr);
}

Session convert_session_units(const Session& in, UnitSystem system) {
  const Units to = units_of(system);
  Session s = in;
  const double wf = weight_factor(in.units.weight, to.weight);
  const double lf = length_factor(in.units.length, to.length);
  auto w = [wf](std::optional<double>& v) {
    if (v) *v *= wf;
  };
  s.units = to;
  s.scale.division *= wf;
  w(s.scale.reading_uncertainty);
  w(s.scale.capacity);
  convert_rig_units(s.tow_vehicle, s.trailer, in.units, to);
  if (s.length_uncertainty) *s.length_uncertainty *= lf;
  for (Pass& p : s.passes) {
    p.steer *= wf;
    p.drive *= wf;
    w(p.trailer);
    w(p.gross);
  }
  return s;
}

ReconcileResult convert_result_units(const ReconcileResult& in, UnitSystem system) {
  const Units to = units_of(system);
  ReconcileResult r = in;
  const double wf = weight_factor(in.units.weight, to.weight);
  const double lf = length_factor(in.units.length, to.length);
  const double mf = convert_moment(1.0, in.units.weight, to.weight);
  r.units = to;
  r.moment_unit = std::string(moment_unit_name(to.weight));

  scale(r.tow_steer, wf);
  scale(r.tow_drive, wf);
  scale(r.tongue_load, wf);
  scale(r.trailer_weight, wf);
  scale(r.rear_axle_to_ball, lf);
  scale(r.ball_to_axle, lf);
  r.wheelbase *= lf;
  for (TensionedResult& t : r.tensioned) {
    scale(t.bar_moment, mf);
    scale(t.ball_load, wf);
    scale(t.steer, wf);
    scale(t.drive, wf);
    scale(t.trailer, wf);
  }
  if (r.target) {
    scale(r.target->bar_moment, mf);
    scale(r.target->steer, wf);
    scale(r.target->drive, wf);
    scale(r.target->trailer, wf);
    scale(r.target->ball_load, wf);
  }
  for (MeasurementFit& m : r.measurements) {
    const double f = m.field ? lf : wf;  // tape lengths carry `field`, readings a platform
    m.measured *= f;
    m.fitted *= f;
    m.sigma *= f;
  }
  for (Flag& fl : r.flags) {
    if (!fl.needed) continue;
    if (fl.field) {
      *fl.needed *= lf;
    } else if (fl.platform) {
      *fl.needed *= wf;
    }
  }
  for (ComplianceRow& c : r.compliance) {
    c.limit *= wf;
    c.value *= wf;
    c.u *= wf;
    c.margin *= wf;
  }
  if (r.if_excluded && r.if_excluded->result) {
    r.if_excluded->excluded.entered *= r.if_excluded->excluded.field ? lf : wf;
    r.if_excluded->result = std::make_shared<const ReconcileResult>(
        convert_result_units(*r.if_excluded->result, system));
  }
  return r;
}

}  // namespace sp
