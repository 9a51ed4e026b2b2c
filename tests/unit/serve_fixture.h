// Shared set-up for the console's handler tests: a store in a temp file holding the demo's
// mis-keyed session (data-demo/sessions/03-mis-keyed-reading.json: invented data), a Console on
// it, and a Client that keeps the console's cookies and sends its CSRF token, all in process.
#pragma once
#include <doctest/doctest.h>

#include <fstream>
#include <map>
#include <sstream>
#include <string>

#include "format/session_json.h"
#include "serve/console.h"
#include "unit/store_fixture.h"

namespace servetest {

using namespace sp;
using namespace sp::serve;

inline std::string read_text(const std::string& path) {
  std::ifstream f(path, std::ios::binary);
  std::stringstream ss;
  ss << f.rdbuf();
  return ss.str();
}

// The demo session 03 in the store as session 1: scale QX-1, rig "RA-3", its first
// `passes` passes (4: all, with the mis-keyed drive reading of ticket QX-4390).
inline Session load_demo(store::Store& st, std::size_t passes = 4) {
  const Session s = parse_session_json(read_text(std::string(SCALEPROOF_SOURCE_DIR) +
                                                 "/data-demo/sessions/03-mis-keyed-reading.json"),
                                       "03");
  store::Txn txn(st, store::Txn::write);
  const long long scale = st.add_scale(s.scale, s.units.weight, std::nullopt, "");
  store::RigRecord rig;
  rig.name = "RA-3";
  rig.units = s.units;
  rig.vehicle = s.tow_vehicle;
  rig.trailer = s.trailer;
  const long long rig_id = st.add_rig(rig);
  store::NewSession ns;
  ns.rig_id = rig_id;
  ns.scale_id = scale;
  const long long id = st.open_session(ns);
  for (std::size_t i = 0; i < passes && i < s.passes.size(); ++i) st.add_pass(id, s.passes[i]);
  txn.commit();
  return s;
}

struct Client {
  Console& console;
  std::map<std::string, std::string> cookies;
  std::string csrf;

  Response send(Request r) {
    r.cookies = cookies;
    Response out = console.handle(r);
    for (const auto& [k, v] : out.headers) {
      if (k != "Set-Cookie") continue;
      const std::size_t eq = v.find('='), semi = v.find(';');
      cookies[v.substr(0, eq)] = v.substr(eq + 1, semi - eq - 1);
    }
    const std::size_t at = out.body.find("name=\"csrf\" value=\"");
    if (at != std::string::npos) {
      const std::size_t from = at + 19;
      csrf = out.body.substr(from, out.body.find('"', from) - from);
    }
    return out;
  }
  Response get(const std::string& path, std::map<std::string, std::string> query = {}) {
    Request r;
    r.path = path;
    r.query = std::move(query);
    return send(r);
  }
  // A form post with the page's token (call a GET first), unless `with_token` is false.
  Response post(const std::string& path, std::map<std::string, std::string> form,
                bool with_token = true) {
    Request r;
    r.method = "POST";
    r.path = path;
    r.form = std::move(form);
    r.headers["content-type"] = "application/x-www-form-urlencoded";
    if (with_token) r.form["csrf"] = csrf;
    return send(r);
  }
  Response post_json(const std::string& path, const std::string& json) {
    Request r;
    r.method = "POST";
    r.path = path;
    r.body = json;
    r.headers["content-type"] = "application/json";
    return send(r);
  }
};

inline long long rows(store::Store& st) {
  store::Txn txn(st, store::Txn::read);
  const long long n = st.row_count();
  txn.commit();
  return n;
}

}  // namespace servetest
