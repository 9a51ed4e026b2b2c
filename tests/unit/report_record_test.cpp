#include <doctest/doctest.h>

#include <cmath>
#include <limits>

#include "core/error.h"
#include "report/record.h"
#include "report/signer.h"

using namespace sp::report;
using nlohmann::json;

TEST_CASE("canonical JSON sorts keys and fixes number forms") {
  // Rules documented in report/record.h and reports/VERIFY.md (our own format).
  struct Case {
    const char* what;
    json value;
    const char* text;
  };
  const Case cases[] = {
      {"keys sorted at every level", json::parse(R"({"b":1,"a":{"z":true,"y":null}})"),
       R"({"a":{"y":null,"z":true},"b":1})"},
      {"integral double as integer", json{{"w", 4180.0}}, R"({"w":4180})"},
      {"negative zero", json{{"w", -0.0}}, R"({"w":0})"},
      {"shortest round-trip decimal", json{{"w", 0.1}}, R"({"w":0.1})"},
      {"small number", json{{"w", 1.5e-7}}, R"({"w":1.5e-07})"},
      {"array order kept", json::parse("[3,1,2]"), "[3,1,2]"},
      {"UTF-8 kept as is", json{{"unit", "lbf·ft"}}, "{\"unit\":\"lbf\xc2\xb7" "ft\"}"},
      {"escapes", json{{"s", "a\"b\n"}}, R"({"s":"a\"b\n"})"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.what);
    CHECK(canonical_json(c.value) == c.text);
    // Canonical text is a fixed point: parse and re-canonicalise gives the same bytes.
    CHECK(canonical_json(json::parse(c.text)) == c.text);
  }
}

TEST_CASE("canonical JSON refuses non-finite numbers") {
  json v = {{"x", std::numeric_limits<double>::quiet_NaN()}};
  CHECK_THROWS_AS(canonical_json(v), sp::Error);
}

TEST_CASE("record carries format, key and a content-derived id") {
  RecordMeta meta;
  meta.software = "scaleproof test";
  meta.public_key = std::string(32, '\x07');
  json session = {{"ticket", "LF-1"}}, results = {{"tongue_load", {{"value", 1000}}}};
  json a = build_record(session, results, meta);
  CHECK(a["format"] == "scaleproof-record/2");
  CHECK(a["ledger"].is_null());  // no anchor given: issued from a session file
  CHECK(a["report"]["public_key"] == to_hex(meta.public_key));
  CHECK(a["report"]["key_fingerprint"] == fingerprint(meta.public_key));
  CHECK(a["report"]["issued_at"].is_null());  // no clock unless given
  std::string id = a["report"]["id"];
  CHECK(id.rfind("SP-", 0) == 0);
  CHECK(id.size() == 15);
  CHECK(build_record(session, results, meta)["report"]["id"] == id);  // deterministic
  meta.signed_by = "Ines Brodowska-Quill";
  CHECK(build_record(session, results, meta)["report"]["id"] != id);
  results["tongue_load"]["value"] = 1001;
  meta.signed_by.reset();
  CHECK(build_record(session, results, meta)["report"]["id"] != id);
}

TEST_CASE("compare_results tolerates last-bit noise and names real differences") {
  // Results with a verdict (issue 12 on) are compared strictly.
  json stated = json::parse(
      R"({"verdict":"compliant","tongue_load":{"value":1000.0,"u":15.0},"flags":[{"code":"a"}],"x":null})");
  struct Case {
    const char* what;
    const char* recomputed;
    std::size_t differences;
    const char* names;
  };
  const Case cases[] = {
      {"identical",
       R"({"verdict":"compliant","tongue_load":{"value":1000.0,"u":15.0},"flags":[{"code":"a"}],"x":null})",
       0, ""},
      {"within 1e-6 relative",
       R"({"verdict":"compliant","tongue_load":{"value":1000.0000001,"u":15.0},"flags":[{"code":"a"}],"x":null})",
       0, ""},
      {"value changed",
       R"({"verdict":"compliant","tongue_load":{"value":1010.0,"u":15.0},"flags":[{"code":"a"}],"x":null})",
       1, "$.tongue_load.value"},
      {"flag changed",
       R"({"verdict":"compliant","tongue_load":{"value":1000.0,"u":15.0},"flags":[{"code":"b"}],"x":null})",
       1, "$.flags[0].code"},
      {"extra flag",
       R"({"verdict":"compliant","tongue_load":{"value":1000.0,"u":15.0},"flags":[{"code":"a"},{"code":"b"}],"x":null})",
       1, "$.flags"},
      {"null became number",
       R"({"verdict":"compliant","tongue_load":{"value":1000.0,"u":15.0},"flags":[{"code":"a"}],"x":3})",
       1, "$.x"},
      {"key missing",
       R"({"verdict":"compliant","tongue_load":{"value":1000.0},"flags":[{"code":"a"}],"x":null})",
       1, "$.tongue_load.u"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.what);
    auto diffs = compare_results(stated, json::parse(c.recomputed));
    CHECK(diffs.size() == c.differences);
    if (!diffs.empty()) CHECK(diffs[0].find(c.names) != std::string::npos);
  }
}

