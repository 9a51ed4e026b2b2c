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
  long long sessions_opened = 0;
  long long sessions_joined = 0;  // existing sessions that received passes
};

// CSV of passes (columns in format/pass_csv.h). A `session` key not in the store opens a new
// session on the named scale and rig (both must exist); a known key adds to that session,
// which must be open and on the same scale. Errors: data_error "<source>:<line>: ...".
// `progress(bytes_read)` is called every few thousand rows when given.
ImportStats import_pass_csv(Store& store, std::istream& in, const std::string& source,
                            const std::optional<std::string>& by,
                            const std::function<void(std::uint64_t)>& progress = {});

// One session file: reuses the scale when the store has it with the same data (refuses a
// conflicting one), reuses an identical rig or adds one, opens a new session and appends the
// passes (voided ones are stored and voided). Returns the new session id.
long long import_session(Store& store, const Session& session, const std::string& source,
                         const std::optional<std::string>& by);

}  // namespace sp::store
