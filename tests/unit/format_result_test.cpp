// Result rendering (JSON and text) on hand-built engine results.
#include <doctest/doctest.h>

#include <cmath>
#include <random>

#include "engine/reconcile.h"
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

TEST_CASE("result JSON has exactly the keys of issues #2 and #12, in order") {
  const ordered_json j = sp::result_to_json(solved_result());
  // Issue #12: the verdict leads; the tow-vehicle-alone loads and what u means are inside.
  CHECK(keys_of(j) == std::vector<std::string>{"verdict", "verdict_reason", "units",
                                               "moment_unit", "uncertainty", "tow_steer",
                                               "tow_drive", "tongue_load",
                                               "trailer_weight", "tongue_percent",
                                               "rear_axle_to_ball", "ball_to_axle", "tensioned",
                                               "target", "fit", "flags", "compliance",
                                               "travel_pass", "unsolved", "if_excluded"});
  CHECK(j["verdict"] == "not-proven");  // a hand-built result without a verdict decided
  CHECK(j["if_excluded"].is_null());
  CHECK(j["target"]["provisional"] == false);
  CHECK(j["target"]["whole_step"].is_null());
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

TEST_CASE("append_result_json writes exactly the bytes of result_to_json().dump()") {
  // The bulk writer must not drift from the JSON tree: signed reports embed result_to_json.
  std::vector<sp::ReconcileResult> cases;
  cases.push_back(solved_result());
  cases.push_back(sp::reconcile(sp::parse_session_json(kSession, "rig.json")));
  sp::ReconcileResult empty;  // nothing solved: nulls and empty arrays
  empty.moment_unit = "lbf·ft";
  empty.unsolved = {"tongue load: no unhitched pass", "trailer weight: no hitched pass"};
  cases.push_back(empty);
  sp::ReconcileResult odd = solved_result();  // strings nlohmann must escape or reject-test
  odd.units = {sp::WeightUnit::kg, sp::LengthUnit::mm};
  odd.moment_unit = "N·m";
  odd.travel_pass = "Q\"1\\2\t3\n\x01\x1f\x7f é ± 𝄞";
  odd.tensioned[0].ticket = odd.travel_pass;
  odd.tensioned[0].setting.reset();
  odd.tensioned[0].ball_load.reset();
  odd.tensioned[0].bar_moment = {-0.04, 1e-7};  // rounds to 0 (no "-0")
  odd.tongue_load = sp::Estimate{1e17, 123456789.123};  // nlohmann's exponent form
  odd.tongue_percent = sp::Estimate{std::nan(""), INFINITY};  // never from the engine: null
  odd.target->setting = sp::Estimate{3.456, 0.0049};
  odd.target->note.reset();
  odd.fit = sp::FitResult{123456.78901, 0, 1.234567e-12, 0, 0.05, false};
  sp::Flag g;
  g.code = "geometry-mismatch";
  g.severity = sp::Severity::error;
  g.message = "ball_to_axle: the tape length 190 in does not fit (± 2 in)";
  g.field = "ball_to_axle";
  g.needed = 201.456;
  odd.flags.push_back(g);
  sp::Flag n = g;
  n.code = "inconsistent-reading";
  n.field.reset();
  n.ticket = "A-3";
  n.platform = "steer";
  n.needed = 4123.456;
  odd.flags.push_back(n);
  odd.unsolved = {"", "x"};
  cases.push_back(odd);
  // Issue #12 shapes: verdict, notes, rating-over, whole steps, provisional, if_excluded.
  sp::ReconcileResult v = solved_result();
  v.verdict = sp::Verdict::over;
  v.verdict_reason = "Tongue load vs hitch rating (1000 ± 22 lb against 900 lb) is over.";
  v.tensioned[0].note = "ticket A-3: the bar moment comes out below zero";
  v.target->provisional = true;
  v.target->whole_step = sp::WholeStepSetting{4, 5, 4};
  sp::Flag over;
  over.code = sp::kRatingOverFlag;
  over.severity = sp::Severity::error;
  over.message = "over";
  over.ticket = "A-3";
  over.rating = "hitch_tongue_rating";
  v.flags.push_back(over);
  cases.push_back(v);
  for (const bool field : {false, true}) {
    sp::ReconcileResult w = v;
    sp::ExcludedMeasurement ex;
    if (field) {
      ex.field = "ball_to_axle";
      ex.entered = 156.04;
    } else {
      ex.ticket = "A-3";
      ex.platform = "drive";
      ex.entered = 4545;
    }
    w.if_excluded = sp::IfExcluded{ex, std::make_shared<const sp::ReconcileResult>(odd)};
    cases.push_back(w);
  }
  cases.push_back(sp::reconcile(sp::parse_session_json(kSession, "rig.json")));
  for (const sp::LengthUnit lu : {sp::LengthUnit::in, sp::LengthUnit::ft, sp::LengthUnit::cm,
                                  sp::LengthUnit::m}) {
    sp::ReconcileResult r = solved_result();
    r.units.length = lu;
    cases.push_back(r);
  }
  for (size_t i = 0; i < cases.size(); ++i) {
    CAPTURE(i);
    std::string out = "prefix:";
    sp::append_result_json(out, cases[i]);
    CHECK(out == "prefix:" + sp::result_to_json(cases[i]).dump());
  }
  // Not UTF-8: both refuse alike.
  sp::ReconcileResult bad = solved_result();
  bad.travel_pass = "A-\xff";
  std::string out;
  CHECK_THROWS_AS(sp::append_result_json(out, bad), nlohmann::json::type_error);
  CHECK_THROWS_AS(sp::result_to_json(bad).dump(), nlohmann::json::type_error);
}

TEST_CASE("append_result_json prints rounded numbers exactly as nlohmann does, at every magnitude") {
  // The writer prints most rounded numbers without Grisu2 (result_json.cpp explains why the
  // digits are the same); this sweeps magnitudes, grid-adjacent values, powers of two and
  // every unit's decimals against nlohmann's own printer (common practice: differential test).
  std::mt19937_64 rng(20261201);
  std::uniform_real_distribution<double> mag(-5, 13), u01(0, 1);
  const sp::LengthUnit lengths[] = {sp::LengthUnit::in, sp::LengthUnit::ft, sp::LengthUnit::mm,
                                    sp::LengthUnit::cm, sp::LengthUnit::m};
  auto draw = [&](int i) {
    switch (i % 4) {
      case 0: return std::pow(10.0, mag(rng)) * (u01(rng) < 0.5 ? -1 : 1);
      case 1: return std::floor(u01(rng) * 200000) / 20.0 + (u01(rng) - 0.5) * 1e-9;
      case 2: return (std::floor(u01(rng) * 2e6) - 1e6) / 1000.0;
      default: return std::ldexp(1.0, static_cast<int>(u01(rng) * 70) - 25);
    }
  };
  for (int i = 0; i < 3000; ++i) {
    sp::ReconcileResult r = solved_result();
    r.units.length = lengths[i % 5];
    r.tongue_load = sp::Estimate{draw(i), draw(i + 1)};
    r.tongue_percent = sp::Estimate{draw(i + 2), draw(i + 3)};
    r.rear_axle_to_ball = sp::LengthEstimate{draw(i), draw(i + 1), draw(i + 2)};
    r.tensioned[0].bar_moment = {draw(i + 3), draw(i)};
    r.fit->chi_square = draw(i + 1);
    r.fit->critical = draw(i + 2);
    r.compliance[0].margin = draw(i + 3);
    std::string out;
    sp::append_result_json(out, r);
    const std::string want = sp::result_to_json(r).dump();
    CAPTURE(i);
    if (out != want) CHECK(out == want);  // one line per mismatch, not 3000 passing checks
  }
}
