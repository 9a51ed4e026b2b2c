// Inside the console: what each handler gets, and the handlers by page (pages_*.cpp).
// A handler reads a Call and returns a Response or throws sp::Error; console.cpp turns the
// error into the response (HTML page or JSON) and adds the security headers.
#pragma once
#include <functional>
#include <map>
#include <memory>
#include <mutex>
#include <optional>
#include <string>
#include <vector>

#include "core/error.h"
#include "engine/result.h"
#include "serve/console.h"
#include "store/store.h"

namespace sp::serve {

// An issued report kept for download (the PDF and its detached signature), by report id.
struct Download {
  long long session = 0;
  std::string pdf, sig;
};

struct Console::State {
  Config config;
  std::string secret;  // CSRF key, random per process
  SignIns signins;
  SignInThrottle throttle;
  std::mutex password_mu;  // one PBKDF2 check at a time (~0.3 s of a core): a flood of
                           // sign-ins takes one core at most, never the whole machine
  std::mutex reports_mu;
  std::map<std::string, Download> reports;  // the last kMaxDownloads issued
  std::vector<std::string> report_order;
  std::mutex sign_mu;  // one signature at a time on the signer

  std::unique_ptr<store::Store> open_store() const;
};

struct Call {
  const Request& req;
  Console::State& st;
  bool api = false;                          // under /api/
  std::vector<std::string> args;             // the {id} parts of the path, in order
  std::string csrf;                          // the token forms on this page carry
  std::optional<std::string> operator_name;  // signed in (with --operators)
  // Who a write is recorded as: the signed-in operator, else (no --operators) the local user.
  std::optional<std::string> entered_by;

  const std::string& field(const std::string& name) const;  // "" when absent
  bool has(const std::string& name) const;
  long long id(std::size_t i) const;  // args[i] as a positive id (404 otherwise)
};

using Handler = std::function<Response(const Call&)>;

// Builders.
Response json_response(int status, const std::string& body);
Response redirect(const std::string& to);  // 303 See Other
Response html_response(int status, const std::string& html);

// pages_sessions.cpp
Response sessions_list(const Call& c);
Response session_new_form(const Call& c);
Response session_open(const Call& c);
Response rig_new_form(const Call& c);
Response rig_add(const Call& c);
// pages_desk.cpp
Response desk(const Call& c);
Response pass_add(const Call& c);
Response pass_void(const Call& c);
Response session_close(const Call& c);
Response session_history(const Call& c);
// pages_report.cpp
Response report_issue(const Call& c);
Response report_download(const Call& c);
Response verify_form(const Call& c);
Response verify_post(const Call& c);
// pages_ledger.cpp
Response ledger(const Call& c);
Response plan_page(const Call& c);
Response signin_form(const Call& c);
Response signin_post(const Call& c);
Response signout(const Call& c);

}  // namespace sp::serve

namespace sp::serve {

// A session as the pages show its result: the engine's result when it solves, else the
// engine's refusal, shown as not-proven with the refusal as the reason (RULES.md: when in
// doubt say "not proven").
struct Reconciled {
  std::optional<ReconcileResult> result;
  Verdict verdict = Verdict::not_proven;
  std::string reason;
  std::string error;  // the engine's message when it refused
};
Reconciled reconcile_for_page(const Session& s);

// Re-throws the library's own refusal as a conflict (409) when `duplicate` holds.
[[noreturn]] void rethrow_as(bool duplicate, const Error& e);
// "" -> nullopt.
std::optional<std::string> opt(const std::string& v);

}  // namespace sp::serve
