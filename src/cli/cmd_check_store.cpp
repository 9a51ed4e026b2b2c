// `scaleproof check-store [--expect-head HASH]`: walk the hash chain over every stored row.
// Exit: 0 every row matches (prints the row count and the head hash); 1 a row does not match
// (names the first bad row by table, id and ticket) or the head differs from --expect-head.
#include <iostream>

#include "cli/commands.h"
#include "cli/store_cli.h"
#include "core/error.h"

namespace sp::cli {

void register_check_store(CLI::App& app, Context& ctx) {
  auto* sub = app.add_subcommand(
      "check-store", "Verify the store's hash chain: every row's content and link, in order");
  sub->footer("Example:\n  scaleproof check-store");
  auto expect = std::make_shared<std::string>();
  sub->add_option("--expect-head", *expect,
                  "Head hash recorded earlier (e.g. printed on a report); a store cut short "
                  "after it, or rebuilt, is reported");
  sub->callback([&ctx, expect] {
    auto store = open_store(ctx);
    store::Txn txn(*store, store::Txn::read);
    bool tty = stderr_is_terminal() && !ctx.quiet;
    auto c = store->check_chain([tty](long long n) {
      if (tty) std::cerr << "\rchecking: " << n << " rows" << std::flush;
    });
    if (tty) std::cerr << "\r\033[K";
    txn.commit();
    if (!c.ok) {
      std::cout << "check-store: FAILED at " << c.table << " id " << c.id;
      if (c.ticket) std::cout << " (ticket " << *c.ticket << ")";
      std::cout << ", chain position " << c.seq << ": " << c.problem << "\n"
                << "check-store: " << c.rows << " rows before it verified\n";
      ctx.exit_code = static_cast<int>(ExitCode::check_failed);
      return;
    }
    if (!expect->empty() && *expect != c.head) {
      std::cout << "check-store: FAILED: head hash " << (c.head.empty() ? "(empty store)" : c.head)
                << " is not the expected " << *expect
                << " (rows were removed from the end, or the chain was rebuilt)\n";
      ctx.exit_code = static_cast<int>(ExitCode::check_failed);
      return;
    }
    std::cout << "check-store: ok, " << c.rows << " rows, head "
              << (c.head.empty() ? "(empty store)" : c.head) << "\n";
  });
}

}  // namespace sp::cli
