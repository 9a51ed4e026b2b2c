// Pass corrections (schema/002): a new chained row that supersedes a pass and keeps its
// ticket. The pass row itself is never touched; readers take the latest correction.
#include <fmt/format.h>

#include <map>

#include "store/pass_rules.h"
#include "store/sqlite_store.h"

namespace sp::store {

namespace {

// The values a correction replaces (the rest of a pass is its identity or bookkeeping).
bool same_values(const Pass& a, const Pass& b) {
  return a.kind == b.kind && a.setting == b.setting && a.weighed_at == b.weighed_at &&
         a.steer == b.steer && a.drive == b.drive && a.trailer == b.trailer && a.gross == b.gross &&
         a.scale_id == b.scale_id;
}

}  // namespace

bool SqliteStore::any_pass_corrections() {
  Stmt& q = stmt("SELECT EXISTS (SELECT 1 FROM pass_corrections)");
  q.step("looking for pass corrections");
  bool any = q.i64(0) != 0;
  q.reset();
  return any;
}

std::optional<long long> SqliteStore::find_pass(long long session_id, std::string_view ticket) {
  Stmt& q = stmt("SELECT id FROM passes WHERE session_id = ? AND ticket = ?");
  q.bind(1, session_id).bind(2, ticket);
  std::optional<long long> id;
  if (q.step("finding a ticket")) id = q.i64(0);
  q.reset();
  return id;
}

std::optional<long long> SqliteStore::pass_session(long long pass_id) {
  Stmt& q = stmt("SELECT session_id FROM passes WHERE id = ?");
  q.bind(1, pass_id);
  std::optional<long long> id;
  if (q.step("finding a pass")) id = q.i64(0);
  q.reset();
  return id;
}

long long SqliteStore::correct_pass(long long pass_id, std::optional<long long> in_session,
                                    const Pass& corrected, const std::string& reason,
                                    const std::optional<std::string>& by, const std::string& at) {
  Stmt& q = stmt(fmt::format("SELECT p.session_id, {}{} FROM passes p{}{} WHERE p.id = ?",
                             kPassCols, kCorrectionCols, kVoidJoin, kCorrectionJoin));
  q.bind(1, pass_id);
  if (!q.step("finding a pass")) {
    q.reset();
    throw Error(ExitCode::no_input, fmt::format("pass {}: not in the store", pass_id));
  }
  const long long session_id = q.i64(0);
  const Pass current = read_pass(q, 1, true);
  q.reset();
  const std::string what = fmt::format("pass {} (ticket {})", pass_id, current.ticket);
  if (in_session && *in_session != session_id) {
    throw data_error(
        fmt::format("{}: it is in session {}, not session {}", what, session_id, *in_session));
  }
  if (current.voided) {
    throw data_error(fmt::format("{}: it is voided ({}); a voided pass cannot be corrected", what,
                                 current.void_reason.value_or("")));
  }
  if (!corrected.ticket.empty() && corrected.ticket != current.ticket) {
    throw data_error(fmt::format("{}: a correction keeps the ticket number, got ticket {}", what,
                                 corrected.ticket));
  }
  if (reason.empty()) throw data_error(what + ": a correction needs a reason");
  const SessionCtx& ctx = session_ctx(session_id);
  if (ctx.closed) {
    // A correction enters readings, and readings enter only open sessions (like add_pass).
    throw data_error(
        fmt::format("{}: session {} is closed; its passes can no longer be "
                    "corrected (a void is still possible)",
                    what, session_id));
  }
  Pass p = corrected;
  p.ticket = current.ticket;
  try {
    check_pass(p, ctx.scale, ctx.unit);
  } catch (const Error& e) {
    throw e.within(fmt::format("correction of pass {}", pass_id));
  }
  if (same_values(p, current)) {
    throw data_error(what + ": the correction changes nothing (every value is as stored)");
  }
  return RowBuilder(*this, "pass_corrections")
      .i(pass_id)
      .t(to_string(p.kind))
      .t(p.setting)
      .t(p.weighed_at)
      .r(p.steer)
      .r(p.drive)
      .r(p.trailer)
      .r(p.gross)
      .t(p.scale_id)
      .t(reason)
      .t(by)
      .t(when(at))
      .append(fmt::format("correcting pass {}", pass_id));
}

void SqliteStore::read_pass_corrections(long long session_id, SessionHistory& h) {
  // The passes as first stored (read_pass without the corrections), then each correction in
  // order: what it superseded is the previous one of the same pass.
  std::map<long long, Pass> latest;
  Stmt& p =
      stmt(fmt::format("SELECT {} FROM passes p{} WHERE p.session_id = ? AND EXISTS "
                       "(SELECT 1 FROM pass_corrections k WHERE k.pass_id = p.id)",
                       kPassCols, kVoidJoin));
  p.bind(1, session_id);
  while (p.step("reading corrected passes")) {
    Pass x = read_pass(p, 0, false);
    x.voided = false;  // the void, if any, came after the corrections
    x.void_reason.reset();
    latest.emplace(*x.id, std::move(x));
  }
  p.reset();
  if (latest.empty()) return;
  Stmt& c = stmt(
      "SELECT k.id, k.pass_id, k.kind, k.setting, k.weighed_at, k.steer, k.drive, "
      "k.trailer, k.gross, k.scale_code, k.reason, k.made_by, k.made_at "
      "FROM pass_corrections k JOIN passes p ON p.id = k.pass_id "
      "WHERE p.session_id = ? ORDER BY k.id");
  c.bind(1, session_id);
  while (c.step("reading pass corrections")) {
    PassCorrection r;
    r.id = c.i64(0);
    r.pass_id = c.i64(1);
    Pass& last = latest[r.pass_id];
    r.was = last;
    r.now = last;
    r.now.kind = parse_pass_kind(c.text_view(2)).value_or(PassKind::unhitched);
    r.now.setting = c.opt_text(3);
    r.now.weighed_at = c.text(4);
    r.now.steer = c.f64(5);
    r.now.drive = c.f64(6);
    r.now.trailer = c.opt_f64(7);
    r.now.gross = c.opt_f64(8);
    r.now.scale_id = c.opt_text(9);
    r.reason = c.text(10);
    r.made_by = c.opt_text(11);
    r.made_at = c.text(12);
    r.now.entered_by = r.made_by;
    r.now.entered_at = r.made_at;
    r.ticket = r.now.ticket;
    last = r.now;
    h.pass_corrections.push_back(std::move(r));
  }
  c.reset();
}

}  // namespace sp::store
