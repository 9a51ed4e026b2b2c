// `scaleproof reconcile FILE... [--json]`: solve session files ("-" reads stdin).
// Exit: 0 all solved (flags or not); 65 an input is invalid; 66 a file does not exist;
// 74 a file cannot be read; 2 usage. With several files the worst code wins.
#include <fstream>
#include <iostream>
#include <iterator>
#include <sstream>
#include <sys/stat.h>

#include "cli/commands.h"
#include "cli/reconcile_output.h"
#include "cli/reconcile_store.h"
#include "core/error.h"
#include "format/session_json.h"

namespace sp::cli {

namespace {

// Session files are a few kilobytes; 16 MiB guards against reading a wrong, huge file.
constexpr std::size_t kMaxSessionBytes = 16u << 20;

std::string read_input(const std::string& path) {
  std::string text;
  if (path == "-") {
    text.assign(std::istreambuf_iterator<char>(std::cin), std::istreambuf_iterator<char>());
    if (std::cin.bad()) throw Error(ExitCode::io_error, "<stdin>: cannot read standard input");
  } else {
    struct stat st {};
    if (::stat(path.c_str(), &st) != 0) {
      throw Error(ExitCode::no_input, path + ": no such file");
    }
    if (S_ISDIR(st.st_mode)) {
      throw Error(ExitCode::no_input, path + ": is a folder; expected a session file (.json)");
    }
    std::ifstream f(path, std::ios::binary);
    if (!f) throw Error(ExitCode::io_error, path + ": cannot open for reading");
    std::ostringstream ss;
    ss << f.rdbuf();
    if (f.bad()) throw Error(ExitCode::io_error, path + ": read failed");
    text = ss.str();
  }
  if (text.size() > kMaxSessionBytes) {
    throw data_error((path == "-" ? std::string("<stdin>") : path) +
                     ": larger than 16 MiB; expected a session file");
  }
  return text;
}

}  // namespace

void register_reconcile(CLI::App& app, Context& ctx) {
  auto* sub = app.add_subcommand(
      "reconcile", "Solve session files: tongue load, bar moments, fit test, ratings, advice");
  sub->footer("Examples:\n  scaleproof reconcile data-demo/sessions/01-pickup-travel-trailer.json\n  scaleproof reconcile --session 1 --json");
  struct Opts {
    std::vector<std::string> files;
    bool json = false;
  };
  auto opts = std::make_shared<Opts>();
  sub->add_option("FILE", opts->files, "Session file(s) (scaleproof-session/1 JSON); - for stdin");
  // Sessions from the ticket store (issue #3; cli/reconcile_store.h).
  auto store_sessions = std::make_shared<std::vector<long long>>();
  auto store_all = std::make_shared<bool>(false);
  auto jobs = std::make_shared<unsigned>(0);
  sub->add_option("--session", *store_sessions, "Session id(s) in the store (same output as a file)");
  sub->add_flag("--all", *store_all, "Every session in the store, one line (or JSON object) each");
  CLI::Option* jobs_opt =
      sub->add_option("--jobs", *jobs, "With --all: worker threads (0: one per core; 1: none)")
          ->capture_default_str();
  sub->add_flag("--json", opts->json, "Print the results as JSON instead of the summary");
  sub->callback([opts, &ctx, store_sessions, store_all, jobs, jobs_opt] {
    if (jobs_opt->count() > 0 && !*store_all) {
      throw usage_error("reconcile: --jobs applies to --all only (one session or file needs no threads)");
    }
    if (!store_sessions->empty() || *store_all) {
      if (!opts->files.empty() || (*store_all && !store_sessions->empty())) {
        throw usage_error("reconcile: give FILE..., --session N or --all, only one of them");
      }
      ctx.exit_code = reconcile_from_store(ctx, *store_sessions, *store_all, opts->json, *jobs,
                                           std::cout, std::cerr);
      return;
    }
    if (opts->files.empty()) {
      throw usage_error("reconcile: expected FILE..., --session N or --all");
    }
    if (std::count(opts->files.begin(), opts->files.end(), "-") > 1) {
      throw usage_error("reconcile: standard input (-) can be given only once");
    }
    std::vector<SessionInput> inputs;
    for (const std::string& f : opts->files) {
      const std::string source = f == "-" ? "<stdin>" : f;
      inputs.push_back({f, [f, source] { return parse_session_json(read_input(f), source); }});
    }
    ctx.exit_code =
        print_reconciled(inputs, ReconcileOutputOptions{opts->json, ctx.colour, ctx.units}, std::cout, std::cerr);
  });
}

}  // namespace sp::cli
