// Sessions, passes, corrections and issued reports.
#include <fmt/format.h>

#include <algorithm>

#include "store/pass_rules.h"
#include "store/sqlite_store.h"

namespace sp::store {

long long SqliteStore::open_session(const NewSession& s) {
  auto rig = rig_by_id(s.rig_id);
  if (!rig) throw Error(ExitCode::no_input, fmt::format("rig id {}: not in the store", s.rig_id));
  auto scale = scale_by_id(s.scale_id);
  if (!scale) {
    throw Error(ExitCode::no_input, fmt::format("scale id {}: not in the store", s.scale_id));
  }
  if (scale->unit != rig->units.weight) {
    throw data_error(fmt::format(
        "scale {} weighs in {} but rig {} is described in {}; use one "
        "weight unit for both",
        scale->info.id, to_string(scale->unit), rig->name, to_string(rig->units.weight)));
  }
  if (s.length_uncertainty && !(*s.length_uncertainty > 0)) {
    throw data_error(
        fmt::format("length_uncertainty: expected a length > 0, got {}", *s.length_uncertainty));
  }
  if (s.ref && s.ref->empty()) {
    throw data_error("session: expected a session key, got an empty one");
  }
  long long id = 0;
  try {
    // A key already in the store is refused by the UNIQUE index (and the append-only guard);
    // it is looked up only then, for the message (the import looks every key up already).
    const std::string at = when(s.opened_at);
    id = RowBuilder(*this, "sessions")
             .t(s.ref)
             .i(s.rig_id)
             .i(s.scale_id)
             .t(s.station)
             .t(s.operator_name)
             .t(s.owner)
             .t(s.notes)
             .r(s.length_uncertainty)
             .t(s.opened_by)
             .t(at)
             .append("opening a session");
  } catch (const Error& e) {
    if (e.code() == ExitCode::data_error && s.ref && find_session_by_ref(*s.ref)) {
      throw data_error("session " + *s.ref + ": a session with this key is already in the store");
    }
    throw;
  }
  // The new session is open and on `scale`: what add_pass would read back (session_ctx).
  session_ctx_.id = id;
  session_ctx_.scale = scale->info;
  session_ctx_.unit = scale->unit;
  session_ctx_.closed = false;
  return id;
}

const SessionCtx& SqliteStore::session_ctx(long long session_id) {
  if (session_ctx_.id == session_id) return session_ctx_;
  Stmt& q = stmt(
      "SELECT s.scale_id, r.vehicle_id, "
      "EXISTS (SELECT 1 FROM session_closings c WHERE c.session_id = s.id) "
      "FROM sessions s JOIN rigs r ON r.id = s.rig_id WHERE s.id = ?");
  q.bind(1, session_id);
  if (!q.step("reading a session")) {
    q.reset();
    throw Error(ExitCode::no_input, fmt::format("session {}: not in the store", session_id));
  }
  long long scale_id = q.i64(0);
  bool closed = q.i64(2) != 0;
  q.reset();
  auto scale = scale_by_id(scale_id);
  if (!scale) throw data_error(fmt::format("session {}: its scale is missing", session_id));
  session_ctx_.id = session_id;
  session_ctx_.scale = scale->info;
  session_ctx_.unit = scale->unit;
  session_ctx_.closed = closed;
  return session_ctx_;
}

void SqliteStore::close_session(long long session_id, const std::optional<std::string>& by,
                                const std::string& at) {
  if (session_ctx(session_id).closed) {
    throw data_error(fmt::format("session {}: already closed", session_id));
  }
  RowBuilder(*this, "session_closings")
      .i(session_id)
      .t(by)
      .t(when(at))
      .append(fmt::format("closing session {}", session_id));
  session_ctx_ = SessionCtx{};
}

bool SqliteStore::session_exists(long long session_id) {
  Stmt& q = stmt("SELECT 1 FROM sessions WHERE id = ?");
  q.bind(1, session_id);
  bool found = q.step("finding a session");
  q.reset();
  return found;
}

std::optional<long long> SqliteStore::find_session_by_ref(std::string_view ref) {
  Stmt& q = stmt("SELECT id FROM sessions WHERE ref = ?");
  q.bind(1, ref);
  std::optional<long long> id;
  if (q.step("finding a session")) id = q.i64(0);
  q.reset();
  return id;
}

std::vector<SessionSummary> SqliteStore::list_sessions() {
  std::vector<SessionSummary> out;
  Stmt& q = stmt(
      "SELECT s.id, s.ref, r.name, sc.code, s.operator, s.opened_at, c.closed_at, "
      "(SELECT count(*) FROM passes p WHERE p.session_id = s.id), "
      "(SELECT count(*) FROM passes p JOIN corrections k ON k.pass_id = p.id "
      "  WHERE p.session_id = s.id AND k.action = 'void') "
      "FROM sessions s JOIN rigs r ON r.id = s.rig_id JOIN scales sc ON sc.id = s.scale_id "
      "LEFT JOIN session_closings c ON c.session_id = s.id ORDER BY s.id");
  while (q.step("listing sessions")) {
    SessionSummary s;
    s.id = q.i64(0);
    s.ref = q.opt_text(1);
    s.rig_name = q.text(2);
    s.scale_code = q.text(3);
    s.operator_name = q.opt_text(4);
    s.opened_at = q.text(5);
    s.closed_at = q.opt_text(6);
    s.passes = q.i64(7);
    s.voided = q.i64(8);
    out.push_back(std::move(s));
  }
  q.reset();
  return out;
}

namespace {
constexpr const char* kSessionSql =
    "SELECT s.id, s.ref, s.rig_id, s.scale_id, s.station, s.operator, s.owner, s.notes, "
    "s.length_uncertainty, s.opened_by, s.opened_at FROM sessions s ";
}  // namespace

// Builds the engine's view of the session whose row `q` holds (columns of kSessionSql).
static Session build_session(SqliteStore& store, const Stmt& q, const RigRecord& rig,
                             const ScaleRecord& scale) {
  (void)store;
  Session s;
  s.session_id = q.i64(0);
  s.units = rig.units;
  s.scale = scale.info;
  s.tow_vehicle = rig.vehicle;
  s.trailer = rig.trailer;
  s.station = q.opt_text(4);
  s.operator_name = q.opt_text(5);
  s.owner = q.opt_text(6);
  s.notes = q.opt_text(7);
  s.length_uncertainty = q.opt_f64(8);
  return s;
}

Pass read_pass(const Stmt& q, int c, bool corrected) {
  Pass x;
  x.id = q.i64(c);
  x.kind = parse_pass_kind(q.text_view(c + 1)).value_or(PassKind::unhitched);
  x.setting = q.opt_text(c + 2);
  x.ticket = q.text(c + 3);
  x.weighed_at = q.text(c + 4);
  x.steer = q.f64(c + 5);
  x.drive = q.f64(c + 6);
  x.trailer = q.opt_f64(c + 7);
  x.gross = q.opt_f64(c + 8);
  x.scale_id = q.opt_text(c + 9);
  x.entered_by = q.opt_text(c + 10);
  x.entered_at = q.opt_text(c + 11);
  x.void_reason = q.opt_text(c + 12);
  x.voided = x.void_reason.has_value();
  if (corrected && !q.is_null(c + 13)) {
    x.kind = parse_pass_kind(q.text_view(c + 14)).value_or(PassKind::unhitched);
    x.setting = q.opt_text(c + 15);
    x.weighed_at = q.text(c + 16);
    x.steer = q.f64(c + 17);
    x.drive = q.f64(c + 18);
    x.trailer = q.opt_f64(c + 19);
    x.gross = q.opt_f64(c + 20);
    x.scale_id = q.opt_text(c + 21);
  }
  return x;
}

Session SqliteStore::load_session(long long session_id) {
  Stmt& q = stmt(std::string(kSessionSql) + "WHERE s.id = ?");
  q.bind(1, session_id);
  if (!q.step("reading a session")) {
    q.reset();
    throw Error(ExitCode::no_input, fmt::format("session {}: not in the store", session_id));
  }
  long long rig_id = q.i64(2), scale_id = q.i64(3);
  auto rig = rig_by_id(rig_id);
  auto scale = scale_by_id(scale_id);
  if (!rig || !scale) {
    q.reset();
    throw data_error(fmt::format("session {}: its rig or scale is missing", session_id));
  }
  Session s = build_session(*this, q, *rig, *scale);
  q.reset();
  Stmt& p = stmt(fmt::format("SELECT {}{} FROM passes p{}{} WHERE p.session_id = ? ORDER BY p.id",
                             kPassCols, kCorrectionCols, kVoidJoin, kCorrectionJoin));
  p.bind(1, session_id);
  while (p.step("reading passes")) s.passes.push_back(read_pass(p, 0, true));
  p.reset();
  return s;
}

void SqliteStore::for_each_session(const std::function<void(const Session&)>& fn) {
  // One statement streams every session with its passes, sessions in id order (the scan of
  // sessions by rowid; no sorter): memory holds one session, and no per-session query is
  // prepared. A session's passes come in index (ticket) order and are put in id order here:
  // a handful of rows, cheaper than SQLite's per-session sorter.
  // The join with the latest correction costs an index step a pass; a store without
  // corrections (the common case) is read without it.
  const bool corrected = any_pass_corrections();
  Stmt& q = stmt(fmt::format(
      "SELECT s.id, s.ref, s.rig_id, s.scale_id, s.station, s.operator, s.owner, s.notes, "
      "s.length_uncertainty, s.opened_by, s.opened_at, {}{} "
      "FROM sessions s LEFT JOIN passes p ON p.session_id = s.id{}{} ORDER BY s.id",
      kPassCols, corrected ? kCorrectionCols : "", kVoidJoin, corrected ? kCorrectionJoin : ""));
  constexpr int kPassCol = 11;
  auto emit = [&fn](Session& s) {
    std::sort(s.passes.begin(), s.passes.end(),
              [](const Pass& a, const Pass& b) { return a.id < b.id; });
    fn(s);
  };
  Session s;
  bool have = false;
  try {
    while (q.step("reading sessions")) {
      long long id = q.i64(0);
      if (!have || s.session_id != id) {
        if (have) emit(s);
        auto rig = rig_by_id(q.i64(2));
        auto scale = scale_by_id(q.i64(3));
        if (!rig || !scale) {
          throw data_error(fmt::format("session {}: its rig or scale is missing", id));
        }
        s = build_session(*this, q, *rig, *scale);
        have = true;
      }
      if (!q.is_null(kPassCol)) s.passes.push_back(read_pass(q, kPassCol, corrected));
    }
    if (have) emit(s);
  } catch (...) {
    q.reset();
    throw;
  }
  q.reset();
}

SessionHistory SqliteStore::session_history(long long session_id) {
  SessionHistory h;
  h.session = load_session(session_id);
  Stmt& q = stmt(
      "SELECT s.ref, s.opened_by, s.opened_at, r.name, c.closed_by, c.closed_at, "
      "s.scale_id FROM sessions s JOIN rigs r ON r.id = s.rig_id "
      "LEFT JOIN session_closings c ON c.session_id = s.id WHERE s.id = ?");
  q.bind(1, session_id);
  q.step("reading a session");
  h.ref = q.opt_text(0);
  h.opened_by = q.opt_text(1);
  h.opened_at = q.text(2);
  h.rig_name = q.text(3);
  h.closed_by = q.opt_text(4);
  h.closed_at = q.opt_text(5);
  long long scale_id = q.i64(6);
  q.reset();
  Stmt& c = stmt(
      "SELECT k.id, k.pass_id, p.ticket, k.action, k.reason, k.made_by, k.made_at "
      "FROM corrections k JOIN passes p ON p.id = k.pass_id "
      "WHERE p.session_id = ? ORDER BY k.id");
  c.bind(1, session_id);
  while (c.step("reading corrections")) {
    h.corrections.push_back(
        Correction{c.i64(0), c.i64(1), c.text(2), c.text(3), c.text(4), c.opt_text(5), c.text(6)});
  }
  c.reset();
  h.inspections = inspections(scale_id);
  h.reports = list_reports(session_id);
  read_pass_corrections(session_id, h);
  return h;
}

long long SqliteStore::add_pass(long long session_id, const Pass& pass) {
  const SessionCtx& ctx = session_ctx(session_id);
  if (ctx.closed) {
    throw data_error(fmt::format("ticket {}: session {} is closed; open a new session", pass.ticket,
                                 session_id));
  }
  check_pass(pass, ctx.scale, ctx.unit);
  try {
    RowBuilder b(*this, "passes");
    return bind_pass(b, session_id, pass).append("adding ticket " + pass.ticket);
  } catch (const Error& e) {
    if (e.code() != ExitCode::data_error) throw;
    Stmt& q = stmt("SELECT id FROM passes WHERE session_id = ? AND ticket = ?");
    q.bind(1, session_id).bind(2, std::string_view(pass.ticket));
    bool dup = q.step("finding a ticket");
    long long other = dup ? q.i64(0) : 0;
    q.reset();
    if (dup) {
      throw data_error(
          fmt::format("ticket {}: already in session {} (pass {}); tickets are "
                      "unique within a session",
                      pass.ticket, session_id, other));
    }
    throw;
  }
}

RowBuilder& SqliteStore::bind_pass(RowBuilder& b, long long session_id, const Pass& pass) {
  // Every text lives in `pass` or the store until the row is stored: bound without a copy.
  return b.i(session_id)
      .kept(to_string(pass.kind))
      .kept(pass.setting)
      .kept(pass.ticket)
      .kept(pass.weighed_at)
      .r(pass.steer)
      .r(pass.drive)
      .r(pass.trailer)
      .r(pass.gross)
      .kept(pass.scale_id)
      .kept(pass.entered_by)
      .kept(pass.entered_at ? std::string_view(*pass.entered_at) : std::string_view(now_));
}

std::vector<long long> SqliteStore::add_passes(long long session_id,
                                               const std::vector<Pass>& passes) {
  std::vector<long long> ids;
  if (passes.size() <= 1) {
    for (const auto& p : passes) ids.push_back(add_pass(session_id, p));
    return ids;
  }
  const SessionCtx& ctx = session_ctx(session_id);
  if (ctx.closed) {
    throw data_error(fmt::format("ticket {}: session {} is closed; open a new session",
                                 passes.front().ticket, session_id));
  }
  for (const auto& p : passes) check_pass(p, ctx.scale, ctx.unit);
  Stmt& st = batch_insert("passes", passes.size());
  Hash head = head_;
  for (size_t k = 0; k < passes.size(); ++k) {
    long long seq = next_seq_ + static_cast<long long>(k);
    RowBuilder b(*this, "passes", st, static_cast<int>(k), seq);
    head = bind_pass(b, session_id, passes[k]).stage(head);
    ids.push_back(seq);
  }
  try {
    st.run("adding tickets");
  } catch (const Error& e) {
    st.reset();
    // The tickets are named only now: formatting them for every batch was a measurable cost.
    throw Error(e.code(), fmt::format("{} (tickets {} to {})", e.what(), passes.front().ticket,
                                      passes.back().ticket));
  } catch (...) {
    st.reset();
    throw;
  }
  // Only now, with every row stored, does the chain advance (a failed batch leaves no trace).
  head_ = head;
  next_seq_ += static_cast<long long>(passes.size());
  return ids;
}

long long SqliteStore::void_pass(long long pass_id, const std::string& reason,
                                 const std::optional<std::string>& by, const std::string& at) {
  Stmt& q = stmt(
      "SELECT p.ticket, c.id FROM passes p LEFT JOIN corrections c "
      "ON c.pass_id = p.id WHERE p.id = ?");
  q.bind(1, pass_id);
  if (!q.step("finding a pass")) {
    q.reset();
    throw Error(ExitCode::no_input, fmt::format("pass {}: not in the store", pass_id));
  }
  std::string ticket = q.text(0);
  bool already = !q.is_null(1);
  q.reset();
  if (already)
    throw data_error(fmt::format("pass {} (ticket {}): already voided", pass_id, ticket));
  if (reason.empty()) {
    throw data_error(fmt::format("pass {} (ticket {}): a void needs a reason", pass_id, ticket));
  }
  return RowBuilder(*this, "corrections")
      .i(pass_id)
      .t("void")
      .t(reason)
      .t(by)
      .t(when(at))
      .append(fmt::format("voiding pass {}", pass_id));
}

long long SqliteStore::record_report(const IssuedReport& r) {
  if (!session_exists(r.session_id)) {
    throw Error(ExitCode::no_input, fmt::format("session {}: not in the store", r.session_id));
  }
  bool hex = r.pdf_sha256.size() == 64;
  for (char ch : r.pdf_sha256) hex = hex && ((ch >= '0' && ch <= '9') || (ch >= 'a' && ch <= 'f'));
  if (!hex) {
    throw data_error("report " + r.report_id + ": pdf_sha256: expected 64 lowercase hex digits");
  }
  if (r.report_id.empty()) throw data_error("report id: expected an id, got nothing");
  if (r.key_fingerprint.empty()) {
    throw data_error("report " + r.report_id + ": key fingerprint: expected a fingerprint");
  }
  Stmt& q = stmt("SELECT 1 FROM issued_reports WHERE report_id = ?");
  q.bind(1, std::string_view(r.report_id));
  bool dup = q.step("finding a report");
  q.reset();
  if (dup) throw data_error("report " + r.report_id + ": already recorded");
  return RowBuilder(*this, "issued_reports")
      .i(r.session_id)
      .t(r.report_id)
      .t(r.pdf_sha256)
      .t(r.key_fingerprint)
      .t(r.signed_by)
      .t(when(r.issued_at))
      .append("recording report " + r.report_id);
}

std::vector<IssuedReport> SqliteStore::list_reports(std::optional<long long> session_id) {
  std::vector<IssuedReport> out;
  Stmt& q = stmt(
      "SELECT id, session_id, report_id, pdf_sha256, key_fingerprint, signed_by, "
      "issued_at FROM issued_reports WHERE ?1 IS NULL OR session_id = ?1 ORDER BY id");
  q.bind(1, session_id);
  while (q.step("listing reports")) {
    out.push_back(IssuedReport{q.i64(0), q.i64(1), q.text(2), q.text(3), q.text(4), q.opt_text(5),
                               q.text(6)});
  }
  q.reset();
  return out;
}

}  // namespace sp::store
