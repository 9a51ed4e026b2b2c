// The ticket store: an append-only, hash-chained ledger of scales, rigs, weigh sessions,
// passes, corrections and issued reports. The CLI, the report and the audit code all use it
// through this interface; tests open it on ":memory:" or a temp file.
//
// Units: every weight in a record is in the unit of the scale / rig it belongs to, exactly as
// entered; nothing is converted. Times are ISO 8601 strings as given; when a record's time is
// left empty the store fills in the current UTC time ("2026-12-01T19:05:57Z").
// Transactions: every command runs in exactly one. begin_write() takes the write lock at once
// (BEGIN IMMEDIATE) so concurrent writers serialise; a writer waits up to the busy timeout
// (Options::busy_timeout_ms) and then gets sp::Error(temp_fail). Nothing is visible to others
// until commit(); destroying a Txn without commit() rolls everything back.
// Throws sp::Error: data_error for input the rules refuse (with the ticket / field named),
// no_input for a missing record, temp_fail when busy, io_error for file trouble.
#pragma once
#include <functional>
#include <memory>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/model.h"

namespace sp::store {

struct ScaleRecord {
  long long id = 0;
  ScaleInfo info;  // info.id is the station's scale code; info.last_inspected: latest inspection
  WeightUnit unit = WeightUnit::lb;
  std::optional<std::string> entered_by;
  std::string entered_at;
};

struct Inspection {
  long long id = 0;
  long long scale_id = 0;
  std::string inspected_on;         // ISO date YYYY-MM-DD
  std::optional<std::string> seal;  // seal or certificate number
  std::optional<std::string> inspector;
  std::optional<std::string> notes;
  std::optional<std::string> entered_by;
  std::string entered_at;  // empty on input: now
};

struct RigRecord {
  long long id = 0;
  std::string name;
  Units units;  // units of the geometry (length) and ratings (weight)
  TowVehicle vehicle;
  Trailer trailer;
  std::optional<std::string> entered_by;
  std::string entered_at;
};

struct NewSession {
  std::optional<std::string> ref;  // external key, unique (CSV `session` column)
  long long rig_id = 0;
  long long scale_id = 0;
  std::optional<std::string> station, operator_name, owner, notes;
  std::optional<double> length_uncertainty;
  std::optional<std::string> opened_by;
  std::string opened_at;  // empty: now
};

struct SessionSummary {
  long long id = 0;
  std::optional<std::string> ref;
  std::string rig_name;
  std::string scale_code;
  std::optional<std::string> operator_name;
  std::string opened_at;
  std::optional<std::string> closed_at;
  long long passes = 0;
  long long voided = 0;
};

struct Correction {
  long long id = 0;
  long long pass_id = 0;
  std::string ticket;
  std::string action;  // "void"
  std::string reason;
  std::optional<std::string> made_by;
  std::string made_at;
};

// A correction that supersedes a pass and keeps its ticket (schema/002). `now` holds the
// pass's complete corrected values; `was` what it superseded (the pass as first stored, or
// the previous correction of the same pass). Both carry the pass's id and ticket.
struct PassCorrection {
  long long id = 0;
  long long pass_id = 0;
  std::string ticket;
  Pass was, now;
  std::string reason;
  std::optional<std::string> made_by;
  std::string made_at;
};

struct IssuedReport {
  long long id = 0;
  long long session_id = 0;
  std::string report_id;        // unique
  std::string pdf_sha256;       // 64 lowercase hex digits
  std::string key_fingerprint;  // signer public-key fingerprint
  std::optional<std::string> signed_by;
  std::string issued_at;  // empty on input: now
};

// Everything recorded about one session, for `session show` and the report.
struct SessionHistory {
  Session session;  // the corrected view the engine gets (voided passes flagged)
  std::optional<std::string> ref;
  std::optional<std::string> opened_by;
  std::string opened_at;
  std::optional<std::string> closed_by, closed_at;
  std::string rig_name;
  std::vector<Correction> corrections;           // voids
  std::vector<PassCorrection> pass_corrections;  // oldest first
  std::vector<Inspection> inspections;           // of the session's scale, oldest first
  std::vector<IssuedReport> reports;
};

// A signed checkpoint (schema/003_checkpoints.sql): the chain as it stood just before it,
// signed by the station key over the message of report/checkpoint.h.
struct Checkpoint {
  long long id = 0;
  long long seq = 0;            // its own chain position (rows + 1: it follows what it signs)
  long long rows = 0;           // it covers chain positions 1..rows
  std::string head;             // hex SHA-256 of row `rows`
  std::string public_key;       // raw Ed25519 key, 64 hex digits
  std::string key_fingerprint;  // report/signer.h fingerprint()
  std::string signature;        // 64-byte Ed25519 signature, 128 hex digits
  std::optional<std::string> signed_by;
  std::string signed_at;  // ISO 8601, as signed
};

// The chain's extent as this connection sees it: positions 1..rows, `head` the hex hash of
// row `rows` ("" when rows is 0). Read from the top of each table (an index lookup each).
struct ChainHead {
  long long rows = 0;
  std::string head;
};

// One way the store's schema (sqlite_schema: tables, indexes, triggers, views) differs from
// what its migrations 1..PRAGMA user_version make.
struct SchemaDifference {
  std::string type;  // "table", "index", "trigger", "view", or "pragma"
  std::string name;
  std::string problem;  // plain words: "is missing", "was not made by the migrations", ...
};

// Result of walking the chain. When !ok, table/id/ticket/seq name the first bad row.
struct ChainCheck {
  bool ok = true;
  long long rows = 0;  // rows verified (all of them when ok)
  std::string head;    // hex SHA-256 of the last row ("" for an empty store)
  std::string table;
  long long id = 0;
  long long seq = 0;
  std::optional<std::string> ticket;
  std::string problem;  // what does not match, in plain words
  int walkers = 1;      // threads that walked the chain (2: the two-half walk answered)
};

class Store {
 public:
  virtual ~Store() = default;

