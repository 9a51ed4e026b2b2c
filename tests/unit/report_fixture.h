// Hand-built session and results for the report tests, so they run without the engine.
// Invented rig and station. Values follow the statics of engine/reconcile.h worked by hand:
// S0 = 4180, D0 = 3620, hitched steer 3880 -> T = 300·160/48 = 1000 lb; trailer axles 8100;
// setting 2 adds 80 lb to the trailer axles -> M = 80·190 lb·in = 1266.7 lbf·ft.
#pragma once
#include <nlohmann/json.hpp>

#include "core/model.h"
#include "engine/result.h"

namespace sp::test {

inline Session fixture_session() {
  Session s;
  s.station = "Larkspur Flats Public Scale";
  s.operator_name = "Ines Brodowska-Quill";
  s.owner = "Omar Pettigrew-Saar";
  s.scale.id = "LF-1";
  s.scale.name = "Larkspur three-platform scale";
  s.scale.division = 20;
  s.scale.accuracy_class = "IIIL";
  s.scale.last_inspected = "2026-03-30";
  s.tow_vehicle.label = "crew-cab pickup, long bed";
  s.tow_vehicle.wheelbase = 160;
  s.tow_vehicle.rear_axle_to_ball = 48;
  s.tow_vehicle.front_gawr = 4800;
  s.trailer.label = "26 ft tandem-axle travel trailer";
  s.trailer.ball_to_axle = 190;
  auto pass = [](PassKind k, const char* ticket, double st, double dr, std::optional<double> tr) {
    Pass p;
    p.kind = k;
    p.ticket = ticket;
    p.weighed_at = "2026-10-14T09:12:00-05:00";
    p.steer = st;
    p.drive = dr;
    p.trailer = tr;
    p.gross = st + dr + tr.value_or(0);
    return p;
  };
  s.passes.push_back(pass(PassKind::unhitched, "LF-70101", 4180, 3620, std::nullopt));
  s.passes.push_back(pass(PassKind::hitched, "LF-70102", 3880, 4920, 8100));
  Pass t = pass(PassKind::tensioned, "LF-70103", 4000, 4740, 8180);
  t.setting = "2";
  s.passes.push_back(t);
  Pass v = pass(PassKind::tensioned, "LF-70104", 4400, 4740, 8180);
  v.setting = "3";
  v.voided = true;
  v.void_reason = "truck not fully on the steer platform";
  s.passes.push_back(v);
  return s;
}

inline ReconcileResult fixture_result() {
  ReconcileResult r;
  r.moment_unit = "lbf·ft";
  r.tow_steer = Estimate{4180, 6};
  r.tow_drive = Estimate{3620, 6};
  r.tongue_load = Estimate{1000, 15};
  r.trailer_weight = Estimate{9100, 12};
  r.tongue_percent = Estimate{10.99, 0.17};
  r.rear_axle_to_ball = LengthEstimate{48.0, 0.4, 48};
  r.ball_to_axle = LengthEstimate{190.0, 0.5, 190};
  r.wheelbase = 160;
  TensionedResult tr;
  tr.ticket = "LF-70103";
  tr.setting = "2";
  tr.setting_number = 2;
  tr.bar_moment = Estimate{1266.7, 40};
  tr.ball_load = Estimate{920, 16};
  tr.falr = Estimate{40.0, 3.0};
  tr.steer = Estimate{4000, 6};
  tr.drive = Estimate{4740, 6};
  tr.trailer = Estimate{8180, 6};
  r.tensioned.push_back(tr);
  TargetResult tg;
  tg.falr = 50;
  tg.falr_from_rig = false;
  tg.bar_moment = Estimate{1583, 50};
  tg.steer = Estimate{4030, 7};
  tg.drive = Estimate{4690, 7};
  tg.trailer = Estimate{8200, 7};
  tg.ball_load = Estimate{900, 16};
  r.target = tg;
  r.fit = FitResult{1.2, 1, 0.27, 3.841, 0.05, true};
  r.compliance.push_back({"front_gawr", "Steer axle vs front GAWR", 4800, 4000, 6, 800, ComplianceStatus::within});
  r.flags.push_back({"under-restored", Severity::warning,
                     "Setting 2 restores 40 % of the steer-axle load; the target is 50 %.", "LF-70103",
                     std::nullopt, std::nullopt, std::nullopt, std::nullopt});
  r.travel_pass = "LF-70103";
  return r;
}

// Stand-ins for session_to_json / result_to_json: any JSON will do for signing tests.
inline nlohmann::json fixture_session_json() {
  return {{"format", "scaleproof-session/1"}, {"tickets", {"LF-70101", "LF-70102", "LF-70103", "LF-70104"}}};
}
inline nlohmann::json fixture_results_json() {
  return {{"tongue_load", {{"value", 1000.0}, {"u", 15.0}}}, {"tongue_percent", {{"value", 10.99}, {"u", 0.17}}}};
}

}  // namespace sp::test
