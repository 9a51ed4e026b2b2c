// Sessions: the list (open first, searchable), opening one, adding a rig.
#include <fmt/format.h>

#include <algorithm>
#include <map>
#include <nlohmann/json.hpp>

#include "engine/reconcile.h"
#include "ops/rig_file.h"
#include "serve/handlers.h"
#include "serve/html.h"

namespace sp::serve {

namespace {

struct Row {
  store::SessionSummary summary;
  Reconciled rec;
  std::vector<std::string> tickets;
};

std::string lower(std::string s) {
  for (char& ch : s) ch = static_cast<char>(std::tolower(static_cast<unsigned char>(ch)));
  return s;
}

// The search matches a ticket, the rig's name, the scale, the session key or a date (any part
// of the opening or closing time), case-insensitively.
bool matches(const Row& r, const std::string& q) {
  if (q.empty()) return true;
  const std::string n = lower(q);
  auto has = [&n](const std::string& s) { return lower(s).find(n) != std::string::npos; };
  if (has(r.summary.rig_name) || has(r.summary.scale_code) || has(r.summary.opened_at)) return true;
  if (r.summary.ref && has(*r.summary.ref)) return true;
  if (r.summary.closed_at && has(*r.summary.closed_at)) return true;
  return std::any_of(r.tickets.begin(), r.tickets.end(), has);
}

}  // namespace

Reconciled reconcile_for_page(const Session& s) {
  Reconciled out;
  try {
    out.result = reconcile(s);
    out.verdict = out.result->verdict;
    out.reason = out.result->verdict_reason;
  } catch (const Error& e) {
    out.verdict = Verdict::not_proven;
    out.error = e.what();
    out.reason = std::string("the engine cannot solve this session yet: ") + e.what();
  }
  return out;
}

[[noreturn]] void rethrow_as(bool duplicate, const Error& e) {
  if (duplicate) throw Error(ExitCode::cant_create, e.what());
  throw e;
}

std::optional<std::string> opt(const std::string& v) {
  return v.empty() ? std::nullopt : std::optional<std::string>(v);
}

Response sessions_list(const Call& c) {
  auto db = c.st.open_store();
  store::Txn txn(*db, store::Txn::read);
  std::map<long long, Row> rows;
  for (auto& s : db->list_sessions()) rows[s.id].summary = s;
  db->for_each_session([&rows](const Session& s) {
    auto it = rows.find(s.session_id.value_or(0));
    if (it == rows.end()) return;
    it->second.rec = reconcile_for_page(s);
    for (const Pass& p : s.passes) it->second.tickets.push_back(p.ticket);
  });
  txn.commit();
  const std::string q = c.req.query.count("q") ? c.req.query.at("q") : "";
  std::vector<const Row*> shown;
  for (const auto& [id, r] : rows) {
    if (matches(r, q)) shown.push_back(&r);
  }
  // Open sessions first, then the newest first within each group.
  std::stable_sort(shown.begin(), shown.end(), [](const Row* a, const Row* b) {
    const bool ao = !a->summary.closed_at, bo = !b->summary.closed_at;
    if (ao != bo) return ao;
    return a->summary.id > b->summary.id;
  });
  if (c.api) {
    nlohmann::ordered_json arr = nlohmann::ordered_json::array();
    for (const Row* r : shown) {
      const auto& s = r->summary;
      arr.push_back({{"id", s.id},
                     {"verdict", std::string(to_string(r->rec.verdict))},
                     {"verdict_reason", r->rec.reason},
                     {"status", s.closed_at ? "closed" : "open"},
                     {"ref", s.ref ? nlohmann::ordered_json(*s.ref) : nlohmann::ordered_json()},
                     {"rig", s.rig_name},
                     {"scale", s.scale_code},
                     {"opened_at", s.opened_at},
                     {"closed_at", s.closed_at ? nlohmann::ordered_json(*s.closed_at)
                                               : nlohmann::ordered_json()},
                     {"passes", s.passes},
                     {"voided", s.voided}});
    }
    return json_response(200, arr.dump(2));
  }
  std::string h =
      "<h1>Weigh sessions</h1>\n"
      "<form id=\"search\" method=\"get\" action=\"/sessions\" role=\"search\">"
      "<label for=\"q\">Search by ticket, rig or date</label> "
      "<input id=\"q\" name=\"q\" type=\"search\" value=\"" +
      esc(q) + "\"> <button type=\"submit\">Search</button></form>\n";
  h += "<p><a class=\"button\" href=\"/sessions/new\">Open a session</a></p>\n";
  h += "<table id=\"sessions\"><caption>" + std::to_string(shown.size()) +
       " session(s), open ones first</caption>\n<thead><tr><th scope=\"col\">Session</th>"
       "<th scope=\"col\">Verdict</th><th scope=\"col\">Status</th><th scope=\"col\">Rig</th>"
       "<th scope=\"col\">Scale</th><th scope=\"col\">Passes</th><th scope=\"col\">Opened</th>"
       "</tr></thead>\n<tbody>\n";
  for (const Row* r : shown) {
    const auto& s = r->summary;
    const std::string id = std::to_string(s.id);
    const std::string word(to_string(r->rec.verdict));
    h += "<tr data-session=\"" + id + "\"><td><a href=\"/sessions/" + id + "\">" + id +
         (s.ref ? " (" + esc(*s.ref) + ")" : "") + "</a></td><td class=\"verdict-" + word +
         "\" title=\"" + esc(r->rec.reason) + "\">" + word + "</td><td>" +
         (s.closed_at ? "closed" : "open") + "</td><td>" + esc(s.rig_name) + "</td><td>" +
         esc(s.scale_code) + "</td><td>" + std::to_string(s.passes) +
         (s.voided ? " (" + std::to_string(s.voided) + " void)" : "") + "</td><td>" +
         esc(s.opened_at) + "</td></tr>\n";
  }
  h += "</tbody></table>\n";
  return html_response(200, page(c, "Sessions", h));
}

Response session_new_form(const Call& c) {
  auto db = c.st.open_store();
  store::Txn txn(*db, store::Txn::read);
  const auto rigs = db->list_rigs();
  const auto scales = db->list_scales();
  txn.commit();
  std::string h = "<h1>Open a weigh session</h1>\n";
  h += "<form id=\"open-session\" method=\"post\" action=\"/sessions\">" + csrf_input(c) +
       "\n<p><label for=\"rig\">Rig</label> <select id=\"rig\" name=\"rig\" required>";
  for (const auto& r : rigs) {
    h += "<option value=\"" + esc(r.name) + "\">" + esc(r.name) + ": " + esc(r.vehicle.label) +
         " + " + esc(r.trailer.label) + "</option>";
  }
  h += "</select> <a href=\"/rigs/new\">Add a rig</a></p>\n<p><label for=\"scale\">Scale</label> "
       "<select id=\"scale\" name=\"scale\" required>";
  for (const auto& s : scales) {
    h += "<option value=\"" + esc(s.info.id) + "\">" + esc(s.info.id) +
         " (d = " + esc(fmt::format("{}", s.info.division)) + " " + std::string(to_string(s.unit)) +
         ")</option>";
  }
  h += "</select></p>\n<p><label for=\"label\">Session key (optional)</label> "
       "<input id=\"label\" name=\"label\"></p>\n<p><label for=\"owner\">Owner (optional)</label> "
       "<input id=\"owner\" name=\"owner\"></p>\n"
       "<p><button type=\"submit\" id=\"open-submit\">Open the session</button></p></form>\n";
  if (rigs.empty()) h += "<p>No rig in the store yet: <a href=\"/rigs/new\">add one</a>.</p>\n";
  return html_response(200, page(c, "Open a session", h));
}

Response session_open(const Call& c) {
  const std::string rig_key = c.field("rig"), scale_key = c.field("scale");
  if (rig_key.empty()) throw data_error("rig: expected a rig name from the store");
  if (scale_key.empty()) throw data_error("scale: expected a scale id from the store");
  auto db = c.st.open_store();
  store::Txn txn(*db, store::Txn::write);
  auto rig = db->find_rig(rig_key);
  if (!rig) throw data_error("rig: " + rig_key + " is not in the store");
  auto scale = db->find_scale(scale_key);
  if (!scale) throw data_error("scale: " + scale_key + " is not in the store");
  store::NewSession ns;
  ns.rig_id = rig->id;
  ns.scale_id = scale->id;
  ns.ref = opt(c.field("label"));
  ns.owner = opt(c.field("owner"));
  ns.operator_name = c.operator_name ? c.operator_name : opt(c.field("operator"));
  ns.opened_by = c.entered_by;
  long long id = 0;
  try {
    id = db->open_session(ns);
  } catch (const Error& e) {
    rethrow_as(ns.ref && db->find_session_by_ref(*ns.ref), e);
  }
  txn.commit();
  if (c.api) return json_response(201, nlohmann::ordered_json{{"id", id}}.dump());
  return redirect("/sessions/" + std::to_string(id));
}

Response rig_new_form(const Call& c) {
  std::string h =
      "<h1>Add a rig</h1>\n<p>The same TOML a rig file for <code>scaleproof rig add "
      "--file</code> holds.</p>\n<form id=\"add-rig\" method=\"post\" "
      "action=\"/rigs\">" +
      csrf_input(c) +
      "\n<p><label for=\"rig_file\">Rig file (TOML)</label><br><textarea "
      "id=\"rig_file\" name=\"rig_file\" rows=\"22\" cols=\"72\" required "
      "spellcheck=\"false\"></textarea></p>\n<p><button type=\"submit\">Add the "
      "rig</button></p></form>\n";
  return html_response(200, page(c, "Add a rig", h));
}

Response rig_add(const Call& c) {
  if (c.field("rig_file").empty()) throw data_error("rig_file: expected the rig file's TOML");
  store::RigRecord rig = ops::rig_from_text(c.field("rig_file"), "rig_file", false);
  rig.entered_by = c.entered_by;
  auto db = c.st.open_store();
  store::Txn txn(*db, store::Txn::write);
  long long id = 0;
  try {
    id = db->add_rig(rig);
  } catch (const Error& e) {
    rethrow_as(db->find_rig(rig.name).has_value(), e);
  }
  txn.commit();
  if (c.api)
    return json_response(201, nlohmann::ordered_json{{"id", id}, {"name", rig.name}}.dump());
  return redirect("/sessions/new");
}

}  // namespace sp::serve
