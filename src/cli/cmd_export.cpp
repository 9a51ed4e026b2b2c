// `scaleproof export --session N [--format json|csv] [-o FILE]`: write a session as a file
// that `reconcile` and `import` accept (JSON: scaleproof-session/1; CSV: docs/csv.md).
// Voided passes are written with their reason, and a corrected pass as its first row then one
// row per correction (CSV only; JSON carries the corrected values), so an import restores both.
// Exit: 0 written; 66 no such session; 73 the output exists (no overwrite) or cannot be made.
#include <fcntl.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>
#include <iostream>

#include <fmt/format.h>

#include "cli/commands.h"
#include "cli/store_cli.h"
#include "core/error.h"
#include "store/importers.h"
#include "format/session_json.h"

namespace sp::cli {

void register_export(CLI::App& app, Context& ctx) {
  struct Opts {
    long long session = 0;
    std::string format = "json", out;
  };
  auto o = std::make_shared<Opts>();
  auto* sub = app.add_subcommand("export", "Write a session as a session file (JSON) or CSV");
  sub->footer("Examples:\n  scaleproof export --session 1 -o session-1.json\n  scaleproof export --session 1 --format csv");
  sub->add_option("--session", o->session, "Session id")->required();
  sub->add_option("--format", o->format, "json or csv")->check(CLI::IsMember({"json", "csv"}));
  sub->add_option("-o,--output", o->out, "Write to FILE (must not exist) instead of stdout");
  sub->callback([&ctx, o] {
    auto store = open_store(ctx);
    store::Txn txn(*store, store::Txn::read);
    std::string text;
    if (o->format == "json") {
      text = write_session_json(store->load_session(o->session));
    } else {
      text = store::export_pass_csv(store->session_history(o->session));
    }
    txn.commit();
    if (o->out.empty()) {
      std::cout << text;
      return;
    }
    int fd = ::open(o->out.c_str(), O_WRONLY | O_CREAT | O_EXCL, 0644);
    if (fd < 0) {
      throw Error(ExitCode::cant_create, fmt::format("{}: cannot create ({}); exports never "
                                                     "overwrite", o->out, std::strerror(errno)));
    }
    size_t off = 0;
    while (off < text.size()) {
      ssize_t n = ::write(fd, text.data() + off, text.size() - off);
      if (n <= 0) {
        ::close(fd);
        ::unlink(o->out.c_str());
        throw Error(ExitCode::io_error, o->out + ": write failed");
      }
      off += static_cast<size_t>(n);
    }
    if (::close(fd) != 0) throw Error(ExitCode::io_error, o->out + ": write failed");
    if (!ctx.quiet) std::cerr << "session " << o->session << " written to " << o->out << "\n";
  });
}

}  // namespace sp::cli
