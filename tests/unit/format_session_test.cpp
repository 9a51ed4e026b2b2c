// Session file reader/writer: every bad-input class gets its JSON path and what was expected;
// good files round-trip exactly.
#include <doctest/doctest.h>

#include <filesystem>
#include <fstream>
#include <functional>
#include <sstream>

#include "core/error.h"
#include "format/iso8601.h"
#include "format/json_strict.h"
#include "format/session_json.h"

namespace {

using nlohmann::ordered_json;

// A small valid session (readings from the statics in shared references.md, rounded to 20 lb).
const char* kBase = R"({
  "format": "scaleproof-session/1",
  "units": {"weight": "lb", "length": "in"},
  "scale": {"id": "ST-3", "division": 20},
  "tow_vehicle": {"label": "pickup", "wheelbase": 160, "rear_axle_to_ball": 48, "falr_target": 50},
  "trailer": {"label": "travel trailer", "type": "conventional", "ball_to_axle": 190},
  "passes": [
    {"kind": "unhitched", "ticket": "A-1", "weighed_at": "2026-10-14T09:12:00-05:00",
     "steer": 4180, "drive": 3620},
    {"kind": "hitched", "ticket": "A-2", "weighed_at": "2026-10-14T09:30:00-05:00",
     "steer": 3880, "drive": 4920, "trailer": 8100},
    {"kind": "tensioned", "setting": "4", "ticket": "A-3", "weighed_at": "2026-10-14T09:45:00-05:00",
     "steer": 4000, "drive": 4740, "trailer": 8180}
  ]
})";

std::string parse_error_of(const std::string& text) {
  try {
    sp::parse_session_json(text, "rig.json");
  } catch (const sp::Error& e) {
    CHECK(e.code() == sp::ExitCode::data_error);
    return e.what();
  }
  return "(no error)";
}

std::string read_file(const std::filesystem::path& p) {
  std::ifstream f(p, std::ios::binary);
  std::ostringstream ss;
  ss << f.rdbuf();
  return ss.str();
}

}  // namespace

TEST_CASE("the base fixture parses") {
  const sp::Session s = sp::parse_session_json(kBase, "rig.json");
  CHECK(s.passes.size() == 3);
  CHECK(s.tow_vehicle.wheelbase == 160);
  CHECK(s.passes[2].setting == std::optional<std::string>("4"));
  CHECK(s.scale.accuracy_class == "IIIL");  // default when absent
}

