// The ledger (check-store's proof: rows, head hash), the plan of a session, and sign-in.
#include <fmt/format.h>

#include <chrono>
#include <nlohmann/json.hpp>

#include "audit/ledger_proof.h"
#include "audit/ledger_proof_json.h"
#include "format/plan_output.h"
#include "ops/plan_session.h"
#include "serve/handlers.h"
#include "serve/html.h"
#include "serve/plan_svg.h"

namespace sp::serve {

namespace {
std::string fmt_weight(double v) {
  return fmt::format("{:.0f}", v);
}
}  // namespace

Response ledger(const Call& c) {
  auto db = c.st.open_store();
  store::Txn txn(*db, store::Txn::read);
  const audit::LedgerProof p = audit::prove_ledger(*db, audit::ProofOptions{});
  txn.commit();
  if (c.api) return json_response(p.ok() ? 200 : 422, audit::proof_json(p).dump(2));
  std::string h =
      "<p id=\"ledger-verdict\" data-ok=\"" + std::string(p.ok() ? "true" : "false") +
      "\" class=\"verify " + (p.ok() ? "holds" : "fails") +
      "\"><strong>check-store: " + (p.ok() ? "ok" : "FAILED") +
      "</strong></p>\n<h1>Ledger</h1>\n<p>Rows: <span "
      "id=\"ledger-rows\">" +
      std::to_string(p.chain.rows) + "</span>. Head hash: <code id=\"ledger-head\">" +
      esc(p.chain.ok ? (p.chain.head.empty() ? "(empty store)" : p.chain.head) : "(none proven)") +
      "</code></p>\n";
  if (!p.chain.ok) {
    h += error_box("first bad row: " + p.chain.table + " id " + std::to_string(p.chain.id) +
                   ", chain position " + std::to_string(p.chain.seq) + ": " + p.chain.problem);
  }
  for (const auto& f : p.failures) h += error_box(f);
  h += "<ul id=\"ledger-notes\">";
  for (const auto& n : p.notes) h += "<li>" + esc(n) + "</li>";
  h += "</ul>\n<p>Signed checkpoints: " + std::to_string(p.checkpoints.size()) +
       ". Each session's history, voids included, is under its desk (History).</p>\n";
  return html_response(200, page(c, "Ledger", h));
}

Response plan_page(const Call& c) {
  const long long id = c.id(0);
  auto db = c.st.open_store();
  store::Txn txn(*db, store::Txn::read);
  const Session s = db->load_session(id);
  txn.commit();
  const ops::SessionPlan sp = ops::plan_of_session(s, "session " + std::to_string(id));
  if (c.api) return json_response(200, plan_to_json(sp.plan, sp.labels).dump(2));
  const std::string sid = std::to_string(id);
  std::string h = verdict_line(sp.labels.verdict, sp.labels.verdict_reason);
  h += "<h1>Plan for session " + sid + "</h1>\n<p>" +
       std::string(sp.plan.trailer_type == TrailerType::fifth_wheel ? "Hitched" : "Bars slack") +
       " from " + esc(sp.plan.baseline.source) + ".</p>\n";
  PlanSvgOptions chart;
  chart.title = sp.labels.tow + " + " + sp.labels.trailer;
  chart.weighed = sp.labels.weighed;
  h += "<figure>" + plan_svg(sp.plan, chart) +
       "<figcaption>Axle loads against bar moment, the moment for the front axle load "
       "restoration target and every rating line.</figcaption></figure>\n";
  h += "<table id=\"plan-ratings\"><caption>Ratings across the bar moments</caption><thead><tr>"
       "<th scope=\"col\">Rating</th><th scope=\"col\">Limit</th><th scope=\"col\">Exceeded"
       "</th></tr></thead><tbody>\n";
  for (const auto& g : sp.plan.ratings) {
    h += "<tr data-rating=\"" + esc(g.rating) + "\"><td>" + esc(g.label) + "</td><td>" +
         esc(fmt_weight(g.limit)) + "</td><td>" + esc(exceeded_words(g, sp.plan)) + "</td></tr>\n";
  }
  h += "</tbody></table>\n<ul>";
  for (const auto& n : sp.plan.notes) h += "<li>" + esc(n) + "</li>";
  h += "</ul>\n<p><a href=\"/sessions/" + sid + "\">Back to the desk</a></p>\n";
  return html_response(200, page(c, "Plan for session " + sid, h));
}

Response signin_form(const Call& c) {
  std::string h = "<h1>Sign in</h1>\n<form id=\"signin\" method=\"post\" action=\"/signin\">" +
                  csrf_input(c) +
                  "\n<p><label for=\"name\">Operator</label> <input id=\"name\" name=\"name\" "
                  "autocomplete=\"username\" required></p>\n<p><label "
                  "for=\"password\">Password</label> <input id=\"password\" name=\"password\" "
                  "type=\"password\" autocomplete=\"current-password\" required></p>\n<p><button "
                  "type=\"submit\">Sign in</button></p></form>\n";
  if (!c.st.config.operators)
    h += "<p>This console runs without operators: no sign-in needed.</p>\n";
  return html_response(200, page(c, "Sign in", h));
}

Response signin_post(const Call& c) {
  if (!c.st.config.operators) return redirect("/sessions");
  const long long now = std::chrono::duration_cast<std::chrono::seconds>(
                            std::chrono::steady_clock::now().time_since_epoch())
                            .count();
  const std::string& name = c.field("name");
  if (const long long wait = c.st.throttle.wait_seconds(name, now); wait > 0) {
    Response r = html_response(
        429, page(c, "Sign in",
                  "<h1>Sign in</h1>\n" +
                      error_box(fmt::format("name: too many failed sign-ins for this name; try "
                                            "again in {} s",
                                            wait)) +
                      "<p><a href=\"/signin\">Back to sign-in</a></p>\n"));
    r.headers.emplace_back("Retry-After", std::to_string(wait));
    return r;
  }
  const OperatorEntry* found = nullptr;
  for (const auto& o : *c.st.config.operators) {
    if (o.name == c.field("name")) found = &o;
  }
  // The same work for an unknown name, so the time taken does not tell names apart.
  const OperatorEntry dummy{"", kPbkdf2Iterations, std::string(16, 'x'), std::string(32, '\0')};
  bool ok = false;
  {
    std::lock_guard<std::mutex> lock(c.st.password_mu);
    ok = password_matches(found ? *found : dummy, c.field("password")) && found;
  }
  if (ok) {
    c.st.throttle.succeeded(name);
  } else {
    c.st.throttle.failed(name, now);
  }
  if (!ok) {
    return html_response(403, page(c, "Sign in",
                                   "<h1>Sign in</h1>\n" +
                                       error_box("name: the name or the password does not match") +
                                       "<p><a href=\"/signin\">Try again</a></p>\n"));
  }
  Response r = redirect("/sessions");
  r.headers.emplace_back("Set-Cookie", "sp_op=" + c.st.signins.sign_in(found->name) +
                                           "; Path=/; HttpOnly; SameSite=Strict");
  return r;
}

Response signout(const Call& c) {
  auto it = c.req.cookies.find("sp_op");
  if (it != c.req.cookies.end()) c.st.signins.sign_out(it->second);
  Response r = redirect("/sessions");
  r.headers.emplace_back("Set-Cookie", "sp_op=; Path=/; HttpOnly; SameSite=Strict; Max-Age=0");
  return r;
}

}  // namespace sp::serve