  virtual void begin_write() = 0;
  virtual void begin_read() = 0;
  virtual void commit() = 0;
  virtual void rollback() noexcept = 0;
  // Within the current write transaction, prepares for storing many rows (import): a larger
  // page cache, and the per-row INSERT guards of passes and sessions lifted until commit(),
  // which puts them back before it commits (rollback() restores them with everything else).
  // See SqliteStore::begin_bulk for why the guards stay exactly as strong.
  virtual void begin_bulk() = 0;

  // Scales. `info.last_inspected`, when set, is recorded as a first inspection.
  virtual long long add_scale(const ScaleInfo& info, WeightUnit unit,
                              const std::optional<std::string>& by, const std::string& at) = 0;
  virtual long long add_inspection(const Inspection& inspection) = 0;
  virtual std::vector<ScaleRecord> list_scales() = 0;
  virtual std::optional<ScaleRecord> find_scale(std::string_view code) = 0;
  virtual std::vector<Inspection> inspections(long long scale_id) = 0;

  // Rigs: a tow vehicle and a trailer, stored as their own rows, joined under a unique name.
  virtual long long add_rig(const RigRecord& rig) = 0;
  virtual std::vector<RigRecord> list_rigs() = 0;
  // By name, or by id when `key` is all digits and no rig has it as its name.
  virtual std::optional<RigRecord> find_rig(std::string_view key) = 0;

  // Sessions get ids 1, 2, 3, ... The scale's unit must equal the rig's weight unit.
  virtual long long open_session(const NewSession& s) = 0;
  virtual void close_session(long long session_id, const std::optional<std::string>& by,
                             const std::string& at) = 0;
  virtual std::vector<SessionSummary> list_sessions() = 0;
  virtual std::optional<long long> find_session_by_ref(std::string_view ref) = 0;
  virtual bool session_exists(long long session_id) = 0;
  // The corrected view of one session (throws no_input when absent).
  virtual Session load_session(long long session_id) = 0;
  virtual SessionHistory session_history(long long session_id) = 0;
  // Every session in id order, one at a time (memory does not grow with the store).
  virtual void for_each_session(const std::function<void(const Session&)>& fn) = 0;
  // Ticket numbers that occur in the passes of more than one session (voided passes included),
  // sorted. The candidates for the audit's ticket-reuse rule: a store audit indexes only these,
  // so its memory does not grow with the store. Implemented in sqlite_stream.cpp.
  virtual std::vector<std::string> shared_tickets() = 0;

