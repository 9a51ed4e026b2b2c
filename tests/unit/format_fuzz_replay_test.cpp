// Replays the session-file fuzz target's seed corpus, its regressions and the bad-input corpus
// under the normal build (and the sanitizer build of scripts/test --sanitize): no crash, bad
// input only as sp::Error(65) naming the file, lossless round trip of what parses.
#define SP_FUZZ_NO_MAIN
#include "fuzz/fuzz_session_json.cpp"
#include "fuzz/replay.h"

namespace {
const std::string kTests = SCALEPROOF_SOURCE_DIR "/tests";
}

TEST_CASE("fuzz replay: session_json corpus, regressions and bad-input files") {
  std::size_t n = sp::fuzz::replay(
      {kTests + "/fuzz/corpus/session_json", kTests + "/fuzz/regressions/session_json"},
      sp::fuzz::session_json_one);
  CHECK(n >= 10);  // the seed corpus is there (a wrong path would replay nothing)
  std::size_t bad = 0;
  for (const auto& p : sp::fuzz::replay_files({kTests + "/bad-input"})) {
    if (p.extension() != ".json") continue;
    std::string bytes = sp::fuzz::read_bytes(p);
    std::string file = p.string();
    CAPTURE(file);
    // Each bad-input file must be refused as data (65), never accepted or crash.
    bool refused = false;
    try {
      sp::parse_session_json(bytes, p.filename().string());
    } catch (const sp::Error& e) {
      refused = e.code() == sp::ExitCode::data_error;
    }
    CHECK(refused);
    ++bad;
  }
  CHECK(bad >= 30);
}
