// Replays the report-verifier fuzz target's seed corpus and its regressions under the normal
// and the sanitizer build: verify_report_bytes never throws or crashes on any of them.
#define SP_FUZZ_NO_MAIN
#include "fuzz/fuzz_verify_report.cpp"
#include "fuzz/replay.h"

TEST_CASE("fuzz replay: verify_report corpus and regressions") {
  const std::string tests = SCALEPROOF_SOURCE_DIR "/tests";
  std::size_t n = sp::fuzz::replay(
      {tests + "/fuzz/corpus/verify_report", tests + "/fuzz/regressions/verify_report"},
      sp::fuzz::verify_report_one);
  CHECK(n >= 3);  // the seed corpus is there (a wrong path would replay nothing)
}