TEST_CASE("bad session input names the JSON path and what was expected") {
  struct Case {
    const char* name;
    std::function<void(ordered_json&)> mutate;
    const char* expected;
  };
  const std::vector<Case> cases = {
      {"negative weight", [](ordered_json& j) { j["passes"][2]["steer"] = -40; },
       "rig.json: $.passes[2].steer: expected a weight between 0 and 200000 lb, got -40"},
      {"absurd weight", [](ordered_json& j) { j["passes"][0]["drive"] = 250000; },
       "$.passes[0].drive: expected a weight between 0 and 200000 lb, got 250000"},
      {"absurd kg weight",
       [](ordered_json& j) {
         j["units"]["weight"] = "kg";
         j["passes"][0]["drive"] = 95000;
       },
       "$.passes[0].drive: expected a weight between 0 and 90000 kg, got 95000"},
      {"huge number", [](ordered_json& j) { j["passes"][1]["trailer"] = 1e300; },
       "$.passes[1].trailer: expected a weight between 0 and 200000 lb"},
      {"weight as string", [](ordered_json& j) { j["passes"][1]["steer"] = "3880"; },
       "$.passes[1].steer: expected a number, got \"3880\""},
      {"weight as bool", [](ordered_json& j) { j["passes"][1]["steer"] = true; },
       "$.passes[1].steer: expected a number, got true"},
      {"unknown key with suggestion", [](ordered_json& j) { j["tow_vehicle"]["wheelbse"] = 160; },
       "$.tow_vehicle.wheelbse: unknown key 'wheelbse'; did you mean 'wheelbase'?"},
      {"unknown key, no near match", [](ordered_json& j) { j["colour"] = "red"; },
       "$.colour: unknown key 'colour'; expected one of: format,"},
      {"unknown key in a pass", [](ordered_json& j) { j["passes"][1]["traler"] = 1; },
       "$.passes[1].traler: unknown key 'traler'; did you mean 'trailer'?"},
      {"missing required field", [](ordered_json& j) { j["trailer"].erase("ball_to_axle"); },
       "$.trailer: missing required field 'ball_to_axle'"},
      {"missing passes", [](ordered_json& j) { j.erase("passes"); },
       "rig.json: $: missing required field 'passes'"},
      {"no passes", [](ordered_json& j) { j["passes"] = ordered_json::array(); },
       "$.passes: expected 1 to 1000 passes, got 0"},
      {"passes not an array", [](ordered_json& j) { j["passes"] = 3; },
       "$.passes: expected an array of passes, got 3"},
      {"scale not an object", [](ordered_json& j) { j["scale"] = "ST-3"; },
       "$.scale: expected an object, got \"ST-3\""},
      {"unknown weight unit", [](ordered_json& j) { j["units"]["weight"] = "lbs"; },
       "$.units.weight: unknown weight unit \"lbs\"; expected one of: lb, kg"},
      {"unknown length unit", [](ordered_json& j) { j["units"]["length"] = "yd"; },
       "$.units.length: unknown length unit \"yd\"; expected one of: in, ft, mm, cm, m"},
      {"unknown format", [](ordered_json& j) { j["format"] = "weigh-session"; },
       "$.format: expected \"scaleproof-session/1\", got \"weigh-session\""},
      {"newer format version", [](ordered_json& j) { j["format"] = "scaleproof-session/2"; },
       "$.format: this file is session format version 2"},
      {"newer version wins over unknown keys",
       [](ordered_json& j) {
         j["format"] = "scaleproof-session/2";
         j["new_thing"] = 1;
       },
       "$.format: this file is session format version 2"},
      {"zero wheelbase", [](ordered_json& j) { j["tow_vehicle"]["wheelbase"] = 0; },
       "$.tow_vehicle.wheelbase: expected a length greater than 0 and at most 1200 in, got 0"},
      {"negative ball_to_axle", [](ordered_json& j) { j["trailer"]["ball_to_axle"] = -5; },
       "$.trailer.ball_to_axle: expected a length greater than 0 and at most 1200 in, got -5"},
      {"absurd length in m",
       [](ordered_json& j) {
         j["units"]["length"] = "m";
         j["tow_vehicle"]["wheelbase"] = 4;
         j["tow_vehicle"]["rear_axle_to_ball"] = 1.2;
         j["trailer"]["ball_to_axle"] = 48;
       },
       "$.trailer.ball_to_axle: expected a length greater than 0 and at most 30.48 m, got 48"},
      {"conventional with negative offset",
       [](ordered_json& j) { j["tow_vehicle"]["rear_axle_to_ball"] = -2; },
       "$.tow_vehicle.rear_axle_to_ball: expected a positive length for a conventional trailer"},
      {"fifth wheel with positive offset",
       [](ordered_json& j) {
         j["trailer"]["type"] = "fifth-wheel";
         j["passes"].erase(2);
       },
       "$.tow_vehicle.rear_axle_to_ball: expected zero or a negative length for a fifth-wheel"},
      {"fifth wheel with tensioned pass",
       [](ordered_json& j) {
         j["trailer"]["type"] = "fifth-wheel";
         j["tow_vehicle"]["rear_axle_to_ball"] = -3;
       },
       "$.passes[2].kind: a fifth-wheel trailer takes no weight-distributing bars"},
      {"coupling ahead of steer axle",
       [](ordered_json& j) {
         j["trailer"]["type"] = "fifth-wheel";
         j["tow_vehicle"]["rear_axle_to_ball"] = -170;
         j["passes"].erase(2);
       },
       "$.tow_vehicle.rear_axle_to_ball: expected a coupling behind the steer axle"},
      {"unknown trailer type", [](ordered_json& j) { j["trailer"]["type"] = "gooseneck!"; },
       "$.trailer.type: unknown trailer type \"gooseneck!\"; expected one of: conventional, "
       "fifth-wheel"},
      {"duplicate ticket", [](ordered_json& j) { j["passes"][2]["ticket"] = "A-1"; },
       "$.passes[2].ticket: ticket \"A-1\" is already used by passes[0]"},
      {"trailer reading on unhitched pass", [](ordered_json& j) { j["passes"][0]["trailer"] = 40; },
       "$.passes[0].trailer: expected no trailer reading (or 0) on an unhitched pass, got 40 lb"},
      {"tensioned pass without trailer", [](ordered_json& j) { j["passes"][2].erase("trailer"); },
       "$.passes[2].trailer: missing required field 'trailer': a tensioned pass needs"},
      {"hitched pass without trailer", [](ordered_json& j) { j["passes"][1].erase("trailer"); },
       "$.passes[1].trailer: missing required field 'trailer': a hitched pass needs"},
      {"setting on a hitched pass", [](ordered_json& j) { j["passes"][1]["setting"] = "2"; },
       "$.passes[1].setting: a bar setting belongs only on a tensioned pass; this pass is hitched"},
      {"setting of wrong type",
       [](ordered_json& j) { j["passes"][2]["setting"] = ordered_json::array(); },
       "$.passes[2].setting: expected a setting label (string or number), got an array"},
      {"unknown pass kind", [](ordered_json& j) { j["passes"][0]["kind"] = "empty"; },
       "$.passes[0].kind: unknown pass kind \"empty\"; expected one of: unhitched, hitched, "
       "tensioned"},
      {"date-time without offset",
       [](ordered_json& j) { j["passes"][0]["weighed_at"] = "2026-10-14T09:12:00"; },
       "$.passes[0].weighed_at: missing the UTC offset"},
      {"date-time with bad day",
       [](ordered_json& j) { j["passes"][0]["weighed_at"] = "2026-02-30T09:12:00Z"; },
       "$.passes[0].weighed_at: day 30 does not exist in 2026-02"},
      {"date-time as prose", [](ordered_json& j) { j["passes"][0]["weighed_at"] = "yesterday"; },
       "$.passes[0].weighed_at: expected an ISO 8601 date-time with UTC offset"},
      {"bad inspection date", [](ordered_json& j) { j["scale"]["last_inspected"] = "2026-13-01"; },
       "$.scale.last_inspected: month 13 is not 01-12"},
      {"falr target above 100", [](ordered_json& j) { j["tow_vehicle"]["falr_target"] = 120; },
       "$.tow_vehicle.falr_target: expected a percentage greater than 0 and at most 100 %, got "
       "120"},
      {"falr target negative", [](ordered_json& j) { j["tow_vehicle"]["falr_target"] = -1; },
       "$.tow_vehicle.falr_target: expected a percentage greater than 0 and at most 100 %, got -1"},
      {"zero division", [](ordered_json& j) { j["scale"]["division"] = 0; },
       "$.scale.division: expected a scale division greater than 0 and at most 1000 lb, got 0"},
      {"negative division", [](ordered_json& j) { j["scale"]["division"] = -20; },
       "$.scale.division: expected a scale division greater than 0"},
      {"unknown accuracy class", [](ordered_json& j) { j["scale"]["accuracy_class"] = "IV"; },
       "$.scale.accuracy_class: unknown accuracy class \"IV\"; expected one of: III, IIIL"},
      {"zero rating", [](ordered_json& j) { j["tow_vehicle"]["gvwr"] = 0; },
       "$.tow_vehicle.gvwr: expected a rating greater than 0 and at most 200000 lb, got 0"},
      {"zero reading uncertainty", [](ordered_json& j) { j["scale"]["reading_uncertainty"] = 0; },
       "$.scale.reading_uncertainty: expected a standard uncertainty greater than 0"},
      {"absurd length uncertainty", [](ordered_json& j) { j["length_uncertainty"] = 40; },
       "$.length_uncertainty: expected a standard uncertainty greater than 0 and at most 12 in"},
      {"label too long", [](ordered_json& j) { j["trailer"]["label"] = std::string(201, 'x'); },
       "$.trailer.label: expected at most 200 characters, got 201"},
      {"control character in label", [](ordered_json& j) { j["trailer"]["label"] = "a\nb"; },
       "$.trailer.label: expected one line of text, got a line break (U+000A) at character 2"},
      {"empty ticket", [](ordered_json& j) { j["passes"][0]["ticket"] = ""; },
       "$.passes[0].ticket: expected a non-empty text"},
      {"void reason without void", [](ordered_json& j) { j["passes"][0]["void_reason"] = "x"; },
       "$.passes[0].void_reason: a void reason belongs only on a voided pass"},
      {"voided not a bool", [](ordered_json& j) { j["passes"][0]["voided"] = "yes"; },
       "$.passes[0].voided: expected true or false, got \"yes\""},
      {"session id not whole", [](ordered_json& j) { j["session_id"] = 1.5; },
       "$.session_id: expected a whole number >= 1, got 1.5"},
      {"top level not an object", [](ordered_json& j) { j = ordered_json::array(); },
       "rig.json: $: expected an object, got an array"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.name);
    ordered_json j = ordered_json::parse(kBase);
    c.mutate(j);
    const std::string msg = parse_error_of(j.dump());
    CAPTURE(msg);
    CHECK(msg.find(c.expected) != std::string::npos);
  }
}

