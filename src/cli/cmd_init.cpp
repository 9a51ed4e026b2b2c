// `scaleproof init`: create the ticket store (or bring an older one up to date).
// Exit: 0 ready; 73 the folder or file cannot be created; 65 the file is not a store.
#include <iostream>

#include "cli/commands.h"
#include "cli/store_cli.h"

namespace sp::cli {

void register_init(CLI::App& app, Context& ctx) {
  auto* sub = app.add_subcommand("init", "Create the ticket store (--db PATH, $SCALEPROOF_DB or "
                                         "the XDG data folder)");
  sub->footer("Example:\n  scaleproof --db station.db init");
  sub->callback([&ctx] {
    auto store = create_store(ctx);
    if (!ctx.quiet) {
      std::cout << "store ready: " << resolve_db_path(ctx) << " (schema version "
                << store->schema_version() << ", " << store->row_count() << " rows)\n";
    }
  });
}

}  // namespace sp::cli
