// The console's guards, in process: CSRF on every form post, headers on every response,
// escaping, a busy store, operators and sign-in, and PBKDF2 against a published vector.
#include <nlohmann/json.hpp>

#include "serve/auth.h"
#include "serve/html.h"
#include "unit/serve_fixture.h"

using namespace servetest;

namespace {

Config config_for(const storetest::TempStore& ts) {
  Config c;
  c.db_path = ts.path;
  return c;
}

const std::map<std::string, std::string> kPass = {{"kind", "unhitched"},
                                                  {"ticket", "QX-5000"},
                                                  {"weighed_at", "2026-10-21T15:00:00-06:00"},
                                                  {"steer", "3560"},
                                                  {"drive", "2880"}};

// The console of `ts` with one operator, Ines Varga, password "correct horse". 1000 PBKDF2
// iterations keep the tests fast; `operator add` always writes kPbkdf2Iterations.
Config with_one_operator(const storetest::TempStore& ts) {
  Config cfg = config_for(ts);
  cfg.operators = parse_operators(operator_line("Ines Varga", "correct horse", 1000) + "\n", "ops");
  return cfg;
}

}  // namespace

TEST_CASE("a form post without the right CSRF token is refused and writes nothing") {
  storetest::TempStore ts;
  load_demo(*ts.store);
  Console console(config_for(ts));
  Client cl{console, {}, ""};
  cl.get("/sessions/1");
  const long long before = rows(*ts.store);
  struct Case {
    const char* name;
    std::string token;
  } cases[] = {{"no token", ""}, {"a wrong token", std::string(64, 'a')}, {"a short token", "ab"}};
  for (const auto& c : cases) {
    const std::string what = c.name;
    INFO(what);
    auto form = kPass;
    form["csrf"] = c.token;
    const Response r = cl.post("/sessions/1/passes", form, false);
    CHECK(r.status == 403);
    CHECK(r.body.find("csrf") != std::string::npos);
  }
  // Another visitor's token does not fit this visitor's cookie.
  Client other{console, {}, ""};
  other.get("/sessions/1");
  auto form = kPass;
  form["csrf"] = other.csrf;
  CHECK(cl.post("/sessions/1/passes", form, false).status == 403);
  // A form posted from another site is refused whatever it carries.
  Request r;
  r.method = "POST";
  r.path = "/sessions/1/passes";
  r.form = kPass;
  r.form["csrf"] = cl.csrf;
  r.headers["origin"] = "http://elsewhere.invalid";
  r.headers["host"] = "127.0.0.1:8080";
  CHECK(cl.send(r).status == 403);
  CHECK(rows(*ts.store) == before);
  // With the token it goes through.
  CHECK(cl.post("/sessions/1/passes", kPass).status == 303);
  CHECK(rows(*ts.store) == before + 1);
}

TEST_CASE("every response carries the security headers") {
  storetest::TempStore ts;
  load_demo(*ts.store);
  Console console(config_for(ts));
  Client cl{console, {}, ""};
  for (const char* path : {"/sessions", "/api/sessions", "/nothing", "/assets/console.css", "/"}) {
    const std::string what = path;
    INFO(what);
    const Response r = cl.get(path);
    CHECK(r.header("Content-Security-Policy").rfind("default-src 'self'", 0) == 0);
    CHECK(r.header("Content-Security-Policy").find("unsafe-inline") == std::string::npos);
    CHECK(r.header("X-Content-Type-Options") == "nosniff");
    CHECK(r.header("Referrer-Policy") == "no-referrer");
  }
  const Response first = Client{console, {}, ""}.get("/sessions");
  CHECK(first.header("Set-Cookie").find("HttpOnly; SameSite=Strict") != std::string::npos);
}

TEST_CASE("every value on a page is escaped") {
  CHECK(esc("<script>alert('x') & \"y\"</script>") ==
        "&lt;script&gt;alert(&#39;x&#39;) &amp; &quot;y&quot;&lt;/script&gt;");
  storetest::TempStore ts;
  load_demo(*ts.store);
  Console console(config_for(ts));
  Client cl{console, {}, ""};
  cl.get("/sessions/new");
  REQUIRE(
      cl.post("/sessions", {{"rig", "RA-3"}, {"scale", "QX-1"}, {"label", "<b>k</b>"}}).status ==
      303);
  const Response r = cl.get("/sessions", {{"q", "<i>"}});
  CHECK(r.body.find("<i>") == std::string::npos);
  CHECK(r.body.find("&lt;i&gt;") != std::string::npos);
  const Response list = cl.get("/sessions");
  CHECK(list.body.find("<b>k</b>") == std::string::npos);
  CHECK(list.body.find("&lt;b&gt;k&lt;/b&gt;") != std::string::npos);
}

