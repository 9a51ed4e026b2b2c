// The SQLite implementation of sp::store::Store (internal to src/store).
// Split over sqlite_store.cpp (open, migrations, transactions, appends, scales, rigs),
// sqlite_sessions.cpp (sessions, passes, corrections, reports), sqlite_corrections.cpp (pass
// corrections), sqlite_check.cpp (chain) and sqlite_proof.cpp (chain head, checkpoints, schema
// check).
#pragma once
#include <map>
#include <memory>
#include <unordered_map>

#include "store/chain.h"
#include "store/sqlite_db.h"
#include "store/store.h"

namespace sp::store {

class SqliteStore;

// Binds one new row's values and builds its canonical encoding in the same pass, so the
// hash covers exactly what is stored. Values must come in the table's chained column order.
class RowBuilder {
 public:
  RowBuilder(SqliteStore& s, const char* table);
  // Row `row` (0-based) of a multi-row INSERT prepared by SqliteStore::batch_insert, at chain
  // position `seq`. Only for tables whose id is their seq (passes). Finish with stage().
  RowBuilder(SqliteStore& s, const char* table, Stmt& batch, int row, long long seq);
  RowBuilder& i(long long v);
  RowBuilder& i(const std::optional<long long>& v);
  RowBuilder& r(double v);
  RowBuilder& r(const std::optional<double>& v);
  RowBuilder& t(std::string_view v);
  RowBuilder& t(const std::string& v) { return t(std::string_view(v)); }
  RowBuilder& t(const char* v) { return t(std::string_view(v)); }
  RowBuilder& t(const std::optional<std::string>& v);
  // Text whose bytes stay valid until the row is stored (append(), or stage() and the batch's
  // run): bound without SQLite's copy (SQLITE_STATIC), for the import's hot path.
  RowBuilder& kept(std::string_view v);
  RowBuilder& kept(const std::string& v) { return kept(std::string_view(v)); }
  RowBuilder& kept(const std::optional<std::string>& v);
  // Hashes, inserts and advances the chain; returns the new row's id.
  long long append(std::string_view what);
  // Batch rows: binds this row's hash, computed on `prev`, and returns it; the caller runs the
  // statement and advances the chain only when the whole batch is stored.
  Hash stage(const Hash& prev);
  long long id() const { return id_; }

 private:
  void expect(ColType type);
  RowBuilder& null_of(ColType type);  // binds and encodes NULL for the next column
  void check_complete() const;
  SqliteStore& s_;
  struct Writer* w_;
  Stmt* st_ = nullptr;  // the statement the values are bound to
  int hash_param_ = 0;
  long long id_ = 0;
  long long seq_ = 0;
  int param_ = 0;
  size_t col_ = 0;
};

struct Writer {
  const TableDesc* desc = nullptr;
  std::unique_ptr<Stmt> insert;
  int first_col_param = 0;  // parameter index of the first chained column
  int hash_param = 0;
  long long next_id = 0;                     // 0: not read yet in this transaction
  int params_per_row = 0;                    // id[, seq], hash and the chained columns
  std::string values_head;                   // "INSERT INTO t (id, ..., col) VALUES "
  std::string tuple;                         // "(?, ?, ...)": one row's parameters
  std::vector<std::unique_ptr<Stmt>> batch;  // [n]: INSERT of n rows (see batch_insert)
};

struct SessionCtx {
  long long id = 0;
  ScaleInfo scale;
  WeightUnit unit = WeightUnit::lb;
  bool closed = false;
};

// A pass's columns (read_pass), its void and its latest correction (schema/002). The latest
// correction is one index step (pass_corrections_by_pass holds pass_id, id: max() reads the
// last entry of the pass's range).
inline constexpr const char* kPassCols =
    "p.id, p.kind, p.setting, p.ticket, p.weighed_at, p.steer, p.drive, p.trailer, p.gross, "
    "p.scale_code, p.entered_by, p.entered_at, c.reason";
inline constexpr const char* kCorrectionCols =
    ", k.id, k.kind, k.setting, k.weighed_at, k.steer, k.drive, k.trailer, k.gross, "
    "k.scale_code";
inline constexpr const char* kVoidJoin =
    " LEFT JOIN corrections c ON c.pass_id = p.id AND c.action = 'void'";
inline constexpr const char* kCorrectionJoin =
    " LEFT JOIN pass_corrections k ON k.id = "
    "(SELECT max(id) FROM pass_corrections WHERE pass_id = p.id)";

// The pass whose columns start at `c` in q: p.id, p.kind, p.setting, p.ticket, p.weighed_at,
// p.steer, p.drive, p.trailer, p.gross, p.scale_code, p.entered_by, p.entered_at, c.reason,
// then, when `corrected`, the kCorrectionCols, whose values replace the pass's when present.
Pass read_pass(const Stmt& q, int c, bool corrected);  // sqlite_sessions.cpp

class SqliteStore final : public Store {
 public:
  SqliteStore(const std::string& path, const Options& options);

