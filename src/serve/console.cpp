#include "serve/console.h"

#include <nlohmann/json.hpp>

#include "core/embedded.h"
#include "core/error.h"
#include "serve/handlers.h"
#include "serve/html.h"

namespace sp::serve {

namespace {

// No script, style or frame from anywhere but this server; forms post only here; no plug-ins.
constexpr const char* kCsp =
    "default-src 'self'; script-src 'self'; style-src 'self'; img-src 'self' data:; "
    "object-src 'none'; base-uri 'none'; form-action 'self'; frame-ancestors 'none'";
constexpr const char* kVisitCookie = "sp_visit";
constexpr const char* kSignInCookie = "sp_op";

struct Route {
  const char* method;
  std::vector<std::string> parts;  // "*" matches one id segment
  Handler handler;
  bool writes;  // needs the CSRF token (forms) and, with --operators, a signed-in operator
  bool html;    // served as a page
  bool api;     // served under /api/
};

const std::vector<Route>& routes() {
  static const std::vector<Route> table = {
      {"GET", {"sessions"}, sessions_list, false, true, true},
      {"GET", {"sessions", "new"}, session_new_form, false, true, false},
      {"POST", {"sessions"}, session_open, true, true, true},
      {"GET", {"rigs", "new"}, rig_new_form, false, true, false},
      {"POST", {"rigs"}, rig_add, true, true, true},
      {"GET", {"sessions", "*"}, desk, false, true, true},
      {"POST", {"sessions", "*", "passes"}, pass_add, true, true, true},
      {"POST", {"sessions", "*", "passes", "*", "void"}, pass_void, true, true, true},
      {"POST", {"sessions", "*", "close"}, session_close, true, true, true},
      {"POST", {"sessions", "*", "report"}, report_issue, true, true, true},
      {"GET", {"sessions", "*", "reports", "*"}, report_download, false, true, true},
      {"GET", {"sessions", "*", "plan"}, plan_page, false, true, true},
      {"GET", {"sessions", "*", "history"}, session_history, false, true, true},
      {"GET", {"verify"}, verify_form, false, true, false},
      {"POST", {"verify"}, verify_post, false, true, true},
      {"GET", {"ledger"}, ledger, false, true, true},
      {"GET", {"signin"}, signin_form, false, true, false},
      {"POST", {"signin"}, signin_post, false, true, false},
      {"POST", {"signout"}, signout, false, true, false},
  };
  return table;
}

std::vector<std::string> split_path(const std::string& path) {
  std::vector<std::string> out;
  std::size_t from = 1;
  while (from <= path.size()) {
    std::size_t slash = path.find('/', from);
    if (slash == std::string::npos) slash = path.size();
    if (slash > from) out.push_back(path.substr(from, slash - from));
    from = slash + 1;
  }
  return out;
}

bool match(const Route& r, const std::vector<std::string>& parts, std::vector<std::string>& args) {
  if (r.parts.size() != parts.size()) return false;
  args.clear();
  for (std::size_t i = 0; i < parts.size(); ++i) {
    if (r.parts[i] == "*") {
      args.push_back(parts[i]);
    } else if (r.parts[i] != parts[i]) {
      return false;
    }
  }
  return true;
}

int status_of(ExitCode code) {
  switch (code) {
    case ExitCode::data_error:
    case ExitCode::usage:
      return 400;
    case ExitCode::no_input:
      return 404;
    case ExitCode::cant_create:  // "already exists": a duplicate ticket, rig or session key
      return 409;
    case ExitCode::temp_fail:
      return 503;
    case ExitCode::check_failed:
      return 422;
    default:
      return 500;
  }
}

// The request field a message names: its leading "name: " when that is a plain field name
// (format/validate.h messages start with the field); "name VALUE: " when the request's field
// `name` holds VALUE (the store's "ticket T-1: already in session 3"); and the platform of a
// store message about a reading ("ticket T-1, pass tensioned, drive platform: ...").
std::optional<std::string> field_of(const std::string& message, const Request* req) {
  const std::size_t colon = message.find(": ");
  if (colon == std::string::npos || colon == 0) return std::nullopt;
  const std::string lead = message.substr(0, colon);
  bool plain = true;
  for (char ch : lead) plain = plain && ((ch >= 'a' && ch <= 'z') || ch == '_');
  if (plain) return lead;
  for (const char* platform : {"steer", "drive", "trailer"}) {
    const std::string tail = std::string(", ") + platform + " platform";
    if (lead.size() > tail.size() &&
        lead.compare(lead.size() - tail.size(), tail.size(), tail) == 0)
      return std::string(platform);
  }
  const std::size_t space = lead.find(' ');
  if (req != nullptr && space != std::string::npos) {
    auto it = req->form.find(lead.substr(0, space));
    if (it != req->form.end() && it->second == lead.substr(space + 1)) return it->first;
  }
  return std::nullopt;
}

Response error_response(bool api, const Call* call, int status, const std::string& message,
                        std::optional<std::string> field) {
  Response r;
  if (api || call == nullptr) {
    nlohmann::ordered_json j;
    j["error"] = message;
    j["field"] = field ? nlohmann::ordered_json(*field) : nlohmann::ordered_json();
    r = json_response(status, j.dump());
  } else {
    r = html_response(status, page(*call, "Not done",
                                   "<h1>Not done</h1>\n" + error_box(message) +
                                       "<p><a href=\"/sessions\">Back to the sessions</a></p>\n"));
  }
  if (status == 503) r.headers.emplace_back("Retry-After", "1");
  return r;
}

// JSON object members become form fields (strings as they are, numbers as JSON writes them).
void json_into_form(const std::string& body, std::map<std::string, std::string>& form) {
  nlohmann::json j;
  try {
    j = nlohmann::json::parse(body);
  } catch (const nlohmann::json::exception& e) {
    throw data_error(std::string("body: not valid JSON: ") + e.what());
  }
  if (!j.is_object()) throw data_error("body: expected a JSON object of fields");
  for (auto it = j.begin(); it != j.end(); ++it) {
    if (it->is_string()) {
      form[it.key()] = it->get<std::string>();
    } else if (it->is_number() || it->is_boolean()) {
      form[it.key()] = it->dump();
    } else if (!it->is_null()) {
      throw data_error(it.key() + ": expected a string or a number");
    }
  }
}

void add_security_headers(Response& r) {
  r.headers.emplace_back("Content-Security-Policy", kCsp);
  r.headers.emplace_back("X-Content-Type-Options", "nosniff");
  r.headers.emplace_back("Referrer-Policy", "no-referrer");
  r.headers.emplace_back("X-Frame-Options", "DENY");
  bool cached = false;
  for (const auto& [k, v] : r.headers) cached = cached || k == "Cache-Control";
  if (!cached) r.headers.emplace_back("Cache-Control", "no-store");
}

std::string cookie(const Request& req, const char* name) {
  auto it = req.cookies.find(name);
  return it == req.cookies.end() ? std::string() : it->second;
}

Response asset(const std::string& name) {
  for (const auto& f : embedded::console_files()) {
    if (f.name != name) continue;
    Response r;
    r.content_type = name.size() > 4 && name.substr(name.size() - 4) == ".css"
                         ? "text/css; charset=utf-8"
                         : "application/octet-stream";
    r.body = std::string(f.contents);
    r.headers.emplace_back("Cache-Control", "max-age=3600");
    return r;
  }
  return json_response(404, R"({"error":"no such file","field":null})");
}

}  // namespace

std::unique_ptr<store::Store> Console::State::open_store() const {
  store::Options o;
  o.busy_timeout_ms = config.busy_timeout_ms;
  return store::open_sqlite_store(config.db_path, o);
}

const std::string& Call::field(const std::string& name) const {
  static const std::string none;
  auto it = req.form.find(name);
  return it == req.form.end() ? none : it->second;
}

bool Call::has(const std::string& name) const {
  return req.form.count(name) != 0;
}

long long Call::id(std::size_t i) const {
  const std::string& s = args.at(i);
  long long v = 0;
  if (s.empty() || s.size() > 15) throw Error(ExitCode::no_input, "no such page: " + req.path);
  for (char ch : s) {
    if (ch < '0' || ch > '9') throw Error(ExitCode::no_input, "no such page: " + req.path);
    v = v * 10 + (ch - '0');
  }
  if (v < 1) throw Error(ExitCode::no_input, "no such page: " + req.path);
  return v;
}

Response json_response(int status, const std::string& body) {
  Response r;
  r.status = status;
  r.content_type = "application/json";
  r.body = body;
  if (r.body.empty() || r.body.back() != '\n') r.body += "\n";
  return r;
}

Response redirect(const std::string& to) {
  Response r;
  r.status = 303;
  r.headers.emplace_back("Location", to);
  r.body = "<!DOCTYPE html><title>See other</title><a href=\"" + esc(to) + "\">Continue</a>\n";
  return r;
}

Response html_response(int status, const std::string& html) {
  Response r;
  r.status = status;
  r.body = html;
  return r;
}

Console::Console(Config config) : state_(std::make_unique<State>()) {
  state_->config = std::move(config);
  state_->secret = random_bytes(32);
}

Console::~Console() = default;

const Config& Console::config() const {
  return state_->config;
}

Response Console::handle(const Request& in) noexcept {
  Response out;
  try {
    Request req = in;
    std::vector<std::string> parts = split_path(req.path);
    const bool api = !parts.empty() && parts[0] == "api";
    if (api) parts.erase(parts.begin());

    // The visitor id that CSRF tokens are bound to: set on the first response.
    std::string visit = cookie(req, kVisitCookie);
    bool new_visit = false;
    if (visit.size() != 32) {
      visit = hex(random_bytes(16));
      new_visit = true;
    }
    Call call{req,          *state_,     api, {}, hmac_hex(state_->secret, "csrf:" + visit),
              std::nullopt, std::nullopt};
    if (state_->config.operators)
      call.operator_name = state_->signins.who(cookie(req, kSignInCookie));
    call.entered_by = state_->config.operators ? call.operator_name : state_->config.local_operator;

    auto finish = [&](Response r) {
      if (new_visit) {
        r.headers.emplace_back("Set-Cookie", std::string(kVisitCookie) + "=" + visit +
                                                 "; Path=/; HttpOnly; SameSite=Strict");
      }
      add_security_headers(r);
      return r;
    };

    if (req.body.size() > state_->config.max_body) {
      return finish(
          error_response(api, &call, 413,
                         "body: larger than " + std::to_string(state_->config.max_body) + " bytes",
                         std::string("body")));
    }
    if (!api && parts.size() == 2 && parts[0] == "assets" && req.method == "GET") {
      return finish(asset(parts[1]));
    }
    if (!api && parts.empty()) return finish(redirect("/sessions"));

    const Route* route = nullptr;
    bool path_known = false;
    for (const Route& r : routes()) {
      if (!(api ? r.api : r.html)) continue;
      if (!match(r, parts, call.args)) continue;
      path_known = true;
      if (req.method == r.method) {
        route = &r;
        break;
      }
    }
    if (route == nullptr) {
      if (path_known) return finish(error_response(api, &call, 405, "method not allowed", {}));
      return finish(error_response(api, &call, 404, "no such page: " + req.path, {}));
    }

    const std::string ctype =
        req.headers.count("content-type") ? req.headers.at("content-type") : "";
    const bool json_body = ctype.rfind("application/json", 0) == 0;
    if (req.method == "POST") {
      // A page of another site can post a form here; it cannot read the token, nor send a
      // JSON body without the browser asking first (CORS preflight, never answered here).
      if (auto o = req.headers.find("origin"); o != req.headers.end() && o->second != "null") {
        const std::string host = req.headers.count("host") ? req.headers.at("host") : "";
        if (o->second != "http://" + host && o->second != "https://" + host) {
          return finish(error_response(api, &call, 403, "csrf: the request came from another site",
                                       std::string("csrf")));
        }
      }
      if (json_body && !req.body.empty()) json_into_form(req.body, req.form);
      const bool token_needed = !(api && json_body) && route->handler != nullptr &&
                                !(api && route->parts.size() == 1 && route->parts[0] == "verify");
      if (token_needed) {
        std::string token = call.field("csrf");
        if (token.empty() && req.headers.count("x-csrf-token"))
          token = req.headers.at("x-csrf-token");
        if (!same_token(token, call.csrf)) {
          return finish(error_response(
              api, &call, 403,
              "csrf: the form's token is missing or stale; reload the page and send it again",
              std::string("csrf")));
        }
      }
      if (route->writes && state_->config.operators && !call.operator_name) {
        return finish(error_response(api, &call, 403,
                                     "operator: sign in first (/signin): every change names who "
                                     "made it",
                                     std::string("operator")));
      }
    }
    try {
      return finish(route->handler(call));
    } catch (const Error& e) {
      const int status = status_of(e.code());
      return finish(
          error_response(api, &call, status, e.what(),
                         status == 400 || status == 409 ? field_of(e.what(), &req) : std::nullopt));
    }
  } catch (const Error& e) {
    out = error_response(true, nullptr, status_of(e.code()), e.what(), field_of(e.what(), nullptr));
  } catch (const std::exception& e) {
    out = error_response(true, nullptr, 500, std::string("internal error: ") + e.what(), {});
  } catch (...) {
    out = error_response(true, nullptr, 500, "internal error", {});
  }
  add_security_headers(out);
  return out;
}

}  // namespace sp::serve
