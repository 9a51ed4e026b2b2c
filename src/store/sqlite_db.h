// Thin RAII wrappers over the SQLite C API, used only inside src/store.
//
// Every failure becomes sp::Error: SQLITE_BUSY/LOCKED -> temp_fail (75, "store busy"),
// a constraint or trigger refusal -> data_error (65), anything else -> io_error (74).
// The message names the statement's purpose given by the caller.
#pragma once
#include <sqlite3.h>

#include <optional>
#include <string>
#include <string_view>

#include "core/error.h"

namespace sp::store {

// Maps an SQLite result code to the project's exit code.
ExitCode exit_code_for(int sqlite_rc);

class Db {
 public:
  // Opens (create = true: creates) the file; ":memory:" works. Applies the per-connection
  // settings the store relies on: foreign keys on, recursive triggers on (so INSERT OR
  // REPLACE fires the DELETE refusal), SQLITE_DBCONFIG_DEFENSIVE, busy timeout.
  Db(const std::string& path, bool create, int busy_timeout_ms);
  ~Db();
  Db(const Db&) = delete;
  Db& operator=(const Db&) = delete;

  sqlite3* handle() const { return db_; }
  const std::string& path() const { return path_; }
  // Runs one or more statements without results.
  void exec(const std::string& sql, std::string_view what);
  [[noreturn]] void fail(int rc, std::string_view what) const;
  [[noreturn]] void fail(int rc, std::string_view what, const std::string& message) const;

 private:
  sqlite3* db_ = nullptr;
  std::string path_;
};

class Stmt {
 public:
  Stmt(Db& db, const std::string& sql);
  ~Stmt();
  Stmt(const Stmt&) = delete;
  Stmt& operator=(const Stmt&) = delete;

  // Binds are 1-based, like SQLite's.
  Stmt& bind_null(int i);
  Stmt& bind(int i, long long v);
  Stmt& bind(int i, double v);
  Stmt& bind(int i, std::string_view v);  // copied by SQLite (SQLITE_TRANSIENT)
  Stmt& bind(int i, const std::string& v) { return bind(i, std::string_view(v)); }
  Stmt& bind(int i, const char* v) { return bind(i, std::string_view(v)); }
  Stmt& bind_blob(int i, const void* data, int size);
  // Not copied (SQLITE_STATIC): `v` must stay valid until reset().
  Stmt& bind_static(int i, std::string_view v);
  Stmt& bind(int i, const std::optional<std::string>& v);
  Stmt& bind(int i, const std::optional<double>& v);
  Stmt& bind(int i, const std::optional<long long>& v);

  // Steps once: true when a row is available, false when done. Throws on error.
  bool step(std::string_view what);
  // Steps to completion (statements without rows), then resets.
  void run(std::string_view what);
  void reset();

  bool is_null(int col) const { return sqlite3_column_type(st_, col) == SQLITE_NULL; }
  long long i64(int col) const { return sqlite3_column_int64(st_, col); }
  double f64(int col) const { return sqlite3_column_double(st_, col); }
  std::string text(int col) const;
  std::string_view text_view(int col) const;  // valid until the next step/reset
  std::optional<std::string> opt_text(int col) const;
  std::optional<double> opt_f64(int col) const;
  std::optional<long long> opt_i64(int col) const;
  sqlite3_stmt* handle() const { return st_; }

 private:
  Db& db_;
  sqlite3_stmt* st_ = nullptr;
};

}  // namespace sp::store