TEST_CASE("a busy store answers 503 with Retry-After and writes nothing") {
  storetest::TempStore ts;
  load_demo(*ts.store);
  Config cfg = config_for(ts);
  cfg.busy_timeout_ms = 50;
  Console console(cfg);
  Client cl{console, {}, ""};
  const long long before = rows(*ts.store);
  ts.store->begin_write();  // another writer holds the lock
  const Response r = cl.post_json("/api/sessions/1/passes", nlohmann::json(kPass).dump());
  ts.store->rollback();
  CHECK(r.status == 503);
  CHECK(r.header("Retry-After") == "1");
  CHECK(rows(*ts.store) == before);
}

TEST_CASE("with operators every write needs a signed-in operator, recorded as entered_by") {
  storetest::TempStore ts;
  load_demo(*ts.store);
  Console console(with_one_operator(ts));
  Client cl{console, {}, ""};
  cl.get("/signin");
  const long long before = rows(*ts.store);
  CHECK(cl.post("/sessions/1/passes", kPass).status == 403);
  CHECK(cl.post_json("/api/sessions/1/passes", nlohmann::json(kPass).dump()).status == 403);
  CHECK(cl.post("/signin", {{"name", "Ines Varga"}, {"password", "wrong"}}).status == 403);
  CHECK(cl.post("/signin", {{"name", "Nobody"}, {"password", "correct horse"}}).status == 403);
  CHECK(rows(*ts.store) == before);
  const Response in = cl.post("/signin", {{"name", "Ines Varga"}, {"password", "correct horse"}});
  REQUIRE(in.status == 303);
  CHECK(cl.get("/sessions").body.find("Signed in: Ines Varga") != std::string::npos);
  REQUIRE(cl.post("/sessions/1/passes", kPass).status == 303);
  long long pass = 0;
  {
    store::Txn txn(*ts.store, store::Txn::read);
    pass = ts.store->find_pass(1, "QX-4388").value();
    txn.commit();
  }
  REQUIRE(cl.post("/sessions/1/passes/" + std::to_string(pass) + "/void", {{"reason", "test"}})
              .status == 303);
  {
    store::Txn txn(*ts.store, store::Txn::read);
    const auto h = ts.store->session_history(1);
    txn.commit();
    CHECK(h.session.passes.back().entered_by == std::optional<std::string>("Ines Varga"));
    REQUIRE(h.corrections.size() == 1);
    CHECK(h.corrections[0].made_by == std::optional<std::string>("Ines Varga"));
  }
  // Reads stay open; signing out ends the writes.
  CHECK(cl.post("/signout", {}).status == 303);
  CHECK(cl.post("/sessions/1/close", {}).status == 403);
}

TEST_CASE("operators file: PBKDF2-HMAC-SHA256 and its lines") {
  // RFC 7914 §11, PBKDF2-HMAC-SHA256 (P = "passwd", S = "salt", c = 1): the first 32 bytes of
  // the 64-byte test vector are T_1, which is the whole 32-byte output.
  OperatorEntry e;
  e.name = "t";
  e.iterations = 1;
  e.salt = "salt";
  const std::string want = "55ac046e56e3089fec1691c22544b605f94185216dde0465e68b9d57c20dacbc";
  for (std::size_t i = 0; i < want.size(); i += 2) {
    e.hash.push_back(static_cast<char>(std::stoi(want.substr(i, 2), nullptr, 16)));
  }
  CHECK(password_matches(e, "passwd"));
  CHECK_FALSE(password_matches(e, "passwe"));

  const std::string line = operator_line("Marit", "pw", 1000);
  const auto ops = parse_operators(line + "\n# note\n\n", "f");
  REQUIRE(ops.size() == 1);
  CHECK(ops[0].name == "Marit");
  CHECK(password_matches(ops[0], "pw"));
  CHECK(operator_line("Marit", "pw", 1000) != line);  // a new salt each time
  CHECK(kPbkdf2Iterations >= 600000);                 // OWASP Password Storage Cheat Sheet (2023)

  struct Bad {
    const char* name;
    std::string text;
    std::string message;
  } bad[] = {
      {"not five parts", "a:b\n", "f:1: expected NAME:pbkdf2-sha256"},
      {"other scheme", "a:md5:1:00:00\n", "f:1: expected NAME:pbkdf2-sha256"},
      {"bad iterations", "a:pbkdf2-sha256:x:00:" + std::string(64, '0') + "\n", "f:1: iterations"},
      {"bad salt", "a:pbkdf2-sha256:5:zz:" + std::string(64, '0') + "\n", "f:1: salt"},
      {"short hash", "a:pbkdf2-sha256:5:00:00\n", "f:1: hash"},
      {"name twice", line + "\n" + line + "\n", "f:2: operator Marit is listed twice"},
  };
  for (const auto& b : bad) {
    const std::string what = b.name;
    INFO(what);
    CHECK_THROWS_WITH(parse_operators(b.text, "f"), doctest::Contains(b.message.c_str()));
  }
  CHECK_THROWS_WITH(check_operator_name("a:b"), doctest::Contains("--name"));
  CHECK_THROWS_WITH(check_operator_name(""), doctest::Contains("--name"));
}