  void begin_write() override;
  void begin_read() override;
  void commit() override;
  void rollback() noexcept override;
  void begin_bulk() override;

  long long add_scale(const ScaleInfo& info, WeightUnit unit, const std::optional<std::string>& by,
                      const std::string& at) override;
  long long add_inspection(const Inspection& inspection) override;
  std::vector<ScaleRecord> list_scales() override;
  std::optional<ScaleRecord> find_scale(std::string_view code) override;
  std::vector<Inspection> inspections(long long scale_id) override;

  long long add_rig(const RigRecord& rig) override;
  std::vector<RigRecord> list_rigs() override;
  std::optional<RigRecord> find_rig(std::string_view key) override;

  long long open_session(const NewSession& s) override;
  void close_session(long long session_id, const std::optional<std::string>& by,
                     const std::string& at) override;
  std::vector<SessionSummary> list_sessions() override;
  std::optional<long long> find_session_by_ref(std::string_view ref) override;
  bool session_exists(long long session_id) override;
  Session load_session(long long session_id) override;
  SessionHistory session_history(long long session_id) override;
  void for_each_session(const std::function<void(const Session&)>& fn) override;
  std::vector<std::string> shared_tickets() override;  // sqlite_stream.cpp

  long long add_pass(long long session_id, const Pass& pass) override;
  std::vector<long long> add_passes(long long session_id, const std::vector<Pass>& passes) override;
  long long void_pass(long long pass_id, const std::string& reason,
                      const std::optional<std::string>& by, const std::string& at) override;
  long long correct_pass(long long pass_id, std::optional<long long> in_session,
                         const Pass& corrected, const std::string& reason,
                         const std::optional<std::string>& by, const std::string& at) override;
  std::optional<long long> find_pass(long long session_id, std::string_view ticket) override;
  std::optional<long long> pass_session(long long pass_id) override;

  long long record_report(const IssuedReport& report) override;
  std::vector<IssuedReport> list_reports(std::optional<long long> session_id) override;

  ChainCheck check_chain(const std::function<void(long long)>& progress) override;
  std::string head_hash() override;
  long long row_count() override;
  int schema_version() override;

  ChainHead chain_head() override;  // sqlite_proof.cpp
  std::optional<std::string> stored_hash_at(long long seq) override;
  long long add_checkpoint(const Checkpoint& c) override;
  std::vector<Checkpoint> list_checkpoints() override;
  std::optional<Checkpoint> latest_checkpoint() override;
  std::vector<SchemaDifference> check_schema() override;

 private:
  friend class RowBuilder;
  void migrate(bool create);
  void require_write(std::string_view what) const;
  void load_head();
  Writer& writer(const char* table);
  Stmt& batch_insert(const char* table, size_t rows);  // cached n-row INSERT of a seq table
  Stmt& stmt(const std::string& sql);                  // cached prepared statement
  std::string when(const std::string& at) const { return at.empty() ? now_ : at; }
  std::optional<ScaleRecord> scale_by_id(long long id);
  std::optional<RigRecord> rig_by_id(long long id);
  const SessionCtx& session_ctx(long long session_id);
  RowBuilder& bind_pass(RowBuilder& b, long long session_id, const Pass& pass);
  void clear_caches();
  void read_pass_corrections(long long session_id, SessionHistory& h);  // sqlite_corrections.cpp
  bool any_pass_corrections();
  std::optional<ChainCheck> check_chain_halves(const std::function<void(long long)>& progress);

  Db db_;
  int busy_timeout_ms_;
  long long parallel_check_rows_;
  bool in_write_ = false;
  bool in_txn_ = false;
  std::string now_;
  long long next_seq_ = 1;
  Hash head_{};
  std::unordered_map<std::string, Writer> writers_;
  std::unordered_map<std::string, std::unique_ptr<Stmt>> stmts_;
  std::map<long long, ScaleRecord> scale_cache_;
  std::map<long long, RigRecord> rig_cache_;
  SessionCtx session_ctx_;
  std::vector<std::string> lifted_guards_;  // CREATE TRIGGER text, put back by commit()
  long long cache_before_ = 0;              // PRAGMA cache_size before begin_bulk
  Sha256 sha_;
  Encoder enc_;
};

}  // namespace sp::store
