#include "store/sqlite_db.h"

#include <string>

namespace sp::store {

ExitCode exit_code_for(int rc) {
  switch (rc & 0xff) {
    case SQLITE_BUSY:
    case SQLITE_LOCKED:
      return ExitCode::temp_fail;
    case SQLITE_CONSTRAINT:
      return ExitCode::data_error;
    case SQLITE_CANTOPEN:
      return ExitCode::no_input;
    case SQLITE_NOTADB:
    case SQLITE_CORRUPT:
      return ExitCode::data_error;
    default:
      return ExitCode::io_error;
  }
}

namespace {
// Memory statistics make every SQLite allocation take a process-wide mutex; the store never
// reads them. Must run before SQLite initialises (sqlite3_config docs, SQLITE_CONFIG_MEMSTATUS),
// hence once, before the first open; a later call would fail harmlessly with SQLITE_MISUSE.
void configure_sqlite_once() {
  static const int rc = sqlite3_config(SQLITE_CONFIG_MEMSTATUS, 0);
  (void)rc;
}
}  // namespace

Db::Db(const std::string& path, bool create, int busy_timeout_ms) : path_(path) {
  configure_sqlite_once();
  int flags = SQLITE_OPEN_READWRITE | (create ? SQLITE_OPEN_CREATE : 0) | SQLITE_OPEN_NOMUTEX;
  int rc = sqlite3_open_v2(path.c_str(), &db_, flags, nullptr);
  if (rc != SQLITE_OK) {
    std::string msg = db_ != nullptr ? sqlite3_errmsg(db_) : sqlite3_errstr(rc);
    sqlite3_close(db_);
    db_ = nullptr;
    if ((rc & 0xff) == SQLITE_CANTOPEN) {
      throw Error(ExitCode::no_input,
                  path + ": cannot open the store (" + msg + ")" +
                      (create ? "" : "; run `scaleproof init` first or pass --db PATH"));
    }
    throw Error(exit_code_for(rc), path + ": cannot open the store: " + msg);
  }
  sqlite3_extended_result_codes(db_, 1);
  sqlite3_busy_timeout(db_, busy_timeout_ms);
  // Refuse writes to the schema through the back door (sqlite_dbconfig docs, DEFENSIVE).
  sqlite3_db_config(db_, SQLITE_DBCONFIG_DEFENSIVE, 1, nullptr);
  exec("PRAGMA foreign_keys = ON; PRAGMA recursive_triggers = ON;", "connection settings");
}

Db::~Db() {
  sqlite3_close_v2(db_);
}

void Db::exec(const std::string& sql, std::string_view what) {
  char* err = nullptr;
  int rc = sqlite3_exec(db_, sql.c_str(), nullptr, nullptr, &err);
  if (rc != SQLITE_OK) {
    std::string msg = err != nullptr ? err : sqlite3_errstr(rc);
    sqlite3_free(err);
    if (exit_code_for(rc) == ExitCode::temp_fail) {
      throw Error(ExitCode::temp_fail, path_ + ": " + std::string(what) +
                                           ": store busy (another process holds it); try again");
    }
    throw Error(exit_code_for(rc), path_ + ": " + std::string(what) + ": " + msg);
  }
}

void Db::fail(int rc, std::string_view what) const {
  fail(rc, what, sqlite3_errmsg(db_));
}

void Db::fail(int rc, std::string_view what, const std::string& msg) const {
  if (exit_code_for(rc) == ExitCode::temp_fail) {
    throw Error(ExitCode::temp_fail, path_ + ": " + std::string(what) +
                                         ": store busy (another process holds it); try again");
  }
  throw Error(exit_code_for(rc), path_ + ": " + std::string(what) + ": " + msg);
}

Stmt::Stmt(Db& db, const std::string& sql) : db_(db) {
  int rc = sqlite3_prepare_v3(db.handle(), sql.c_str(), static_cast<int>(sql.size()),
                              SQLITE_PREPARE_PERSISTENT, &st_, nullptr);
  if (rc != SQLITE_OK) db.fail(rc, "preparing `" + sql.substr(0, 60) + "`");
}

Stmt::~Stmt() {
  sqlite3_finalize(st_);
}

Stmt& Stmt::bind_null(int i) {
  sqlite3_bind_null(st_, i);
  return *this;
}
Stmt& Stmt::bind(int i, long long v) {
  sqlite3_bind_int64(st_, i, v);
  return *this;
}
Stmt& Stmt::bind(int i, double v) {
  sqlite3_bind_double(st_, i, v);
  return *this;
}
Stmt& Stmt::bind(int i, std::string_view v) {
  sqlite3_bind_text(st_, i, v.data(), static_cast<int>(v.size()), SQLITE_TRANSIENT);
  return *this;
}
Stmt& Stmt::bind_static(int i, std::string_view v) {
  sqlite3_bind_text(st_, i, v.data(), static_cast<int>(v.size()), SQLITE_STATIC);
  return *this;
}
Stmt& Stmt::bind_blob(int i, const void* data, int size) {
  sqlite3_bind_blob(st_, i, data, size, SQLITE_TRANSIENT);
  return *this;
}
Stmt& Stmt::bind(int i, const std::optional<std::string>& v) {
  return v ? bind(i, std::string_view(*v)) : bind_null(i);
}
Stmt& Stmt::bind(int i, const std::optional<double>& v) {
  return v ? bind(i, *v) : bind_null(i);
}
Stmt& Stmt::bind(int i, const std::optional<long long>& v) {
  return v ? bind(i, *v) : bind_null(i);
}

bool Stmt::step(std::string_view what) {
  int rc = sqlite3_step(st_);
  if (rc == SQLITE_ROW) return true;
  if (rc == SQLITE_DONE) return false;
  std::string msg = sqlite3_errmsg(db_.handle());  // before reset, which may clear it
  sqlite3_reset(st_);
  db_.fail(rc, what, msg);
}

void Stmt::run(std::string_view what) {
  while (step(what)) {
  }
  reset();
}

void Stmt::reset() {
  sqlite3_reset(st_);
  sqlite3_clear_bindings(st_);
}

std::string Stmt::text(int col) const {
  return std::string(text_view(col));
}

std::string_view Stmt::text_view(int col) const {
  const unsigned char* p = sqlite3_column_text(st_, col);
  if (p == nullptr) return {};
  return std::string_view(reinterpret_cast<const char*>(p),
                          static_cast<size_t>(sqlite3_column_bytes(st_, col)));
}

std::optional<std::string> Stmt::opt_text(int col) const {
  if (is_null(col)) return std::nullopt;
  return text(col);
}
std::optional<double> Stmt::opt_f64(int col) const {
  if (is_null(col)) return std::nullopt;
  return f64(col);
}
std::optional<long long> Stmt::opt_i64(int col) const {
  if (is_null(col)) return std::nullopt;
  return i64(col);
}

}  // namespace sp::store
