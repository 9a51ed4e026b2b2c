// `scaleproof reconcile --session N... | --all [--json]`: sessions from the ticket store.
//  - sessions: each printed exactly as `reconcile FILE` prints a file (print_reconciled),
//    with "session N" as the source.
//  - all: streams every session in id order, one line each: JSON Lines with --json
//    ({"session": N, "result": {...}} or {"session": N, "error": "..."}), else one summary line.
//    A session the engine refuses is reported and the run goes on; memory stays flat.
//    `jobs` worker threads solve and render batches of sessions (0: one per core; 1: none,
//    each line written as soon as it is solved) while this thread reads the store and writes
//    the batches in id order: stdout, stderr and exit code are byte for byte those of jobs = 1,
//    including a failure that ends the run (the first in id order wins; nothing after it).
// Returns the exit code: the worst code seen (0 when every session solved).
#pragma once
#include <iosfwd>
#include <vector>

#include "cli/context.h"

namespace sp::cli {

int reconcile_from_store(const Context& ctx, const std::vector<long long>& sessions, bool all,
                         bool json, unsigned jobs, std::ostream& out, std::ostream& err);

}  // namespace sp::cli
