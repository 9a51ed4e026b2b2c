// Every page and /api/ endpoint of the console, and its bad inputs, in process (no socket):
// one table of requests run in order on one store (later rows rely on earlier ones: the
// duplicate ticket follows the first). Expected statuses are the console contract's
// (docs/console.md): 303 after a form post, 400 naming the field with the library's own
// message, 404, 405, 409 for a duplicate, 413 over the body limit.
#include <nlohmann/json.hpp>

#include "unit/serve_fixture.h"

using namespace servetest;

namespace {

struct Case {
  const char* name;
  const char* method;  // GET, POST (form), JSON (POST with a JSON body), DELETE
  std::string path;
  std::map<std::string, std::string> form;  // form fields, or query for GET
  std::string json;
  int status;
  std::string body_has;  // substring of the body ("" : not checked)
  std::string field;     // JSON error: the field named ("-": null; "": not checked)
  std::string location;  // 303: Location starts with this
};

const char* kRigToml = R"(name = "SW-9"
[units]
weight = "lb"
length = "in"
[tow_vehicle]
label = "Invented three-quarter-ton van"
wheelbase = 148
rear_axle_to_ball = 48
gvwr = 9500
front_gawr = 4600
rear_gawr = 5600
[trailer]
label = "Invented 20 ft box trailer"
ball_to_axle = 170
)";

const std::string kPass = "/sessions/1/passes";
std::map<std::string, std::string> pass(const std::string& ticket, const std::string& drive) {
  return {{"kind", "tensioned"}, {"setting", "2"},
          {"ticket", ticket},    {"weighed_at", "2026-10-21T14:40:00-06:00"},
          {"steer", "3360"},     {"drive", drive},
          {"trailer", "7100"}};
}

