// Result rendering (JSON and text) on hand-built engine results.
#include <doctest/doctest.h>

#include "format/result_json.h"
#include "format/result_text.h"
#include "format/session_json.h"

namespace {

using nlohmann::ordered_json;

sp::ReconcileResult solved_result() {
  sp::ReconcileResult r;
  r.units = {sp::WeightUnit::lb, sp::LengthUnit::in};
  r.moment_unit = "lbf·ft";
  r.tow_steer = sp::Estimate{4180.04, 6.2};
  r.tow_drive = sp::Estimate{3620.0, 6.2};
  r.tongue_load = sp::Estimate{1000.049, 11.26};
  r.trailer_weight = sp::Estimate{9100.0, 14.0};
  r.tongue_percent = sp::Estimate{10.98913, 0.123456};
  r.rear_axle_to_ball = sp::LengthEstimate{48.123456, 0.45678, 48};
  r.ball_to_axle = sp::LengthEstimate{190.0, 0.5, 190};
  r.wheelbase = 160;
  sp::TensionedResult t;
  t.ticket = "A-3";
  t.setting = "4";
  t.setting_number = 4;
  t.bar_moment = {2400.04, 30.0};
  t.ball_load = sp::Estimate{848.4, 9.0};
  t.falr = sp::Estimate{73.3333, 4.1};
  t.steer = {4100, 6};
  t.drive = {4540, 6};
  t.trailer = {8260, 7};
  r.tensioned.push_back(t);
  sp::TargetResult tg;
  tg.falr = 50;
  tg.falr_from_rig = true;
  tg.bar_moment = sp::Estimate{1596.6, 25};
  r.target = tg;  // no setting: only one numeric setting
  r.target->note = "one numeric setting weighed; two are needed to fit a setting";
  r.fit = sp::FitResult{3.2, 5, 0.669, 11.0705, 0.05, true};
  sp::Flag f;
  f.code = "off-division";
  f.severity = sp::Severity::warning;
  f.message = "A-3 drive reads 4545, not a multiple of 20 lb";
  f.ticket = "A-3";
  f.platform = "drive";
  r.flags.push_back(f);
  r.compliance.push_back({"front_gawr", "Steer axle vs front GAWR", 4800, 4100, 6, 700,
                          sp::ComplianceStatus::within});
  r.compliance.push_back({"gvwr", "Tow vehicle vs GVWR", 8650, 8640, 9, 10,
                          sp::ComplianceStatus::undecided});
  r.compliance.push_back({"hitch_tongue_rating", "Tongue load vs hitch rating", 900, 1000, 11, -100,
                          sp::ComplianceStatus::over});
  r.travel_pass = "A-3";
  return r;
}

std::vector<std::string> keys_of(const ordered_json& j) {
  std::vector<std::string> k;
  for (const auto& it : j.items()) k.push_back(it.key());
  return k;
}

const char* kSession = R"({"format":"scaleproof-session/1","units":{"weight":"lb","length":"in"},
 "scale":{"id":"ST-3","division":20},
 "tow_vehicle":{"label":"pickup","wheelbase":160,"rear_axle_to_ball":48},
 "trailer":{"label":"travel trailer","type":"conventional","ball_to_axle":190},
 "passes":[{"kind":"unhitched","ticket":"A-1","weighed_at":"2026-10-14T09:12:00-05:00","steer":4180,"drive":3620},
  {"kind":"hitched","ticket":"A-2","weighed_at":"2026-10-14T09:30:00-05:00","steer":3880,"drive":4920,"trailer":8100},
  {"kind":"tensioned","setting":"4","ticket":"A-3","weighed_at":"2026-10-14T09:45:00-05:00","steer":4100,"drive":4545,"trailer":8260,"voided":false}]})";

}  // namespace

TEST_CASE("result JSON has exactly the keys of issue #2, in order") {
  const ordered_json j = sp::result_to_json(solved_result());
  CHECK(keys_of(j) == std::vector<std::string>{"units", "moment_unit", "tongue_load",
                                               "trailer_weight", "tongue_percent",
                                               "rear_axle_to_ball", "ball_to_axle", "tensioned",
                                               "target", "fit", "flags", "compliance",
                                               "travel_pass", "unsolved"});
  CHECK(keys_of(j["tongue_load"]) == std::vector<std::string>{"value", "u"});
  CHECK(keys_of(j["ball_to_axle"]) == std::vector<std::string>{"value", "u", "entered"});
  CHECK(keys_of(j["tensioned"][0]) ==
        std::vector<std::string>{"ticket", "setting", "bar_moment", "ball_load", "falr", "steer",
                                 "drive", "trailer"});
  CHECK(keys_of(j["fit"]) ==
        std::vector<std::string>{"chi_square", "dof", "p_value", "critical", "passed"});
  CHECK(keys_of(j["flags"][0]) ==
        std::vector<std::string>{"code", "severity", "message", "ticket", "platform"});
  CHECK(keys_of(j["compliance"][0]) ==
        std::vector<std::string>{"rating", "label", "limit", "value", "u", "margin", "status"});
  const auto target_keys = keys_of(j["target"]);
  for (const char* k : {"falr", "bar_moment", "setting", "steer", "drive", "trailer"}) {
    CAPTURE(k);
    CHECK(std::find(target_keys.begin(), target_keys.end(), k) != target_keys.end());
  }
  CHECK(j["units"] == ordered_json({{"weight", "lb"}, {"length", "in"}}));
}

