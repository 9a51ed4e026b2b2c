// What every subcommand shares: the global options and the exit code it sets.
// Subcommands register themselves on the CLI11 app (one file each, see commands.h);
// their callbacks run inside main's try block, so they simply throw sp::Error.
#pragma once
#include <CLI/CLI.hpp>
#include <string>

namespace sp::cli {

struct Context {
  // --db PATH (before or after the subcommand); empty: $SCALEPROOF_DB, then XDG data dir.
  std::string db_path;
  bool quiet = false;       // --quiet: only errors and requested data
  std::string units;        // --units us|metric; empty: the session's own units
  int exit_code = 0;        // set by the subcommand that ran
  // Colour only on a terminal and never when NO_COLOR is set (https://no-color.org).
  bool colour = false;
};

// Resolves the store path: --db, else $SCALEPROOF_DB, else $XDG_DATA_HOME/scaleproof/store.db
// (XDG_DATA_HOME defaults to ~/.local/share). Creates no file.
std::string resolve_db_path(const Context& ctx);

}  // namespace sp::cli