// One request per line reads as a table.
// clang-format off
std::vector<Case> cases(long long bad) {
  const std::string b = std::to_string(bad);
  return {
      {"root redirects to the sessions", "GET", "/", {}, "", 303, "", "", "/sessions"},
      {"sessions list", "GET", "/sessions", {}, "", 200, "<tr data-session=\"1\"", "", ""},
      {"search by ticket finds it", "GET", "/sessions", {{"q", "qx-4390"}}, "", 200, "data-session=\"1\"", "", ""},
      {"search by rig finds it", "GET", "/sessions", {{"q", "RA-3"}}, "", 200, "data-session=\"1\"", "", ""},
      {"search for nothing finds none", "GET", "/sessions", {{"q", "ZZ-none"}}, "", 200, "0 session(s)", "", ""},
      {"open-session form", "GET", "/sessions/new", {}, "", 200, "id=\"open-session\"", "", ""},
      {"open a session", "POST", "/sessions", {{"rig", "RA-3"}, {"scale", "QX-1"}, {"label", "K-1"}}, "", 303, "", "", "/sessions/2"},
      {"open: rig not in the store", "POST", "/sessions", {{"rig", "nope"}, {"scale", "QX-1"}}, "", 400, "rig: nope is not in the store", "", ""},
      {"open: no scale", "POST", "/sessions", {{"rig", "RA-3"}}, "", 400, "scale:", "", ""},
      {"open: duplicate key", "JSON", "/api/sessions", {}, R"({"rig":"RA-3","scale":"QX-1","label":"K-1"})", 409, "already in the store", "", ""},
      {"rig form", "GET", "/rigs/new", {}, "", 200, "<textarea id=\"rig_file\" name=\"rig_file\"", "", ""},
      {"add a rig from TOML", "POST", "/rigs", {{"rig_file", kRigToml}}, "", 303, "", "", "/sessions/new"},
      {"rig added shows in the form", "GET", "/sessions/new", {}, "", 200, "<option value=\"SW-9\">", "", ""},
      {"rig twice is a conflict", "JSON", "/api/rigs", {}, nlohmann::json{{"rig_file", kRigToml}}.dump(), 409, "already in the store", "", ""},
      {"rig: unknown key", "JSON", "/api/rigs", {}, R"({"rig_file":"name = \"X\"\nwheels = 4\n"})", 400, "unknown key", "rig_file", ""},
      {"rig: empty", "JSON", "/api/rigs", {}, R"({"rig_file":""})", 400, "", "rig_file", ""},
      {"desk: verdict first, the flag names the reading", "GET", "/sessions/1", {}, "", 200, "data-ticket=\"QX-4390\"", "", ""},
      {"pass: not a number", "JSON", "/api/sessions/1/passes", {}, nlohmann::json(pass("QX-4392", "40x0")).dump(), 400, "expected a number", "drive", ""},
      {"pass: off the division", "JSON", "/api/sessions/1/passes", {}, nlohmann::json(pass("QX-4392", "4025")).dump(), 400, "multiple", "drive", ""},
      {"pass: bad kind", "JSON", "/api/sessions/1/passes", {}, R"({"kind":"slack"})", 400, "kind: expected unhitched, hitched or tensioned", "kind", ""},
      {"pass: no ticket", "JSON", "/api/sessions/1/passes", {}, R"({"kind":"unhitched"})", 400, "", "ticket", ""},
      {"pass: bad time", "JSON", "/api/sessions/1/passes", {}, nlohmann::json{{"kind", "unhitched"}, {"ticket", "Z"}, {"weighed_at", "yesterday"}, {"steer", "3560"}, {"drive", "2880"}}.dump(), 400, "", "weighed_at", ""},
      {"pass: duplicate ticket", "JSON", "/api/sessions/1/passes", {}, nlohmann::json(pass("QX-4390", "4020")).dump(), 409, "already in session 1", "ticket", ""},
      {"pass: no such session", "JSON", "/api/sessions/99/passes", {}, nlohmann::json(pass("QX-9", "4020")).dump(), 404, "", "-", ""},
      {"pass form: refusal re-shows the desk with the values", "POST", kPass, pass("QX-4392", "40x0"), "", 400, "value=\"40x0\"", "", ""},
      {"void a pass of another session", "POST", "/sessions/2/passes/" + b + "/void", {{"reason", "x"}}, "", 404, "", "", ""},
      {"void: no reason", "JSON", "/api/sessions/1/passes/" + b + "/void", {}, R"({})", 400, "", "reason", ""},
      {"void the mis-keyed pass", "POST", "/sessions/1/passes/" + b + "/void", {{"reason", "drive keyed wrong"}}, "", 303, "", "", "/sessions/1?rekey=" + b},
      {"re-key form holds the voided values", "GET", "/sessions/1", {{"rekey", b}}, "", 200, "value=\"4400\"", "", ""},
      {"re-key the pass", "POST", kPass, pass("QX-4392", "4020"), "", 303, "", "", "/sessions/1"},
      {"the verdict turns", "JSON", "/api/sessions/1/passes/" + b + "/void", {}, R"({"reason":"again"})", 400, "already voided", "", ""},
      {"api: result as reconcile --json, verdict first", "GET", "/api/sessions/1", {}, "", 200, "{\n  \"verdict\": ", "", ""},
      {"api: sessions", "GET", "/api/sessions", {}, "", 200, "\"verdict\"", "", ""},
      {"api: no such session", "GET", "/api/sessions/99", {}, "", 404, "session 99", "-", ""},
      {"api: id not a number", "GET", "/api/sessions/x1", {}, "", 404, "", "", ""},
      {"plan page", "GET", "/sessions/1/plan", {}, "", 200, "<svg id=\"plan-chart\"", "", ""},
      {"api: plan", "GET", "/api/sessions/1/plan", {}, "", 200, "\"rows\"", "", ""},
      {"history with the void", "GET", "/sessions/1/history", {}, "", 200, "drive keyed wrong", "", ""},
      {"api: history", "GET", "/api/sessions/1/history", {}, "", 200, "\"voids\"", "", ""},
      {"ledger page", "GET", "/ledger", {}, "", 200, "<span id=\"ledger-rows\">", "", ""},
      {"api: ledger is check-store --json", "GET", "/api/ledger", {}, "", 200, "\"scaleproof-check/1\"", "", ""},
      {"verify form", "GET", "/verify", {}, "", 200, "enctype=\"multipart/form-data\"", "", ""},
      {"verify: no report", "POST", "/verify", {}, "", 400, "report:", "", ""},
      {"api verify: not a report", "JSON", "/api/verify", {}, "{}", 400, "", "report", ""},
      {"report without --key", "JSON", "/api/sessions/1/report", {}, "{}", 404, "--key", "", ""},
      {"close the session", "POST", "/sessions/2/close", {}, "", 303, "", "", "/sessions/2"},
      {"pass on a closed session", "JSON", "/api/sessions/2/passes", {}, nlohmann::json(pass("QX-1", "4020")).dump(), 400, "closed", "", ""},
      {"close twice", "JSON", "/api/sessions/2/close", {}, "{}", 400, "already closed", "", ""},
      {"open ones first", "GET", "/api/sessions", {}, "", 200, "", "", ""},
      {"unknown page", "GET", "/nothing", {}, "", 404, "", "", ""},
      {"no directory listing", "GET", "/assets/", {}, "", 404, "", "", ""},
      {"no file from disk", "GET", "/assets/..%2fCMakeLists.txt", {}, "", 404, "", "", ""},
      {"stylesheet from the binary", "GET", "/assets/console.css", {}, "", 200, "@media print", "", ""},
      {"wrong method", "DELETE", "/sessions", {}, "", 405, "", "", ""},
      {"api: bad JSON", "JSON", "/api/sessions/1/passes", {}, "{not json", 400, "not valid JSON", "body", ""},
      {"api: JSON not an object", "JSON", "/api/sessions/1/passes", {}, "[1]", 400, "", "body", ""},
      {"api: body too large", "JSON", "/api/sessions/1/passes", {}, std::string(3u << 20, ' '), 413, "", "body", ""},
  };
}
// clang-format on

