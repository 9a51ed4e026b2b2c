#include "cli/store_cli.h"

#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstdlib>
#include <cstring>
#include <fmt/format.h>

#include "core/error.h"

namespace sp::cli {

std::unique_ptr<store::Store> open_store(const Context& ctx) {
  std::string path = resolve_db_path(ctx);
  struct stat st {};
  if (path != ":memory:" && ::stat(path.c_str(), &st) != 0) {
    throw Error(ExitCode::no_input,
                path + ": no store here; run `scaleproof init` (or pass --db PATH)");
  }
  return store::open_sqlite_store(path, store::Options{});
}

std::unique_ptr<store::Store> create_store(const Context& ctx) {
  std::string path = resolve_db_path(ctx);
  auto slash = path.rfind('/');
  if (slash != std::string::npos && slash > 0) {
    std::string dir = path.substr(0, slash);
    for (size_t p = 1; p <= dir.size(); ++p) {
      if (p == dir.size() || dir[p] == '/') {
        std::string part = dir.substr(0, p);
        if (::mkdir(part.c_str(), 0700) != 0 && errno != EEXIST) {
          throw Error(ExitCode::cant_create,
                      fmt::format("{}: cannot create folder: {}", part, std::strerror(errno)));
        }
      }
    }
  }
  store::Options o;
  o.create = true;
  return store::open_sqlite_store(path, o);
}

std::optional<std::string> who(const std::string& by_flag) {
  if (!by_flag.empty()) return by_flag;
  for (const char* var : {"SCALEPROOF_OPERATOR", "USER"}) {
    if (const char* v = std::getenv(var); v != nullptr && *v != '\0') return std::string(v);
  }
  return std::nullopt;
}

bool stdin_is_terminal() { return isatty(STDIN_FILENO) != 0; }
bool stderr_is_terminal() { return isatty(STDERR_FILENO) != 0; }

std::string num(double v) { return fmt::format("{}", v); }
std::string num(const std::optional<double>& v) { return v ? num(*v) : "-"; }

}  // namespace sp::cli
