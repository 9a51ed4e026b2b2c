#include "store/sqlite_store.h"

#include <fmt/format.h>

#include <cmath>
#include <cstdlib>
#include <cstring>
#include <ctime>

#include "core/embedded.h"
#include "format/iso8601.h"
#include "format/validate.h"

namespace sp::store {

std::string now_utc() {
  std::time_t t = std::time(nullptr);
  std::tm tm{};
  gmtime_r(&t, &tm);
  char buf[32];
  std::strftime(buf, sizeof buf, "%Y-%m-%dT%H:%M:%SZ", &tm);
  return buf;
}

std::unique_ptr<Store> open_sqlite_store(const std::string& path, const Options& options) {
  return std::make_unique<SqliteStore>(path, options);
}

// ---- RowBuilder -------------------------------------------------------------------------

RowBuilder::RowBuilder(SqliteStore& s, const char* table) : s_(s) {
  s_.require_write(table);
  w_ = &s_.writer(table);
  seq_ = s_.next_seq_;
  if (w_->desc->id_is_seq) {
    id_ = seq_;
  } else {
    if (w_->next_id == 0) {
      Stmt& q = s_.stmt(fmt::format("SELECT coalesce(max(id), 0) + 1 FROM {}", table));
      q.step("reading the next id");
      w_->next_id = q.i64(0);
      q.reset();
    }
    id_ = w_->next_id;
  }
  st_ = w_->insert.get();
  hash_param_ = w_->hash_param;
  st_->bind(1, id_);
  if (!w_->desc->id_is_seq) st_->bind(2, seq_);
  param_ = w_->first_col_param;
  s_.enc_.start(*w_->desc, seq_, id_);
}

RowBuilder::RowBuilder(SqliteStore& s, const char* table, Stmt& batch, int row, long long seq)
    : s_(s), st_(&batch) {
  s_.require_write(table);
  w_ = &s_.writer(table);
  if (!w_->desc->id_is_seq) {
    throw Error(ExitCode::internal, fmt::format("{}: batch rows need id = seq", table));
  }
  seq_ = id_ = seq;
  int base = row * w_->params_per_row;
  st_->bind(base + 1, id_);
  hash_param_ = base + w_->hash_param;
  param_ = base + w_->first_col_param;
  s_.enc_.start(*w_->desc, seq_, id_);
}

void RowBuilder::expect(ColType type) {
  if (col_ >= w_->desc->columns.size() || w_->desc->columns[col_].type != type) {
    throw Error(ExitCode::internal,
                fmt::format("{}: column {} bound with the wrong type", w_->desc->name, col_));
  }
  ++col_;
}

RowBuilder& RowBuilder::i(long long v) {
  expect(ColType::integer);
  st_->bind(param_++, v);
  s_.enc_.add_int(v);
  return *this;
}
RowBuilder& RowBuilder::i(const std::optional<long long>& v) {
  if (v) return i(*v);
  return null_of(ColType::integer);
}
RowBuilder& RowBuilder::r(double v) {
  expect(ColType::real);
  if (!std::isfinite(v)) {
    throw data_error(
        fmt::format("{}: expected a finite number, got {}", w_->desc->columns[col_ - 1].name, v));
  }
  st_->bind(param_++, v);
  s_.enc_.add_real(v);
  return *this;
}
RowBuilder& RowBuilder::r(const std::optional<double>& v) {
  if (v) return r(*v);
  return null_of(ColType::real);
}
RowBuilder& RowBuilder::t(std::string_view v) {
  expect(ColType::text);
  st_->bind(param_++, v);
  s_.enc_.add_text(v);
  return *this;
}
RowBuilder& RowBuilder::t(const std::optional<std::string>& v) {
  if (v) return t(std::string_view(*v));
  return null_of(ColType::text);
}

RowBuilder& RowBuilder::kept(std::string_view v) {
  expect(ColType::text);
  st_->bind_static(param_++, v);
  s_.enc_.add_text(v);
  return *this;
}
RowBuilder& RowBuilder::kept(const std::optional<std::string>& v) {
  if (v) return kept(std::string_view(*v));
  return null_of(ColType::text);
}

RowBuilder& RowBuilder::null_of(ColType type) {
  expect(type);
  st_->bind_null(param_++);
  s_.enc_.add_null();
  return *this;
}

void RowBuilder::check_complete() const {
  if (col_ != w_->desc->columns.size()) {
    throw Error(ExitCode::internal, fmt::format("{}: {} of {} columns bound", w_->desc->name, col_,
                                                w_->desc->columns.size()));
  }
}

Hash RowBuilder::stage(const Hash& prev) {
  check_complete();
  Hash h = s_.sha_.digest(s_.enc_.chained(prev));
  st_->bind_blob(hash_param_, h.data(), static_cast<int>(h.size()));
  return h;
}

long long RowBuilder::append(std::string_view what) {
  check_complete();
  Hash h = s_.sha_.digest(s_.enc_.chained(s_.head_));
  st_->bind_blob(hash_param_, h.data(), static_cast<int>(h.size()));
  try {
    st_->run(what);
  } catch (...) {
    st_->reset();
    throw;
  }
  s_.head_ = h;
  s_.next_seq_ = seq_ + 1;
  if (!w_->desc->id_is_seq) w_->next_id = id_ + 1;
  return id_;
}

// ---- open, migrations, transactions ------------------------------------------------------

SqliteStore::SqliteStore(const std::string& path, const Options& options)
    : db_(path, options.create, options.busy_timeout_ms),
      busy_timeout_ms_(options.busy_timeout_ms),
      parallel_check_rows_(options.parallel_check_rows) {
  migrate(options.create);
}

int SqliteStore::schema_version() {
  Stmt q(db_, "PRAGMA user_version");
  q.step("reading the schema version");
  return static_cast<int>(q.i64(0));
}

void SqliteStore::migrate(bool create) {
  const auto& files = embedded::schema_files();
  int latest = 0;
  for (const auto& f : files) latest = std::max(latest, std::atoi(std::string(f.name).c_str()));
  int version = schema_version();
  if (version > latest) {
    throw data_error(
        fmt::format("{}: store schema version {} is newer than this scaleproof "
                    "knows ({}); use a newer scaleproof",
                    db_.path(), version, latest));
  }
  if (version == 0) {
    Stmt q(db_, "SELECT count(*) FROM sqlite_schema");
    q.step("reading the schema");
    bool empty = q.i64(0) == 0;
    if (!empty) {
      throw data_error(db_.path() +
                       ": not a scaleproof store (it has tables but no schema "
                       "version)");
    }
    if (!create) {
      throw Error(ExitCode::no_input,
                  db_.path() + ": the store is not initialised; run `scaleproof init` first");
    }
  }
  if (version == latest) return;
  // WAL lets readers run while one operator writes; it persists in the file (SQLite docs,
  // "Write-Ahead Logging"). synchronous stays FULL (the default): a committed pass must
  // survive a power cut, at the cost of one fsync per command.
  if (db_.path() != ":memory:") db_.exec("PRAGMA journal_mode = WAL", "switching to WAL");
  db_.exec("BEGIN IMMEDIATE", "starting the migration");
  // A migration may rewrite a table's SQL text to an equivalent form (002 does, for a CHECK),
  // which needs writable_schema, which SQLITE_DBCONFIG_DEFENSIVE refuses: defensive mode is
  // lifted for the migrations' own SQL only, inside the transaction, and restored after.
  sqlite3_db_config(db_.handle(), SQLITE_DBCONFIG_DEFENSIVE, 0, nullptr);
  try {
    // Re-read under the lock: another process may have migrated meanwhile.
    version = schema_version();
    for (const auto& f : files) {
      int n = std::atoi(std::string(f.name).c_str());
      if (n <= version) continue;
      db_.exec(std::string(f.contents), "applying migration " + std::string(f.name));
      db_.exec(fmt::format("PRAGMA user_version = {}", n), "recording the schema version");
    }
    db_.exec("COMMIT", "committing the migration");
  } catch (...) {
    sqlite3_exec(db_.handle(), "ROLLBACK", nullptr, nullptr, nullptr);
    sqlite3_db_config(db_.handle(), SQLITE_DBCONFIG_DEFENSIVE, 1, nullptr);
    throw;
  }
  sqlite3_db_config(db_.handle(), SQLITE_DBCONFIG_DEFENSIVE, 1, nullptr);
}

void SqliteStore::clear_caches() {
  for (auto& [name, w] : writers_) w.next_id = 0;
  scale_cache_.clear();
  rig_cache_.clear();
  session_ctx_ = SessionCtx{};
}

void SqliteStore::begin_write() {
  db_.exec("BEGIN IMMEDIATE", "starting a write");
  in_txn_ = in_write_ = true;
  clear_caches();
  now_ = now_utc();
  load_head();
}

void SqliteStore::begin_read() {
  db_.exec("BEGIN", "starting a read");
  in_txn_ = true;
  in_write_ = false;
  clear_caches();
}

void SqliteStore::commit() {
  if (!lifted_guards_.empty() || cache_before_ != 0) {
    // The guards go back verbatim (the schema check compares their SQL text) in the same
    // transaction, so no committed state of the store ever lacks them.
    for (const auto& sql : lifted_guards_) db_.exec(sql, "restoring an append-only guard");
    lifted_guards_.clear();
    if (cache_before_ != 0) {
      db_.exec(fmt::format("PRAGMA cache_size = {}", cache_before_), "restoring the page cache");
      cache_before_ = 0;
    }
  }
  db_.exec("COMMIT", "committing");
  in_txn_ = in_write_ = false;
}

void SqliteStore::rollback() noexcept {
  if (in_txn_) sqlite3_exec(db_.handle(), "ROLLBACK", nullptr, nullptr, nullptr);
  if (cache_before_ != 0) {
    const std::string sql = fmt::format("PRAGMA cache_size = {}", cache_before_);
    sqlite3_exec(db_.handle(), sql.c_str(), nullptr, nullptr, nullptr);
  }
  lifted_guards_.clear();  // the rollback restored them
  cache_before_ = 0;
  in_txn_ = in_write_ = false;
  clear_caches();
}

// Bulk import (Store::begin_bulk).
// Page cache: SQLite's default (2 000 KiB) is far smaller than the indexes an import of 10^6
// passes touches (the sessions' `ref` index takes keys in text order, not insertion order), so
// dirty pages spill to the WAL in the middle of the transaction and are written again when
// dirtied again: 16 MiB (about 4 000 pages) keeps them in memory (bench/README.md: system
// time 3.1 -> 0.7 s at 10^6 passes; peak RSS 18 -> 34 MiB, flat in N because the cache is
// capped).
// Guards: `passes_no_replace` and `sessions_no_replace` (schema/001) exist only to refuse an
// INSERT OR REPLACE, which would otherwise delete a stored row without firing its DELETE
// trigger. This store never issues OR REPLACE (every insert is a plain INSERT, which SQLite
// aborts on any PRIMARY KEY or UNIQUE conflict: the id, seq, ref and (session, ticket) keys
// the triggers test), so inside its own write transaction they can refuse nothing, yet cost a
// trigger program per row (~13 k instructions a pass, ~38 k a session). They are dropped here
// and re-created verbatim by commit() before COMMIT: the write lock is held throughout (no
// other writer can run), readers see the committed schema (WAL snapshots), a failure or crash
// rolls the drop back, and every committed state has the guards. UPDATE and DELETE guards are
// not touched.
void SqliteStore::begin_bulk() {
  require_write("a bulk import");
  if (cache_before_ == 0) {
    Stmt q(db_, "PRAGMA cache_size");
    q.step("reading the page cache size");
    cache_before_ = q.i64(0);
    if (cache_before_ == 0) cache_before_ = -2000;
    db_.exec("PRAGMA cache_size = -16384", "raising the page cache");
  }
  if (!lifted_guards_.empty()) return;
  for (const char* name : {"passes_no_replace", "sessions_no_replace"}) {
    Stmt q(db_, "SELECT sql FROM sqlite_schema WHERE type = 'trigger' AND name = ?");
    q.bind(1, std::string_view(name));
    if (!q.step("reading an append-only guard")) continue;  // none to lift
    std::string sql = q.text(0);
    q.reset();
    db_.exec(fmt::format("DROP TRIGGER {}", name), "lifting an append-only guard");
    lifted_guards_.push_back(std::move(sql));
  }
}

void SqliteStore::require_write(std::string_view what) const {
  if (!in_write_) {
    throw Error(ExitCode::internal, fmt::format("{}: write outside a write transaction", what));
  }
}

void SqliteStore::load_head() {
  next_seq_ = 1;
  head_ = Hash{};
  for (const auto& t : chained_tables()) {
    const char* seq = t.id_is_seq ? "id" : "seq";
    Stmt& q = stmt(fmt::format("SELECT {0}, hash FROM {1} ORDER BY {0} DESC LIMIT 1", seq, t.name));
    if (q.step("reading the chain head") && q.i64(0) >= next_seq_) {
      next_seq_ = q.i64(0) + 1;
      const void* p = sqlite3_column_blob(q.handle(), 1);
      if (p != nullptr && sqlite3_column_bytes(q.handle(), 1) == 32) {
        std::memcpy(head_.data(), p, 32);
      }
    }
    q.reset();
  }
}

std::string SqliteStore::head_hash() {
  if (!in_write_) load_head();
  return next_seq_ == 1 ? std::string() : to_hex(head_);
}

long long SqliteStore::row_count() {
  long long n = 0;
  for (const auto& t : chained_tables()) {
    Stmt& q = stmt(fmt::format("SELECT count(*) FROM {}", t.name));
    q.step("counting rows");
    n += q.i64(0);
    q.reset();
  }
  return n;
}

Writer& SqliteStore::writer(const char* table) {
  auto it = writers_.find(table);
  if (it != writers_.end()) return it->second;
  Writer w;
  w.desc = &table_desc(table);
  std::string cols = w.desc->id_is_seq ? "id, hash" : "id, seq, hash";
  int n = w.desc->id_is_seq ? 2 : 3;
  w.hash_param = n;
  w.first_col_param = n + 1;
  for (const auto& c : w.desc->columns) {
    cols += ", ";
    cols += c.name;
    ++n;
  }
  w.params_per_row = n;
  w.values_head = fmt::format("INSERT INTO {} ({}) VALUES ", table, cols);
  w.tuple = "(?";
  for (int k = 1; k < n; ++k) w.tuple += ", ?";
  w.tuple += ")";
  w.insert = std::make_unique<Stmt>(db_, w.values_head + w.tuple);
  return writers_.emplace(table, std::move(w)).first->second;
}

Stmt& SqliteStore::batch_insert(const char* table, size_t rows) {
  Writer& w = writer(table);
  if (w.batch.size() <= rows) w.batch.resize(rows + 1);
  if (w.batch[rows]) return *w.batch[rows];
  std::string sql = w.values_head + w.tuple;  // the single-row INSERT, its tuple repeated
  for (size_t k = 1; k < rows; ++k) sql += ", " + w.tuple;
  w.batch[rows] = std::make_unique<Stmt>(db_, sql);
  return *w.batch[rows];
}

Stmt& SqliteStore::stmt(const std::string& sql) {
  auto it = stmts_.find(sql);
  if (it != stmts_.end()) return *it->second;
  return *stmts_.emplace(sql, std::make_unique<Stmt>(db_, sql)).first->second;
}

// ---- scales ------------------------------------------------------------------------------

namespace {
constexpr const char* kScaleCols =
    "s.id, s.code, s.name, s.location, s.unit, s.division, s.accuracy_class, s.capacity, "
    "s.reading_uncertainty, s.entered_by, s.entered_at, "
    "(SELECT max(inspected_on) FROM scale_inspections i WHERE i.scale_id = s.id)";

ScaleRecord read_scale(const Stmt& q) {
  ScaleRecord r;
  r.id = q.i64(0);
  r.info.id = q.text(1);
  r.info.name = q.opt_text(2);
  r.info.location = q.opt_text(3);
  r.unit = parse_weight_unit(q.text_view(4)).value_or(WeightUnit::lb);
  r.info.division = q.f64(5);
  r.info.accuracy_class = q.text(6);
  r.info.capacity = q.opt_f64(7);
  r.info.reading_uncertainty = q.opt_f64(8);
  r.entered_by = q.opt_text(9);
  r.entered_at = q.text(10);
  r.info.last_inspected = q.opt_text(11);
  return r;
}

}  // namespace

long long SqliteStore::add_scale(const ScaleInfo& info, WeightUnit unit,
                                 const std::optional<std::string>& by, const std::string& at) {
  if (info.id.empty()) throw data_error("scale id: expected a name such as ST-3, got nothing");
  // The id goes into the context of every other message, so it is judged first, alone.
  validate::text(info.id, validate::Text::label, "scale id", validate::PrefixNames(""));
  try {
    validate::scale(info, unit, validate::PrefixNames(""));
    if (find_scale(info.id)) throw data_error("a scale with this id is already in the store");
  } catch (const Error& e) {
    throw e.within("scale " + info.id);
  }
  long long id = RowBuilder(*this, "scales")
                     .t(info.id)
                     .t(info.name)
                     .t(info.location)
                     .t(to_string(unit))
                     .r(info.division)
                     .t(info.accuracy_class)
                     .r(info.capacity)
                     .r(info.reading_uncertainty)
                     .t(by)
                     .t(when(at))
                     .append("adding scale " + info.id);
  if (info.last_inspected) {
    Inspection i;
    i.scale_id = id;
    i.inspected_on = *info.last_inspected;
    i.entered_by = by;
    i.entered_at = at;
    add_inspection(i);
  }
  return id;
}

long long SqliteStore::add_inspection(const Inspection& in) {
  auto scale = scale_by_id(in.scale_id);
  if (!scale)
    throw Error(ExitCode::no_input, fmt::format("scale id {}: not in the store", in.scale_id));
  if (auto why = format::check_iso_date(in.inspected_on); !why.empty()) {
    throw data_error(fmt::format("scale {}: inspection date: expected YYYY-MM-DD, got '{}' ({})",
                                 scale->info.id, in.inspected_on, why));
  }
  long long id = RowBuilder(*this, "scale_inspections")
                     .i(in.scale_id)
                     .t(in.inspected_on)
                     .t(in.seal)
                     .t(in.inspector)
                     .t(in.notes)
                     .t(in.entered_by)
                     .t(when(in.entered_at))
                     .append("recording an inspection of scale " + scale->info.id);
  scale_cache_.erase(in.scale_id);
  session_ctx_ = SessionCtx{};
  return id;
}

std::vector<ScaleRecord> SqliteStore::list_scales() {
  std::vector<ScaleRecord> out;
  Stmt& q = stmt(fmt::format("SELECT {} FROM scales s ORDER BY s.id", kScaleCols));
  while (q.step("listing scales")) out.push_back(read_scale(q));
  q.reset();
  return out;
}

std::optional<ScaleRecord> SqliteStore::find_scale(std::string_view code) {
  Stmt& q = stmt(fmt::format("SELECT {} FROM scales s WHERE s.code = ?", kScaleCols));
  q.bind(1, code);
  std::optional<ScaleRecord> r;
  if (q.step("finding a scale")) r = read_scale(q);
  q.reset();
  return r;
}

std::optional<ScaleRecord> SqliteStore::scale_by_id(long long id) {
  auto it = scale_cache_.find(id);
  if (it != scale_cache_.end()) return it->second;
  Stmt& q = stmt(fmt::format("SELECT {} FROM scales s WHERE s.id = ?", kScaleCols));
  q.bind(1, id);
  std::optional<ScaleRecord> r;
  if (q.step("reading a scale")) r = read_scale(q);
  q.reset();
  if (r) {
    if (scale_cache_.size() > 4096) scale_cache_.clear();  // bounded memory
    scale_cache_[id] = *r;
  }
  return r;
}

std::vector<Inspection> SqliteStore::inspections(long long scale_id) {
  std::vector<Inspection> out;
  Stmt& q = stmt(
      "SELECT id, scale_id, inspected_on, seal, inspector, notes, entered_by, "
      "entered_at FROM scale_inspections WHERE scale_id = ? ORDER BY inspected_on, id");
  q.bind(1, scale_id);
  while (q.step("listing inspections")) {
    Inspection i;
    i.id = q.i64(0);
    i.scale_id = q.i64(1);
    i.inspected_on = q.text(2);
    i.seal = q.opt_text(3);
    i.inspector = q.opt_text(4);
    i.notes = q.opt_text(5);
    i.entered_by = q.opt_text(6);
    i.entered_at = q.text(7);
    out.push_back(std::move(i));
  }
  q.reset();
  return out;
}

}  // namespace sp::store