TEST_CASE("invalid JSON text gives line and column") {
  struct Case {
    std::string text;
    std::string expected;
  };
  const std::vector<Case> cases = {
      {"{\"format\": \"scaleproof-session/1\",\n  \"units\": {\"weight\": \"lb\" \"length\": 1}}",
       // The column is where the parser stopped: the end of the unexpected "length" token.
       "rig.json: line 2, column 35: invalid JSON: syntax error while parsing object"},
      {"", "rig.json: line 1, column 1: invalid JSON"},
      {"{\"a\": NaN}", "rig.json: line 1, column 7: invalid JSON"},
      {"{\"a\": Infinity}", "rig.json: line 1, column 7: invalid JSON"},
      {"{\"a\": 1}\n{}", "rig.json: line 2, column 1: invalid JSON"},
      {"{\"a\": 1e400}", "rig.json: invalid JSON: number overflow"},
      // nlohmann keeps the last of two equal keys; we refuse, naming the path.
      {"{\"format\": \"scaleproof-session/1\", \"passes\": [{\"steer\": 1, \"steer\": 2}]}",
       "rig.json: $.passes[0].steer: key 'steer' appears twice in the same object"},
      {"{\"a\": {\"b\": [1, 2, {\"c\": 1, \"c\": 1}]}}",
       "rig.json: $.a.b[2].c: key 'c' appears twice"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.text);
    const std::string msg = parse_error_of(c.text);
    CAPTURE(msg);
    CHECK(msg.find(c.expected) != std::string::npos);
  }
}

