// The session desk: the reconciled result (verdict first, flags in words naming the reading),
// the passes with "void" on each, the pass form, close; and the session's history.
#include <fmt/format.h>

#include <nlohmann/json.hpp>

#include "format/result_json.h"
#include "format/result_text.h"
#include "format/validate.h"
#include "serve/handlers.h"
#include "serve/html.h"

namespace sp::serve {

namespace {

std::string n0(double v) {
  return fmt::format("{:.0f}", v);
}
std::string num(double v) {
  return fmt::format("{}", v);
}

// The pass form's values: what was keyed (after a refusal), a voided pass to re-key, or blank.
struct PassFields {
  std::string kind = "tensioned", setting, ticket, weighed_at, steer, drive, trailer, gross;
};

PassFields fields_of(const Call& c) {
  PassFields f;
  for (auto [name, dst] : {std::pair{"kind", &f.kind},
                           {"setting", &f.setting},
                           {"ticket", &f.ticket},
                           {"weighed_at", &f.weighed_at},
                           {"steer", &f.steer},
                           {"drive", &f.drive},
                           {"trailer", &f.trailer},
                           {"gross", &f.gross}}) {
    if (c.has(name)) *dst = c.field(name);
  }
  return f;
}

std::string flag_item(const Call& c, const Flag& f, const Session& s, const std::string& unit,
                      bool open) {
  std::string h = "<li class=\"flag severity-" + std::string(to_string(f.severity)) +
                  "\" data-code=\"" + esc(f.code) + "\"><strong>" +
                  esc(std::string(to_string(f.severity))) + ":</strong> " + esc(f.message);
  if (f.ticket && f.platform) {
    h += "<br><span class=\"named\">The fit names the " + esc(*f.platform) + " reading of ticket " +
         esc(*f.ticket);
    if (f.needed) h += "; it would need about " + esc(n0(*f.needed)) + " " + esc(unit) + " to fit";
    h += ".</span>";
    for (const Pass& p : s.passes) {
      if (p.ticket != *f.ticket || p.voided || !p.id || !open) continue;
      // One click: void the named pass (the reason says why) and get the form back holding
      // its values, to key the corrected reading under the new ticket.
      const std::string pid = std::to_string(*p.id);
      h += " <form class=\"rekey\" method=\"post\" action=\"/sessions/" +
           std::to_string(*s.session_id) + "/passes/" + pid + "/void\">" + csrf_input(c) +
           "<input type=\"hidden\" name=\"reason\" value=\"" +
           esc("the fit names the " + *f.platform + " reading (" + f.code + "); re-keyed") +
           "\"><button type=\"submit\">Void and re-key</button></form> <a href=\"#pass-" + pid +
           "\">See the pass</a>";
    }
  } else if (f.field) {
    h += "<br><span class=\"named\">The fit names the tape length " + esc(*f.field);
    if (f.needed) h += "; it would need about " + esc(num(*f.needed)) + " to fit";
    h += ".</span>";
  }
  const std::string why = explain_flag(f.code);
  if (!why.empty()) h += "<br><span class=\"explain\">" + esc(why) + "</span>";
  return h + "</li>\n";
}

std::string result_block(const Call& c, const Reconciled& rec, const Session& s, bool open) {
  const std::string unit(to_string(s.units.weight));
  std::string h;
  if (!rec.result) return h;
  const ReconcileResult& r = *rec.result;
  h += "<section aria-labelledby=\"flags-h\"><h2 id=\"flags-h\">Flags</h2>\n<ul id=\"flags\">\n";
  for (const Flag& f : r.flags) h += flag_item(c, f, s, unit, open);
  h += "</ul>\n";
  if (r.flags.empty()) h += "<p>No flags.</p>\n";
  h += "</section>\n";
  if (r.if_excluded && r.if_excluded->result) {
    const ReconcileResult& x = *r.if_excluded->result;
    h += "<p class=\"provisional\">If the named value is the error, the rig without it would "
         "be <strong>" +
         std::string(to_string(x.verdict)) + "</strong>: " + esc(x.verdict_reason) +
         " (provisional: re-weigh to prove it).</p>\n";
  }
  if (!r.compliance.empty()) {
    h += "<table id=\"compliance\"><caption>Ratings (± is 2u, about 95 %)</caption><thead><tr>"
         "<th scope=\"col\">Rating</th><th scope=\"col\">Load</th><th scope=\"col\">Limit</th>"
         "<th scope=\"col\">Status</th></tr></thead><tbody>\n";
    for (const auto& row : r.compliance) {
      h += "<tr><td>" + esc(row.label) + "</td><td>" + n0(row.value) + " ± " + n0(2 * row.u) + " " +
           esc(unit) + "</td><td>" + n0(row.limit) + " " + esc(unit) + "</td><td class=\"" +
           std::string(to_string(row.status)) + "\">" + std::string(to_string(row.status)) +
           "</td></tr>\n";
    }
    h += "</tbody></table>\n";
  }
  if (r.target && r.target->setting) {
    h += "<p>Bar setting for " + n0(r.target->falr) +
         " % front axle load restoration: " + esc(setting_text(*r.target)) +
         (r.target->provisional ? " <strong>(PROVISIONAL: not to be relied on)</strong>" : "") +
         "</p>\n";
  }
  return h;
}

std::string passes_table(const Call& c, const Session& s, bool open) {
  const std::string sid = std::to_string(*s.session_id);
  std::string h = "<table id=\"passes\"><caption>Passes (" +
                  std::string(to_string(s.units.weight)) +
                  ")</caption><thead><tr><th scope=\"col\">Ticket</th><th scope=\"col\">Kind</th>"
                  "<th scope=\"col\">Setting</th><th scope=\"col\">Steer</th><th "
                  "scope=\"col\">Drive</th><th scope=\"col\">Trailer</th><th "
                  "scope=\"col\">Weighed at</th><th scope=\"col\">Void</th></tr></thead><tbody>\n";
  for (const Pass& p : s.passes) {
    const std::string pid = std::to_string(p.id.value_or(0));
    h += "<tr id=\"pass-" + pid + "\" data-pass=\"" + pid + "\" data-ticket=\"" + esc(p.ticket) +
         "\"" + (p.voided ? " class=\"voided\"" : "") + "><td>" + esc(p.ticket) + "</td><td>" +
         std::string(to_string(p.kind)) + "</td><td>" + esc(p.setting.value_or("")) + "</td><td>" +
         num(p.steer) + "</td><td>" + num(p.drive) + "</td><td>" +
         (p.trailer ? num(*p.trailer) : "") + "</td><td>" + esc(p.weighed_at) + "</td><td>";
    if (p.voided) {
      h += "void: " + esc(p.void_reason.value_or(""));
    } else if (open) {
      h += "<form class=\"void\" method=\"post\" action=\"/sessions/" + sid + "/passes/" + pid +
           "/void\">" + csrf_input(c) + "<label for=\"reason-" + pid +
           "\">Reason</label> "
           "<input id=\"reason-" +
           pid +
           "\" name=\"reason\" required value=\"keyed wrong; "
           "re-keyed\"> <button type=\"submit\">Void and re-key</button></form>";
    }
    h += "</td></tr>\n";
  }
  return h + "</tbody></table>\n";
}

std::string pass_form(const Call& c, const Session& s, const PassFields& f) {
  const std::string sid = std::to_string(*s.session_id);
  const std::string unit(to_string(s.units.weight));
  auto input = [&](const char* name, const char* label, const std::string& value,
                   const char* extra) {
    return std::string("<p><label for=\"") + name + "\">" + label + "</label> <input id=\"" + name +
           "\" name=\"" + name + "\" value=\"" + esc(value) + "\" " + extra + "></p>\n";
  };
  std::string h = "<form id=\"pass-form\" method=\"post\" action=\"/sessions/" + sid +
                  "/passes\">" + csrf_input(c) +
                  "\n<fieldset><legend>Key a pass</legend>\n<p><label for=\"kind\">Kind</label> "
                  "<select id=\"kind\" name=\"kind\">";
  for (const char* k : {"unhitched", "hitched", "tensioned"}) {
    h += std::string("<option value=\"") + k + "\"" + (f.kind == k ? " selected" : "") + ">" + k +
         "</option>";
  }
  h += "</select></p>\n";
  h += input("setting", "Bar setting (tensioned)", f.setting, "");
  h += input("ticket", "Ticket", f.ticket, "required autocomplete=\"off\"");
  h += input("weighed_at", "Weighed at (ISO 8601)",
             f.weighed_at.empty() ? store::now_utc() : f.weighed_at, "required");
  const std::string w = " (" + unit + ")";
  h += input("steer", ("Steer platform" + w).c_str(), f.steer, "required inputmode=\"decimal\"");
  h += input("drive", ("Drive platform" + w).c_str(), f.drive, "required inputmode=\"decimal\"");
  h += input("trailer", ("Trailer platform" + w).c_str(), f.trailer, "inputmode=\"decimal\"");
  h += input("gross", ("Printed gross, if any" + w).c_str(), f.gross, "inputmode=\"decimal\"");
  return h +
         "<p><button type=\"submit\" id=\"pass-submit\">Store the pass</button></p>"
         "</fieldset></form>\n";
}

Response desk_page(const Call& c, long long id, int status, const std::string& error,
                   const PassFields& fields) {
  auto db = c.st.open_store();
  store::Txn txn(*db, store::Txn::read);
  const store::SessionHistory hist = db->session_history(id);
  txn.commit();
  const Session& s = hist.session;
  const Reconciled rec = reconcile_for_page(s);
  if (c.api) {
    if (!rec.result) {
      return json_response(200,
                           nlohmann::ordered_json{{"session", id}, {"error", rec.error}}.dump());
    }
    return json_response(200, result_to_json(*rec.result).dump(2));
  }
  const bool open = !hist.closed_at;
  const std::string sid = std::to_string(id);
  std::string h = verdict_line(rec.verdict, rec.reason) + error_box(error);
  h += "<h1>Session " + sid + (hist.ref ? " (" + esc(*hist.ref) + ")" : "") + "</h1>\n<p>Rig " +
       esc(hist.rig_name) + ": " + esc(s.tow_vehicle.label) + " + " + esc(s.trailer.label) +
       "; scale " + esc(s.scale.id) + " (d = " + num(s.scale.division) + " " +
       std::string(to_string(s.units.weight)) + "); " +
       (open ? "open" : "closed " + esc(*hist.closed_at)) + ".</p>\n";
  h += result_block(c, rec, s, open);
  h += passes_table(c, s, open);
  if (open) {
    h += pass_form(c, s, fields);
    h += "<form id=\"close-session\" method=\"post\" action=\"/sessions/" + sid + "/close\">" +
         csrf_input(c) + "<button type=\"submit\">Close the session</button></form>\n";
  }
  if (c.st.config.signer) {
    h += "<form id=\"issue-report\" method=\"post\" action=\"/sessions/" + sid + "/report\">" +
         csrf_input(c) + "<button type=\"submit\">Issue the signed report</button></form>\n";
  }
  h += "<p class=\"links\"><a href=\"/sessions/" + sid +
       "/plan\">Plan (bar moment chart)</a> · "
       "<a href=\"/sessions/" +
       sid + "/history\">History</a></p>\n";
  return html_response(status, page(c, "Session " + sid, h));
}

double required_number(const Call& c, const char* name, const validate::FieldNames& names) {
  const std::string& s = c.field(name);
  if (s.empty())
    throw data_error(std::string(name) + ": missing; expected the " + name + "-platform reading");
  double v = 0;
  if (!validate::parse_number(s, v)) validate::not_a_number(s, name, names);
  return v;
}

std::optional<double> optional_number(const Call& c, const char* name,
                                      const validate::FieldNames& names) {
  if (c.field(name).empty()) return std::nullopt;
  return required_number(c, name, names);
}

long long store_pass(const Call& c, long long session) {
  const validate::PrefixNames names("");
  auto kind = parse_pass_kind(c.field("kind"));
  if (!kind) {
    throw data_error("kind: expected unhitched, hitched or tensioned, got " +
                     validate::quoted(c.field("kind")));
  }
  Pass p;
  p.kind = *kind;
  p.setting = opt(c.field("setting"));
  p.ticket = c.field("ticket");
  if (p.ticket.empty()) throw data_error("ticket: missing; expected the ticket number");
  p.weighed_at = c.field("weighed_at");
  if (p.weighed_at.empty())
    throw data_error("weighed_at: missing; expected the time on the ticket");
  p.steer = required_number(c, "steer", names);
  p.drive = required_number(c, "drive", names);
  p.trailer = optional_number(c, "trailer", names);
  p.gross = optional_number(c, "gross", names);
  p.entered_by = c.entered_by;
  auto db = c.st.open_store();
  store::Txn txn(*db, store::Txn::write);
  const Session s = db->load_session(session);
  validate::pass(p, s.units.weight, names);
  validate::pass_on_scale(p, s.scale, s.units.weight, names);
  long long id = 0;
  try {
    id = db->add_pass(session, p);
  } catch (const Error& e) {
    rethrow_as(db->find_pass(session, p.ticket).has_value(), e);
  }
  txn.commit();
  return id;
}

}  // namespace

Response desk(const Call& c) {
  PassFields f;
  // ?rekey=PID: the form holds that (voided) pass's values but its ticket, for re-keying.
  if (auto it = c.req.query.find("rekey"); it != c.req.query.end() && !c.api) {
    auto db = c.st.open_store();
    store::Txn txn(*db, store::Txn::read);
    const Session s = db->load_session(c.id(0));
    txn.commit();
    for (const Pass& p : s.passes) {
      if (p.id && std::to_string(*p.id) == it->second) {
        f.kind = std::string(to_string(p.kind));
        f.setting = p.setting.value_or("");
        f.weighed_at = p.weighed_at;
        f.steer = num(p.steer);
        f.drive = num(p.drive);
        f.trailer = p.trailer ? num(*p.trailer) : "";
        f.gross = p.gross ? num(*p.gross) : "";
      }
    }
  }
  return desk_page(c, c.id(0), 200, "", f);
}

Response pass_add(const Call& c) {
  const long long session = c.id(0);
  if (c.api) {
    const long long id = store_pass(c, session);
    return json_response(201, nlohmann::ordered_json{{"id", id}, {"session", session}}.dump());
  }
  try {
    store_pass(c, session);
  } catch (const Error& e) {
    // The desk again, the refusal on top and the values as keyed, so the reading is fixed
    // while the rig is still on the scale. Nothing was stored.
    if (e.code() != ExitCode::data_error && e.code() != ExitCode::cant_create) throw;
    return desk_page(c, session, e.code() == ExitCode::cant_create ? 409 : 400, e.what(),
                     fields_of(c));
  }
  return redirect("/sessions/" + std::to_string(session));
}

Response pass_void(const Call& c) {
  const long long session = c.id(0), pass = c.id(1);
  const std::string reason = c.field("reason");
  if (reason.empty()) throw data_error("reason: expected why the pass is void");
  auto db = c.st.open_store();
  store::Txn txn(*db, store::Txn::write);
  if (db->pass_session(pass) != session) {
    throw Error(ExitCode::no_input,
                "pass " + std::to_string(pass) + ": not in session " + std::to_string(session));
  }
  db->void_pass(pass, reason, c.entered_by, "");
  txn.commit();
  if (c.api) return json_response(200, nlohmann::ordered_json{{"voided", pass}}.dump());
  return redirect("/sessions/" + std::to_string(session) + "?rekey=" + std::to_string(pass) +
                  "#pass-form");
}

Response session_close(const Call& c) {
  const long long session = c.id(0);
  auto db = c.st.open_store();
  store::Txn txn(*db, store::Txn::write);
  db->close_session(session, c.entered_by, "");
  txn.commit();
  if (c.api) return json_response(200, nlohmann::ordered_json{{"closed", session}}.dump());
  return redirect("/sessions/" + std::to_string(session));
}

Response session_history(const Call& c) {
  const long long id = c.id(0);
  auto db = c.st.open_store();
  store::Txn txn(*db, store::Txn::read);
  const store::SessionHistory h = db->session_history(id);
  txn.commit();
  auto o = [](const std::optional<std::string>& v) {
    return v ? nlohmann::ordered_json(*v) : nlohmann::ordered_json();
  };
  nlohmann::ordered_json j;
  j["session"] = id;
  j["opened_at"] = h.opened_at;
  j["opened_by"] = o(h.opened_by);
  j["closed_at"] = o(h.closed_at);
  j["closed_by"] = o(h.closed_by);
  j["passes"] = nlohmann::ordered_json::array();
  for (const Pass& p : h.session.passes) {
    j["passes"].push_back({{"id", p.id.value_or(0)},
                           {"ticket", p.ticket},
                           {"kind", std::string(to_string(p.kind))},
                           {"voided", p.voided},
                           {"entered_by", o(p.entered_by)},
                           {"entered_at", o(p.entered_at)}});
  }
  j["voids"] = nlohmann::ordered_json::array();
  for (const auto& v : h.corrections) {
    j["voids"].push_back({{"pass", v.pass_id},
                          {"ticket", v.ticket},
                          {"reason", v.reason},
                          {"made_by", o(v.made_by)},
                          {"made_at", v.made_at}});
  }
  j["reports"] = nlohmann::ordered_json::array();
  for (const auto& r : h.reports) {
    j["reports"].push_back({{"report_id", r.report_id},
                            {"pdf_sha256", r.pdf_sha256},
                            {"key_fingerprint", r.key_fingerprint},
                            {"issued_at", r.issued_at}});
  }
  if (c.api) return json_response(200, j.dump(2));
  const std::string sid = std::to_string(id);
  std::string html = "<h1>History of session " + sid + "</h1>\n<ol id=\"history\">\n<li>opened " +
                     esc(h.opened_at) + (h.opened_by ? " by " + esc(*h.opened_by) : "") + "</li>\n";
  for (const Pass& p : h.session.passes) {
    html += "<li data-pass=\"" + std::to_string(p.id.value_or(0)) + "\"" +
            (p.voided ? " class=\"voided\"" : "") + ">pass " + std::to_string(p.id.value_or(0)) +
            " ticket " + esc(p.ticket) + " (" + std::string(to_string(p.kind)) + ") entered " +
            esc(p.entered_at.value_or("")) + (p.entered_by ? " by " + esc(*p.entered_by) : "") +
            "</li>\n";
  }
  for (const auto& v : h.corrections) {
    html += "<li class=\"void\" data-pass=\"" + std::to_string(v.pass_id) + "\">" + esc(v.action) +
            " pass " + std::to_string(v.pass_id) + " (ticket " + esc(v.ticket) +
            "): " + esc(v.reason) + " at " + esc(v.made_at) +
            (v.made_by ? " by " + esc(*v.made_by) : "") + "</li>\n";
  }
  for (const auto& r : h.reports) {
    html += "<li>report " + esc(r.report_id) + " issued " + esc(r.issued_at) + " (PDF SHA-256 " +
            esc(r.pdf_sha256) + ")</li>\n";
  }
  if (h.closed_at) {
    html += "<li>closed " + esc(*h.closed_at) + (h.closed_by ? " by " + esc(*h.closed_by) : "") +
            "</li>\n";
  }
  html += "</ol>\n<p><a href=\"/sessions/" + sid + "\">Back to the desk</a></p>\n";
  return html_response(200, page(c, "History of session " + sid, html));
}

}  // namespace sp::serve
