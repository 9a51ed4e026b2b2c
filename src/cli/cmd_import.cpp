// `scaleproof import FILE...`: session files (JSON) and CSV of passes (columns: docs/csv.md).
// All files go in one transaction: one bad record rejects everything, nothing is written.
// A progress line on stderr for a CSV import that runs over 2 s (rows, rows/s, share read,
// ETA; cli/progress_line.h), only when stderr is a terminal and --quiet is not given.
// Exit: 0 imported; 65 a record is refused ("file:line: column: what was expected");
// 66 a file does not exist; 74 read error; 75 the store stayed busy.
#include <fmt/format.h>
#include <sys/stat.h>

#include <chrono>
#include <cstdlib>
#include <fstream>
#include <iostream>
#include <optional>
#include <sstream>

#include "cli/commands.h"
#include "cli/progress_line.h"
#include "cli/store_cli.h"
#include "core/error.h"
#include "format/session_json.h"
#include "store/importers.h"

namespace sp::cli {

namespace {

bool ends_with(const std::string& s, const std::string& suffix) {
  return s.size() >= suffix.size() &&
         s.compare(s.size() - suffix.size(), suffix.size(), suffix) == 0;
}

// The extension decides (.json is a session file, .csv passes); only an unnamed kind is sniffed,
// so a broken .json file gets the JSON parser's message, not a CSV-header complaint.
bool looks_like_json(const std::string& path, std::istream& in) {
  if (ends_with(path, ".json") || ends_with(path, ".JSON")) return true;
  if (ends_with(path, ".csv") || ends_with(path, ".CSV")) return false;
  int c = in.peek();
  while (c == ' ' || c == '\t' || c == '\n' || c == '\r') {
    in.get();
    c = in.peek();
  }
  return c == '{';
}

double seconds_now() {
  using namespace std::chrono;
  return duration<double>(steady_clock::now().time_since_epoch()).count();
}

// Seconds before the progress line appears (ProgressLine: 2 s). SCALEPROOF_PROGRESS_DELAY
// overrides it, so that tests can see the line on a short import.
double progress_delay() {
  const char* v = std::getenv("SCALEPROOF_PROGRESS_DELAY");
  if (v == nullptr || *v == '\0') return 2.0;
  char* end = nullptr;
  double d = std::strtod(v, &end);
  return end != nullptr && *end == '\0' && d >= 0 ? d : 2.0;
}

}  // namespace

void register_import(CLI::App& app, Context& ctx) {
  struct Opts {
    std::vector<std::string> files;
    std::string by;
  };
  auto o = std::make_shared<Opts>();
  auto* sub = app.add_subcommand("import",
                                 "Import session files (JSON) and CSV of passes; all "
                                 "or nothing");
  sub->footer(
      "Examples:\n  scaleproof import data-demo/sessions/01-pickup-travel-trailer.json\n  "
      "scaleproof import data-demo/passes/05-return-visit.csv");
  sub->add_option("FILE", o->files, "Session file (.json) or CSV of passes (.csv)")->required();
  sub->add_option("--by", o->by, "Who imports (default $SCALEPROOF_OPERATOR, $USER)");
  sub->callback([&ctx, o] {
    auto store = open_store(ctx);
    auto by = who(o->by);
    const bool show_progress = stderr_is_terminal() && !ctx.quiet;
    store::Txn txn(*store, store::Txn::write);
    store->begin_bulk();
    std::vector<std::string> done;
    for (const std::string& path : o->files) {
      struct stat st {};
      if (::stat(path.c_str(), &st) != 0) throw Error(ExitCode::no_input, path + ": no such file");
      if (S_ISDIR(st.st_mode)) throw Error(ExitCode::no_input, path + ": is a folder");
      std::ifstream in(path, std::ios::binary);
      if (!in) throw Error(ExitCode::io_error, path + ": cannot open for reading");
      if (looks_like_json(path, in)) {
        std::stringstream ss;
        ss << in.rdbuf();
        Session s = parse_session_json(ss.str(), path);
        long long id = store::import_session(*store, s, path, by);
        done.push_back(fmt::format("{}: session {} ({} passes)", path, id, s.passes.size()));
      } else {
        std::optional<ProgressLine> line;
        if (show_progress) {
          line.emplace(
              path, static_cast<std::uint64_t>(st.st_size), seconds_now,
              [](const std::string& text) { std::cerr << text << std::flush; }, progress_delay());
        }
        auto progress = [&line](long long rows, std::uint64_t bytes) {
          if (line) line->update(rows, bytes);
        };
        auto stats = store::import_pass_csv(*store, in, path, by, progress);
        if (line) line->finish();
        if (in.bad()) throw Error(ExitCode::io_error, path + ": read failed");
        done.push_back(fmt::format(
            "{}: {} passes ({} voided{}), {} sessions opened, {} added to", path, stats.passes,
            stats.voided,
            stats.corrected ? fmt::format(", {} corrected", stats.corrected) : std::string(),
            stats.sessions_opened, stats.sessions_joined));
      }
    }
    txn.commit();
    if (!ctx.quiet) {
      for (const auto& d : done) std::cout << "imported " << d << "\n";
    }
  });
}

}  // namespace sp::cli
