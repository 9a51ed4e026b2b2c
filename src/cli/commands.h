// One registration function per subcommand; each lives in its own cmd_*.cpp.
#pragma once
#include "cli/context.h"

namespace sp::cli {

void register_reconcile(CLI::App& app, Context& ctx);
void register_key(CLI::App& app, Context& ctx);     // key new
void register_report(CLI::App& app, Context& ctx);  // signed PDF weigh-report
void register_verify(CLI::App& app, Context& ctx);  // verify a weigh-report
void register_plan(CLI::App& app, Context& ctx);
void register_demo(CLI::App& app, Context& ctx);
void register_docs(CLI::App& app, Context& ctx);  // hidden: man, completion
// Ticket store (issue #3): cmd_init.cpp ... cmd_check_store.cpp
void register_init(CLI::App& app, Context& ctx);
void register_scale(CLI::App& app, Context& ctx);
void register_rig(CLI::App& app, Context& ctx);
void register_session(CLI::App& app, Context& ctx);
void register_pass(CLI::App& app, Context& ctx);
void register_pass_correct(CLI::App* pass, Context& ctx);  // `pass correct`, under `pass`
void register_import(CLI::App& app, Context& ctx);
void register_export(CLI::App& app, Context& ctx);
void register_check_store(CLI::App& app, Context& ctx);
void register_audit(CLI::App& app, Context& ctx);  // claim-file audit (issue #5)
// Station console in the browser (issue #13): cmd_serve.cpp, cmd_operator.cpp
void register_serve(CLI::App& app, Context& ctx);
void register_operator(CLI::App& app, Context& ctx);

}  // namespace sp::cli