TEST_CASE("text_position counts lines and columns from 1") {
  CHECK(sp::format::text_position("ab\ncd", 0).line == 1);
  CHECK(sp::format::text_position("ab\ncd", 4).line == 2);
  CHECK(sp::format::text_position("ab\ncd", 4).column == 2);
  CHECK(sp::format::text_position("ab", 99).column == 3);  // clamps to the end
}

TEST_CASE("setting accepts a string or a number and keeps it as text") {
  struct Case {
    ordered_json setting;
    std::string kept;
  };
  const std::vector<Case> cases = {{"4", "4"}, {4, "4"}, {2.5, "2.5"}, {"link 7", "link 7"}, {0, "0"}};
  for (const Case& c : cases) {
    CAPTURE(c.setting.dump());
    ordered_json j = ordered_json::parse(kBase);
    j["passes"][2]["setting"] = c.setting;
    const sp::Session s = sp::parse_session_json(j.dump(), "rig.json");
    CHECK(s.passes[2].setting == std::optional<std::string>(c.kept));
  }
}

TEST_CASE("ISO 8601 checks") {
  // Forms per ISO 8601-1:2019 extended format; leap years per the Gregorian rule.
  struct Case {
    const char* text;
    bool ok;
  };
  const std::vector<Case> cases = {
      {"2026-10-14T09:12:00-05:00", true}, {"2026-10-14T09:12-05:00", true},
      {"2026-10-14T09:12:00.250Z", true},  {"2024-02-29T00:00:00Z", true},
      {"2026-12-31T23:59:60+14:00", true}, {"2025-02-29T00:00:00Z", false},
      {"2100-02-29T00:00:00Z", false},     {"2026-10-14 09:12:00Z", false},
      {"2026-10-14T24:00:00Z", false},     {"2026-10-14T09:12:00+0500", false},
      {"2026-10-14T09:12:00", false},      {"2026-10-14T09:12:00Zjunk", false},
  };
  for (const Case& c : cases) {
    CAPTURE(c.text);
    CHECK(sp::format::check_iso_date_time(c.text).empty() == c.ok);
  }
  CHECK(sp::format::check_iso_date("2026-04-02").empty());
  CHECK(!sp::format::check_iso_date("2026-4-2").empty());
}