  // Appends a pass after checking it against its session and scale: session open, ticket new
  // in the session, readings multiples of the division and in range, trailer reading absent
  // or 0 when unhitched, setting only on tensioned passes, printed gross = sum of platforms.
  // Returns the pass id. Pass.id / voided / void_reason are ignored (see void_pass).
  virtual long long add_pass(long long session_id, const Pass& pass) = 0;
  // The same for several passes of one session, in order, stored by one statement (an import's
  // hot path: one statement's fixed cost shared by the rows). All or none are stored; on an
  // error nothing of the batch is stored and the caller may replay the passes one by one with
  // add_pass to name the one at fault. Returns the pass ids in order.
  virtual std::vector<long long> add_passes(long long session_id,
                                            const std::vector<Pass>& passes) = 0;
  // Appends a correction that voids a pass (it stays stored and visible).
  virtual long long void_pass(long long pass_id, const std::string& reason,
                              const std::optional<std::string>& by, const std::string& at) = 0;
  // Appends a correction that supersedes pass `pass_id` (schema/002): `corrected` holds the
  // pass's complete new values (kind, setting, weighed_at, readings, gross, scale_id); its
  // ticket must be empty or the pass's own (a correction keeps the ticket); id, voided,
  // entered_* are ignored. It is checked like a new pass against the session's scale.
  // A pass may be corrected again: the latest correction is what the engine gets, and every
  // correction stays on record. Refused (data_error): a voided pass, a pass of a closed
  // session, a pass not in `in_session` when given, an empty reason, a correction that
  // changes nothing. no_input: no such pass. Returns the correction's id.
  virtual long long correct_pass(long long pass_id, std::optional<long long> in_session,
                                 const Pass& corrected, const std::string& reason,
                                 const std::optional<std::string>& by, const std::string& at) = 0;
  // The id of the pass with `ticket` in the session, when there is one.
  virtual std::optional<long long> find_pass(long long session_id, std::string_view ticket) = 0;
  // The session pass `pass_id` belongs to, when the pass exists.
  virtual std::optional<long long> pass_session(long long pass_id) = 0;

  virtual long long record_report(const IssuedReport& report) = 0;
  // All reports (session_id = nullopt) or those of one session, in issue order.
  virtual std::vector<IssuedReport> list_reports(std::optional<long long> session_id) = 0;

  // Walks the whole chain; `progress(rows_done)` is called now and then when given.
  virtual ChainCheck check_chain(const std::function<void(long long)>& progress = {}) = 0;
  // Hex SHA-256 of the chain's last row; "" when the store is empty.
  virtual std::string head_hash() = 0;
  virtual long long row_count() = 0;
  virtual int schema_version() = 0;

  // Anchors and checkpoints (sqlite_proof.cpp).
  virtual ChainHead chain_head() = 0;
  // The stored hash of chain position `seq` in hex; nullopt when no row or not 32 bytes.
  // Proves a prefix only after check_chain() verified positions 1..seq.
  virtual std::optional<std::string> stored_hash_at(long long seq) = 0;
  // Appends a signed checkpoint. Precondition: a write transaction; c.rows and c.head are the
  // current chain head (else data_error: the chain moved since it was signed) and rows > 0.
  // The signature is not checked here (the store knows no keys). Returns its id.
  virtual long long add_checkpoint(const Checkpoint& c) = 0;
  virtual std::vector<Checkpoint> list_checkpoints() = 0;  // in chain order
  virtual std::optional<Checkpoint> latest_checkpoint() = 0;
  // Compares sqlite_schema with the schema that migrations 1..schema_version() make on an empty
  // database (built in memory), object by object, triggers included, and application_id.
  // Empty: identical. sqlite_stat* tables (made by ANALYZE) are ignored.
  virtual std::vector<SchemaDifference> check_schema() = 0;
};

struct Options {
  bool create = false;  // init: create the file and apply migrations
  // 5 s: long enough for another operator's single command to commit (a pass add is ~1 ms),
  // short enough that a stuck process is reported instead of hanging (common practice).
  int busy_timeout_ms = 5000;
  // check_chain walks chains of at least this many rows in two halves on two threads (0: never).
  // 10 000: the second walk's set-up (a second connection, its schema read, a thread) measured
  // 3.9 M instructions under callgrind, what checking 300 to 700 rows costs (the range: SHA-256
  // with and without SHA-NI); from 10 000 rows that is at most 7 % of the walk, so a busy second
  // core costs little and a free one nearly halves the walk (bench/README.md, item 3). Tests
  // set it low to run the two-thread path on small stores.
  long long parallel_check_rows = 10000;
};

// Opens the SQLite store at `path` (":memory:" for tests). Applies pending migrations when
// opening an existing store of an older version; refuses a newer one (data_error).
// Without create, a missing file is no_input ("run scaleproof init").
std::unique_ptr<Store> open_sqlite_store(const std::string& path, const Options& options);

// Scope guard for one command's transaction.
class Txn {
 public:
  enum Kind { read, write };
  Txn(Store& s, Kind k) : s_(s) {
    if (k == write)
      s_.begin_write();
    else
      s_.begin_read();
  }
  ~Txn() {
    if (!done_) s_.rollback();
  }
  Txn(const Txn&) = delete;
  Txn& operator=(const Txn&) = delete;
  void commit() {
    s_.commit();
    done_ = true;
  }

 private:
  Store& s_;
  bool done_ = false;
};

// Current UTC time as "YYYY-MM-DDTHH:MM:SSZ".
std::string now_utc();

}  // namespace sp::store