long long mis_keyed(store::Store& st) {
  store::Txn txn(st, store::Txn::read);
  const long long id = st.find_pass(1, "QX-4390").value();
  txn.commit();
  return id;
}

Response run(Client& cl, const Case& c) {
  const std::string m = c.method;
  if (m == "GET") return cl.get(c.path, c.form);
  if (m == "POST") return cl.post(c.path, c.form);
  if (m == "JSON") return cl.post_json(c.path, c.json);
  Request r;
  r.method = m;
  r.path = c.path;
  return cl.send(r);
}

}  // namespace

TEST_CASE("every endpoint answers as the contract says, bad inputs included") {
  storetest::TempStore ts;
  load_demo(*ts.store);
  Config cfg;
  cfg.db_path = ts.path;
  Console console(cfg);
  Client cl{console, {}, ""};
  cl.get("/sessions");  // the visitor cookie and the form token
  for (const Case& c : cases(mis_keyed(*ts.store))) {
    const std::string what = "case: " + std::string(c.name) + " (" + c.method + " " + c.path + ")";
    INFO(what);
    const Response r = run(cl, c);
    CAPTURE(r.body.substr(0, 400));
    CHECK(r.status == c.status);
    if (!c.body_has.empty()) CHECK(r.body.find(c.body_has) != std::string::npos);
    if (!c.location.empty()) CHECK(r.header("Location").rfind(c.location, 0) == 0);
    if (!c.field.empty()) {
      const auto j = nlohmann::json::parse(r.body);
      if (c.field == "-") {
        CHECK(j.at("field").is_null());
      } else {
        CHECK(j.value("field", nlohmann::json()) == c.field);
      }
    }
  }
  // After the re-key the fit passes: the verdict is no longer not-proven.
  const auto result = nlohmann::json::parse(cl.get("/api/sessions/1").body);
  CHECK(result.at("verdict") == "over");  // the demo's GV-1 rig is over its GVWR once re-keyed
  // Open sessions come first.
  const auto list = nlohmann::json::parse(cl.get("/api/sessions").body);
  REQUIRE(list.size() == 2);
  CHECK(list[0].at("status") == "open");
  CHECK(list[1].at("status") == "closed");
}

TEST_CASE("the desk leads with the verdict and names the reading the fit names") {
  storetest::TempStore ts;
  load_demo(*ts.store);
  Config cfg;
  cfg.db_path = ts.path;
  Console console(cfg);
  Client cl{console, {}, ""};
  const Response r = cl.get("/sessions/1");
  REQUIRE(r.status == 200);
  const std::size_t main = r.body.find("<main");
  const std::size_t first = r.body.find('<', r.body.find('>', main) + 1);
  CHECK(r.body.compare(first, 41, "<p id=\"verdict\" data-verdict=\"not-proven\"") == 0);
  CHECK(r.body.find("class=\"flag") != std::string::npos);
  CHECK(r.body.find("drive reading of ticket QX-4390") != std::string::npos);
  CHECK(r.body.find("href=\"#pass-" + std::to_string(mis_keyed(*ts.store)) + "\">See the pass") !=
        std::string::npos);
  for (const char* id : {"id=\"flags\"", "id=\"passes\"", "id=\"pass-form\"", "id=\"pass-submit\"",
                         "id=\"close-session\"", "class=\"void\""}) {
    const std::string what = id;
    INFO(what);
    CHECK(r.body.find(id) != std::string::npos);
  }
  CHECK(r.body.find("id=\"issue-report\"") == std::string::npos);  // no --key
  // One click from the flag: void the named pass, then the form holds its values.
  cl.get("/sessions/1");
  const std::string bad = std::to_string(mis_keyed(*ts.store));
  CHECK(r.body.find("<form class=\"rekey\" method=\"post\" action=\"/sessions/1/passes/" + bad +
                    "/void\">") != std::string::npos);
  const Response v = cl.post("/sessions/1/passes/" + bad + "/void",
                             {{"reason", "the fit names the drive reading; re-keyed"}});
  CHECK(v.status == 303);
  CHECK(cl.get("/sessions/1", {{"rekey", bad}}).body.find("value=\"4400\"") != std::string::npos);
}
