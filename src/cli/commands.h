// One registration function per subcommand; each lives in its own cmd_*.cpp.
#pragma once
#include "cli/context.h"

namespace sp::cli {

void register_reconcile(CLI::App& app, Context& ctx);

}  // namespace sp::cli
