// Replays the CSV fuzz target's seed corpus, its regressions and the bad-input CSV files
// under the normal and the sanitizer build: no crash, bad input only as sp::Error(65) naming
// the file, lossless round trip of every row that parses.
#define SP_FUZZ_NO_MAIN
#include "fuzz/fuzz_pass_csv.cpp"
#include "fuzz/replay.h"

TEST_CASE("fuzz replay: pass_csv corpus, regressions and bad-input CSV files") {
  const std::string tests = SCALEPROOF_SOURCE_DIR "/tests";
  std::size_t n = sp::fuzz::replay(
      {tests + "/fuzz/corpus/pass_csv", tests + "/fuzz/regressions/pass_csv"},
      sp::fuzz::pass_csv_one);
  CHECK(n >= 5);  // the seed corpus is there (a wrong path would replay nothing)
  std::size_t csv = 0;
  for (const auto& p : sp::fuzz::replay_files({tests + "/bad-input"})) {
    if (p.extension() != ".csv") continue;
    std::string bytes = sp::fuzz::read_bytes(p);
    std::string file = p.string();
    CAPTURE(file);
    CHECK_NOTHROW(sp::fuzz::pass_csv_one(reinterpret_cast<const uint8_t*>(bytes.data()),
                                         bytes.size()));
    ++csv;
  }
  MESSAGE("replayed " << n << " corpus files and " << csv << " bad-input CSV files");
}
