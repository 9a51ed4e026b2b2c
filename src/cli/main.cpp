// scaleproof: entry point. Parses the command line, runs one subcommand, and is the only
// place that catches exceptions: sp::Error -> its message and exit code; CLI11 parse errors
// -> usage (2); anything else -> internal (70).
#include <unistd.h>

#include <cstdio>
#include <cstdlib>
#include <iostream>

#include "cli/commands.h"
#include "cli/suggest.h"
#include "core/error.h"

namespace {

// A default worth showing is one the user could have typed. Hidden: a required option's (CLI11
// would print the zero it captured: "--session INT=0 REQUIRED"), an empty list ("=[]"), and a
// placeholder its own checks refuse ("--session N=0" where ids start at 1), each of which
// reads as if it were accepted.
bool shows_nothing_real(CLI::Option* o) {
  if (o->get_required()) return true;
  std::string d = o->get_default_str();
  if (d.empty() || d == "[]") return true;
  for (int i = 0;; ++i) {
    CLI::Validator* v = nullptr;
    try {
      v = o->get_validator(i);
    } catch (const CLI::OptionNotFound&) {
      return false;
    }
    if (v == nullptr) return false;
    std::string copy = d;
    if (!(*v)(copy).empty()) return true;
  }
}

void hide_required_defaults(CLI::App& app) {
  for (CLI::Option* o : app.get_options()) {
    if (shows_nothing_real(o)) o->default_str("");
  }
  for (CLI::App* sub : app.get_subcommands([](CLI::App*) { return true; })) {
    hide_required_defaults(*sub);
  }
}

int run(int argc, char** argv) {
  sp::cli::Context ctx;
  CLI::App app{
      "scaleproof: weigh-ticket reconciliation and signed weigh-reports for "
      "weight-distributing hitch setups"};
  app.set_version_flag("--version", std::string("scaleproof ") + SCALEPROOF_VERSION);
  app.option_defaults()->always_capture_default();
  app.fallthrough();  // global options are accepted after the subcommand too
  app.add_option("--db", ctx.db_path,
                 "Ticket store (SQLite); default $SCALEPROOF_DB, else "
                 "$XDG_DATA_HOME/scaleproof/store.db");
  app.add_flag("-q,--quiet", ctx.quiet, "Print only errors and the data asked for");
  app.add_option("--units", ctx.units, "Convert output: us (lb, in) or metric (kg, mm)")
      ->check(CLI::IsMember({"us", "metric"}));
  app.require_subcommand(1);
  ctx.colour = isatty(STDOUT_FILENO) != 0 && std::getenv("NO_COLOR") == nullptr;

  sp::cli::register_reconcile(app, ctx);
  sp::cli::register_key(app, ctx);
  sp::cli::register_report(app, ctx);
  sp::cli::register_verify(app, ctx);
  sp::cli::register_plan(app, ctx);
  sp::cli::register_demo(app, ctx);
  sp::cli::register_docs(app, ctx);  // hidden: man, completion
  sp::cli::register_init(app, ctx);
  sp::cli::register_scale(app, ctx);
  sp::cli::register_rig(app, ctx);
  sp::cli::register_session(app, ctx);
  sp::cli::register_pass(app, ctx);
  sp::cli::register_import(app, ctx);
  sp::cli::register_export(app, ctx);
  sp::cli::register_check_store(app, ctx);
  sp::cli::register_audit(app, ctx);
  sp::cli::register_serve(app, ctx);
  sp::cli::register_operator(app, ctx);
  hide_required_defaults(app);

  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    int code = app.exit(e);
    if (code == 0) return 0;  // --help, --version
    sp::cli::print_suggestion(app, argc, argv);
    return static_cast<int>(sp::ExitCode::usage);
  }
  return ctx.exit_code;
}

}  // namespace

int main(int argc, char** argv) {
  try {
    return run(argc, argv);
  } catch (const sp::Error& e) {
    std::cerr << "scaleproof: " << e.what() << "\n";
    return static_cast<int>(e.code());
  } catch (const std::exception& e) {
    std::cerr << "scaleproof: internal error: " << e.what() << "\n";
    return static_cast<int>(sp::ExitCode::internal);
  }
}