TEST_CASE("without operators a write is recorded as the local user, as the CLI records it") {
  // Parity with `pass add` / `pass void` (cli/store_cli.h who(): $SCALEPROOF_OPERATOR, else
  // $USER): the ledger row names who keyed it on either surface; the page claims no sign-in.
  storetest::TempStore ts;
  load_demo(*ts.store);
  Config cfg = config_for(ts);
  cfg.local_operator = "Ottilie Ferncastle";
  Console console(cfg);
  Client cl{console, {}, ""};
  CHECK(cl.get("/sessions/1").body.find("Signed in:") == std::string::npos);
  REQUIRE(cl.post("/sessions/1/passes", kPass).status == 303);
  store::Txn txn(*ts.store, store::Txn::read);
  const auto h = ts.store->session_history(1);
  txn.commit();
  CHECK(h.session.passes.back().entered_by == std::optional<std::string>("Ottilie Ferncastle"));
}

TEST_CASE("sign-in: five failures lock the name for a minute, then it may try again") {
  // SignInThrottle (serve/auth.h): threshold and lock period of the OWASP Authentication Cheat
  // Sheet's account lockout; 5 tries and 60 s are common practice.
  SignInThrottle t;
  const long long t0 = 1000;
  for (int i = 0; i < SignInThrottle::kMaxFailures - 1; ++i) t.failed("Ines Varga", t0);
  CHECK(t.wait_seconds("Ines Varga", t0) == 0);
  t.failed("Ines Varga", t0);
  CHECK(t.wait_seconds("Ines Varga", t0) == SignInThrottle::kLockSeconds);
  CHECK(t.wait_seconds("Ines Varga", t0 + 59) == 1);
  CHECK(t.wait_seconds("Ines Varga", t0 + 60) == 0);
  CHECK(t.wait_seconds("Someone Else", t0) == 0);
  t.failed("Ines Varga", t0 + 60);  // the count started again after the lock
  CHECK(t.wait_seconds("Ines Varga", t0 + 60) == 0);
  t.succeeded("Ines Varga");
  // Names beyond the cap are not tracked while every tracked one is locked (memory stays bounded).
  SignInThrottle full;
  for (std::size_t i = 0; i < SignInThrottle::kMaxNames; ++i)
    for (int k = 0; k < SignInThrottle::kMaxFailures; ++k) full.failed(std::to_string(i), t0);
  for (int k = 0; k < SignInThrottle::kMaxFailures; ++k) full.failed("one more", t0);
  CHECK(full.wait_seconds("one more", t0) == 0);
  CHECK(full.wait_seconds("0", t0) == SignInThrottle::kLockSeconds);
}

TEST_CASE("sign-in: the console answers 429 with Retry-After once a name is locked") {
  storetest::TempStore ts;
  load_demo(*ts.store);
  Console console(with_one_operator(ts));
  Client cl{console, {}, ""};
  cl.get("/signin");
  for (int i = 0; i < SignInThrottle::kMaxFailures; ++i)
    CHECK(cl.post("/signin", {{"name", "Ines Varga"}, {"password", "wrong"}}).status == 403);
  // Locked: even the right password is not checked now.
  const Response r = cl.post("/signin", {{"name", "Ines Varga"}, {"password", "correct horse"}});
  CHECK(r.status == 429);
  CHECK(!r.header("Retry-After").empty());
  CHECK(r.body.find("too many failed sign-ins") != std::string::npos);
  CHECK(cl.get("/sessions").body.find("Signed in:") == std::string::npos);
}
