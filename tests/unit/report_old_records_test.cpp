// Regression: reports issued before record format 2 still verify. Their results were computed
// by the engine of that time; format 2 added keys (verdict, if_excluded, ...) and reworded
// messages, so a format 1 record is compared on its numbers, codes and statuses
// (record.h results_as_format1). The files were made by the old build (tests/data/reports-v1).
#include <doctest/doctest.h>

#include <fstream>
#include <functional>
#include <sstream>

#include "report/pdf_extract.h"
#include "report/recompute.h"
#include "report/record.h"
#include "report/report_pdf.h"
#include "report/verify.h"

using namespace sp::report;
using nlohmann::json;

namespace {

std::string read(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  REQUIRE(in.good());
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

const char* const kOld[] = {"report_a4.pdf", "report_letter.pdf", "report_winansi_fonts.pdf"};
const std::string kDir = SCALEPROOF_TEST_DATA "/reports-v1/";

json old_record(const std::string& name) {
  auto text = find_attachment(read(kDir + name), kRecordAttachment);
  REQUIRE(text.has_value());
  return json::parse(*text);
}

}  // namespace

TEST_CASE("reports of record format 1 still verify against today's engine") {
  for (const char* name : kOld) {
    CAPTURE(name);
    const std::string pdf = read(kDir + name);
    VerifyOptions o;
    o.recompute = recompute_results;
    VerifyResult r = verify_report_bytes(pdf, o);
    for (const auto& c : r.checks) {
      CAPTURE(c.name);
      CAPTURE(c.detail);
      CHECK(c.status != CheckStatus::failed);
    }
    CHECK(old_record(name)["format"] == kRecordFormatV1);
  }
}

TEST_CASE("a format 1 record is still held to its numbers, codes and statuses") {
  const json record = old_record(kOld[0]);
  const json again = recompute_results(record["session"]);
  struct Row {
    std::string what;
    std::function<void(json&)> edit;
    bool agrees;
  };
  const Row rows[] = {
      {"unchanged", [](json&) {}, true},
      {"a number",
       [](json& r) { r["compliance"][0]["value"] = r["compliance"][0]["value"].get<double>() + 5; },
       false},
      {"a compliance status", [](json& r) { r["compliance"][0]["status"] = "over"; }, false},
      {"a compliance label (wording)", [](json& r) { r["compliance"][0]["label"] = "reworded"; },
       true},
      {"an extra flag",
       [](json& r) {
         r["flags"].push_back({{"code", "off-division"}});
       },
       false},
  };
  for (const Row& row : rows) {
    CAPTURE(row.what);
    json stated = record["results"];
    row.edit(stated);
    CHECK(compare_results(stated, results_as_format1(again, stated)).empty() == row.agrees);
  }
}