TEST_CASE("the ledger anchor is part of the signed record and reads back") {
  RecordMeta meta;
  meta.software = "scaleproof test";
  meta.public_key = std::string(32, '\x07');
  json session = {{"ticket", "LF-1"}}, results = {{"tongue_load", {{"value", 1000}}}};
  const std::string without = build_record(session, results, meta)["report"]["id"];
  LedgerAnchor a{13, std::string(64, 'b'), std::nullopt};
  a.checkpoint = CheckpointRef{13, 12, std::string(64, 'c'), "2026-10-14T10:00:00Z",
                               std::nullopt, "fp", std::string(64, 'd'), std::string(128, 'e')};
  meta.ledger = a;
  json r = build_record(session, results, meta);
  CHECK(r["report"]["id"] != without);  // the anchor is covered by the id and the signature
  auto back = record_ledger(json::parse(canonical_json(r)));
  REQUIRE(back.has_value());
  CHECK(back->rows == 13);
  CHECK(back->head == a.head);
  REQUIRE(back->checkpoint.has_value());
  CHECK(back->checkpoint->rows == 12);
  CHECK_FALSE(back->checkpoint->signed_by.has_value());
  // Format 1 records have no "ledger"; a malformed one is a data error.
  CHECK_FALSE(record_ledger(json{{"format", kRecordFormatV1}}).has_value());
  CHECK_THROWS_AS(record_ledger(json{{"ledger", {{"rows", "x"}}}}), sp::Error);
}

TEST_CASE("compare_results: results from before the verdict are compared on what they state") {
  // Records issued before results carried a verdict must still verify (issue 12): their numbers
  // and flags are checked, what was added since and the wording reworded since are not.
  const json stated = json::parse(R"({"tongue_load":{"value":1000.0,"u":15.0},
      "flags":[{"code":"geometry-mismatch","severity":"error","field":"ball_to_axle","needed":224.1,
                "message":"old words"}],
      "compliance":[{"rating":"gvwr","label":"old label","value":7421.0}],
      "unsolved":["old line"],"target":{"note":"old note","setting":{"value":3.0,"u":0.05}}})");
  const std::string now =
      R"({"verdict":"not-proven","verdict_reason":"r","tongue_load":{"value":1000.0,"u":15.0},
      "flags":[FLAGS],
      "compliance":[{"rating":"gvwr","label":"new label","value":VALUE}],
      "unsolved":["new line","another"],
      "target":{"note":"new note","setting":{"value":3.0,"u":0.05},"provisional":true},"if_excluded":null})";
  const std::string mismatch =
      R"({"code":"geometry-mismatch","severity":"error","field":"ball_to_axle","needed":224.1,"message":"new words"})";
  const std::string over =
      R"({"code":"rating-over","severity":"error","rating":"gvwr","message":"m"})";
  struct Case {
    const char* what;
    std::string flags, value;
    std::size_t differences;
    const char* names;
  };
  const Case cases[] = {
      {"new keys, new wording, a rating-over flag added", mismatch + "," + over, "7421.0", 0, ""},
      {"same flags in another order", over + "," + mismatch, "7421.0", 0, ""},
      {"a number changed", mismatch, "7500.0", 1, "$.compliance[0].value"},
      {"the stated flag is not raised again", over, "7421.0", 1, "$.flags[0]"},
      {"another flag is raised", mismatch + R"(,{"code":"weight-drift","severity":"warning"})",
       "7421.0", 1, "weight-drift"},
      {"the flag names another length",
       R"({"code":"geometry-mismatch","severity":"error","field":"rear_axle_to_ball","needed":224.1})",
       "7421.0", 2, "$.flags[0]"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.what);
    std::string text = now;
    text.replace(text.find("FLAGS"), 5, c.flags);
    text.replace(text.find("VALUE"), 5, c.value);
    auto diffs = compare_results(stated, json::parse(text));
    CAPTURE(json(diffs).dump());
    CHECK(diffs.size() == c.differences);
    if (!diffs.empty()) CHECK(diffs[0].find(c.names) != std::string::npos);
  }
  // A key the old record holds must still be recomputed.
  std::string text = now;
  text.replace(text.find("FLAGS"), 5, mismatch);
  text.replace(text.find("VALUE"), 5, "7421.0");
  json lacking = json::parse(text);
  lacking.erase("tongue_load");
  auto diffs = compare_results(stated, lacking);
  REQUIRE(diffs.size() == 1);
  CHECK(diffs[0] == "$.tongue_load: in the record, not recomputed");
}
