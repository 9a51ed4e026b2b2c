#include "cli/context.h"

#include <cstdlib>

#include "core/error.h"

namespace sp::cli {

std::string resolve_db_path(const Context& ctx) {
  if (!ctx.db_path.empty()) return ctx.db_path;
  if (const char* env = std::getenv("SCALEPROOF_DB"); env != nullptr && *env != '\0') return env;
  // XDG Base Directory Specification: $XDG_DATA_HOME, default $HOME/.local/share.
  std::string base;
  if (const char* x = std::getenv("XDG_DATA_HOME"); x != nullptr && *x == '/') {
    base = x;
  } else if (const char* home = std::getenv("HOME"); home != nullptr && *home != '\0') {
    base = std::string(home) + "/.local/share";
  } else {
    throw usage_error("no store given: pass --db PATH or set SCALEPROOF_DB (HOME is not set)");
  }
  return base + "/scaleproof/store.db";
}

}  // namespace sp::cli
