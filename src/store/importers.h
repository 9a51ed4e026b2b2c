// Bringing outside records into the store: CSV of passes and session files.
// Both run inside the caller's write transaction and throw on the first bad record, so the
// caller's rollback leaves the store exactly as it was (all-or-nothing).
#pragma once
#include <cstdint>
#include <functional>
#include <istream>
#include <optional>
#include <string>

#include "core/model.h"
#include "store/store.h"

namespace sp::store {

struct ImportStats {
  long long passes = 0;
  long long voided = 0;
  long long corrected = 0;        // correction rows (docs/csv.md, correction_reason)
  long long sessions_opened = 0;
  long long sessions_joined = 0;  // existing sessions that received passes
};

// CSV of passes (columns in format/pass_csv.h). A `session` key not in the store opens a new
// session on the named scale and rig (both must exist); a known key adds to that session,
// which must be open and on the same scale. A row with a correction_reason corrects the pass
// of its ticket in its session (Store::correct_pass). Errors: data_error "<source>:<line>: ...".
// `progress(rows_stored, bytes_read)` is called every few thousand rows and at the end, when
// given.
ImportStats import_pass_csv(Store& store, std::istream& in, const std::string& source,
                            const std::optional<std::string>& by,
                            const std::function<void(long long, std::uint64_t)>& progress = {});

// One session file: reuses the scale when the store has it with the same data (refuses a
// conflicting one), reuses an identical rig or adds one, opens a new session and appends the
// passes (voided ones are stored and voided). Returns the new session id.
long long import_session(Store& store, const Session& session, const std::string& source,
                         const std::optional<std::string>& by);

// The CSV of one session (header included) that `import_pass_csv` reads back to the same
// passes, voids and corrections (docs/csv.md): the session key is its ref, else "session-N".
// A corrected pass is its row as first stored, then one row per correction (correction_reason),
// the void, if any, on the last of them.
std::string export_pass_csv(const SessionHistory& h);

}  // namespace sp::store