TEST_CASE("result JSON rounds per the documented policy and is deterministic") {
  const ordered_json j = sp::result_to_json(solved_result());
  CHECK(j["tongue_load"]["value"] == 1000.0);  // weights to 0.1 lb
  CHECK(j["tongue_load"]["u"] == 11.3);
  CHECK(j["tongue_percent"]["value"] == 10.99);  // percents to 0.01
  CHECK(j["rear_axle_to_ball"]["value"] == 48.12);  // inches to 0.01
  CHECK(j["rear_axle_to_ball"]["u"] == 0.46);
  CHECK(j["tensioned"][0]["bar_moment"]["value"] == 2400.0);  // moments to 0.1
  CHECK(j["fit"]["critical"] == 11.071);
  CHECK(j["fit"]["p_value"] == 0.669);
  CHECK(j["compliance"][2]["status"] == "over");
  CHECK(j["compliance"][1]["status"] == "undecided");
  CHECK(sp::result_to_json(solved_result()).dump() == j.dump());
  // No float noise in the bytes.
  CHECK(j.dump().find("0000000") == std::string::npos);
}

TEST_CASE("unsolved quantities are JSON null, never NaN") {
  sp::ReconcileResult r;
  r.moment_unit = "lbf·ft";
  r.unsolved = {"tongue load: no unhitched pass; weigh the tow vehicle alone"};
  const ordered_json j = sp::result_to_json(r);
  for (const char* k : {"tongue_load", "trailer_weight", "tongue_percent", "rear_axle_to_ball",
                        "ball_to_axle", "target", "fit", "travel_pass"}) {
    CAPTURE(k);
    CHECK(j[k].is_null());
  }
  CHECK(j["unsolved"].size() == 1);
  CHECK(j.dump().find("NaN") == std::string::npos);
  sp::TensionedResult t;
  t.ticket = "B-7";
  r.tensioned.push_back(t);
  const ordered_json j2 = sp::result_to_json(r);
  CHECK(j2["tensioned"][0]["ball_load"].is_null());
  CHECK(j2["tensioned"][0]["falr"].is_null());
  CHECK(j2["tensioned"][0]["setting"].is_null());
}

TEST_CASE("text summary: readings, ± meaning, fit words, flags, ratings, advice, caution") {
  const sp::Session s = sp::parse_session_json(kSession, "rig.json");
  const std::string text = sp::render_result_text(s, solved_result(), {"rig.json", false});
  CAPTURE(text);
  for (const char* want : {
           "Weigh session rig.json",
           "A-3         tensioned  4        2026-10-14T09:45:00-05:00",  // readings row
           "± is 2u: expanded uncertainty, k = 2, about 95 %",
           "Tongue load, bars slack       1000 ± 23 lb",  // 2u = 22.52 -> 23
           "(entered 48.0 in)",
           "Passed: the readings and tape lengths agree",
           "off-division [A-3 drive]",
           "What it means: a scale shows only multiples of its division",
           "Steer axle vs front GAWR",
           "undecided",
           "over",
           "Bar moment for the target: 1597 ± 50 lbf·ft",
           "one numeric setting weighed",
           "does not replace the vehicle and hitch makers' instructions, local law",
       }) {
    CAPTURE(want);
    CHECK(text.find(want) != std::string::npos);
  }
  CHECK(text.find("\033[") == std::string::npos);  // no colour unless asked
  CHECK(text.find("nan") == std::string::npos);
  const std::string coloured = sp::render_result_text(s, solved_result(), {"rig.json", true});
  CHECK(coloured.find("\033[31m") != std::string::npos);
}

TEST_CASE("text summary of an unsolved session says what is missing and prints no numbers for it") {
  const sp::Session s = sp::parse_session_json(kSession, "-");
  sp::ReconcileResult r;
  r.moment_unit = "lbf·ft";
  r.unsolved = {"tongue load: no unhitched pass; weigh the tow vehicle alone to fix it"};
  const std::string text = sp::render_result_text(s, r, {"-", false});
  CAPTURE(text);
  CHECK(text.find("<stdin>") != std::string::npos);
  CHECK(text.find("Tongue load, bars slack       not solved") != std::string::npos);
  CHECK(text.find("Not solved\n  - tongue load: no unhitched pass") != std::string::npos);
  CHECK(text.find("Fit test\n  Not run") != std::string::npos);
  CHECK(text.find("Recommendation\n  None") != std::string::npos);
}

TEST_CASE("every flag code of issue #2 has a plain-language explanation") {
  for (const char* code : {"inconsistent-reading", "geometry-mismatch", "off-division",
                           "gross-mismatch", "over-restored", "under-restored", "rear-unloaded",
                           "tongue-percent"}) {
    CAPTURE(code);
    CHECK(!sp::explain_flag(code).empty());
  }
  CHECK(sp::explain_flag("no-such-code").empty());
}
