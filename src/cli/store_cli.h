// What the store subcommands share: opening the store named by --db / $SCALEPROOF_DB / XDG,
// the name recorded as "entered by", and small parsing helpers for flags.
#pragma once
#include <memory>
#include <optional>
#include <string>

#include "cli/context.h"
#include "store/store.h"

namespace sp::cli {

// Opens the existing store (no_input with a hint to run `scaleproof init` when missing).
std::unique_ptr<store::Store> open_store(const Context& ctx);
// Creates the store's folder (mkdir -p) and the store; used by `init` only.
std::unique_ptr<store::Store> create_store(const Context& ctx);
// --by NAME, else $SCALEPROOF_OPERATOR, else $USER; nullopt when none is set.
std::optional<std::string> who(const std::string& by_flag);
// stdin / stderr is a terminal.
bool stdin_is_terminal();
bool stderr_is_terminal();
// Shortest round-trip text of a weight (4700, 4702.5).
std::string num(double v);
std::string num(const std::optional<double>& v);  // "-" when absent

}  // namespace sp::cli