TEST_CASE("closest_name suggests only likely typos") {
  const std::vector<std::string> keys = {"wheelbase", "rear_axle_to_ball", "gvwr", "gcwr"};
  CHECK(sp::format::closest_name("wheelbse", keys) == "wheelbase");
  CHECK(sp::format::closest_name("gvrw", keys) == "gvwr");
  CHECK(sp::format::closest_name("colour", keys).empty());
}

TEST_CASE("round trip: parse(write(s)) == s and write is a fixed point") {
  std::vector<std::filesystem::path> files;
  for (const char* dir : {SCALEPROOF_TEST_DATA "/sessions", SCALEPROOF_SOURCE_DIR "/data-demo/sessions"}) {
    for (const auto& e : std::filesystem::directory_iterator(dir)) {
      const std::string name = e.path().filename().string();
      if (e.path().extension() == ".json" && name.rfind("bad-", 0) != 0) files.push_back(e.path());
    }
  }
  std::sort(files.begin(), files.end());
  REQUIRE(files.size() >= 4);
  for (const auto& f : files) {
    CAPTURE(f.string());
    const sp::Session a = sp::parse_session_json(read_file(f), f.string());
    const std::string written = sp::write_session_json(a);
    const sp::Session b = sp::parse_session_json(written, "written");
    CHECK(sp::write_session_json(b) == written);
    // Field by field on what the writer could drop.
    REQUIRE(a.passes.size() == b.passes.size());
    for (std::size_t i = 0; i < a.passes.size(); ++i) {
      CAPTURE(i);
      CHECK(a.passes[i].ticket == b.passes[i].ticket);
      CHECK(a.passes[i].setting == b.passes[i].setting);
      CHECK(a.passes[i].steer == b.passes[i].steer);
      CHECK(a.passes[i].trailer == b.passes[i].trailer);
      CHECK(a.passes[i].gross == b.passes[i].gross);
      CHECK(a.passes[i].voided == b.passes[i].voided);
      CHECK(a.passes[i].void_reason == b.passes[i].void_reason);
      CHECK(a.passes[i].entered_at == b.passes[i].entered_at);
      CHECK(a.passes[i].id == b.passes[i].id);
    }
    CHECK(a.tow_vehicle.rear_axle_to_ball == b.tow_vehicle.rear_axle_to_ball);
    CHECK(a.tow_vehicle.falr_target == b.tow_vehicle.falr_target);
    CHECK(a.trailer.axle_gawr == b.trailer.axle_gawr);
    CHECK(a.scale.last_inspected == b.scale.last_inspected);
    CHECK(a.scale.reading_uncertainty == b.scale.reading_uncertainty);
    CHECK(a.length_uncertainty == b.length_uncertainty);
    CHECK(a.notes == b.notes);
    CHECK(a.owner == b.owner);
  }
}

TEST_CASE("round trip keeps decimals exactly") {
  ordered_json j = ordered_json::parse(kBase);
  j["tow_vehicle"]["wheelbase"] = 160.3;
  j["passes"][0]["steer"] = 4180.1;
  j["length_uncertainty"] = 0.1;
  const sp::Session a = sp::parse_session_json(j.dump(), "rig.json");
  const sp::Session b = sp::parse_session_json(sp::write_session_json(a), "w");
  CHECK(b.tow_vehicle.wheelbase == 160.3);
  CHECK(b.passes[0].steer == 4180.1);
  CHECK(b.length_uncertainty == std::optional<double>(0.1));
}

TEST_CASE("writer: documented key order, integers stay integers, absent optionals omitted") {
  const sp::Session s = sp::parse_session_json(kBase, "rig.json");
  const std::string w = sp::write_session_json(s);
  const auto j = ordered_json::parse(w);
  std::vector<std::string> keys;
  for (const auto& it : j.items()) keys.push_back(it.key());
  CHECK(keys == std::vector<std::string>{"format", "units", "scale", "tow_vehicle", "trailer", "passes"});
  CHECK(w.find("\"steer\": 4180,") != std::string::npos);
  CHECK(w.find("\"gvwr\"") == std::string::npos);
  CHECK(w.find("\n  \"units\"") != std::string::npos);  // two-space indent
}

TEST_CASE("deep nesting is refused before it costs stack or memory") {
  const std::string deep = "{\"format\": " + std::string(50000, '[') + std::string(50000, ']') + "}";
  const std::string msg = parse_error_of(deep);
  CAPTURE(msg);
  CHECK(msg.find("expected at most 64 levels of nested objects and arrays") != std::string::npos);
}
