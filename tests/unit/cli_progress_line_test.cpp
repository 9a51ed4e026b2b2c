// ProgressLine (cli/progress_line.h) with an injected clock and sink: silent for a short
// import, then one line at most every interval, with rows, rows/s, share read and ETA, and a
// clean erase at the end. The format is our own (no outside source: common practice for
// terminal progress output).
#include <doctest/doctest.h>

#include <string>
#include <vector>

#include "cli/progress_line.h"

using sp::cli::ProgressLine;

TEST_CASE("progress line: silent before the delay, then rate-limited, then erased") {
  double t = 100.0;
  std::vector<std::string> out;
  ProgressLine p(
      "passes.csv", 1000000, [&] { return t; }, [&](const std::string& s) { out.push_back(s); });
  t = 101.9;
  p.update(50000, 100000);
  CHECK(out.empty());  // under 2 s: nothing
  t = 102.0;
  p.update(60000, 250000);
  REQUIRE(out.size() == 1);
  // 60 000 rows in 2 s; a quarter read in 2 s, so 6 s to go.
  CHECK(out[0] == "\rpasses.csv: 60 000 rows, 30 000 rows/s, 25 % read, ETA 6 s\033[K");
  t = 102.4;
  p.update(70000, 300000);
  CHECK(out.size() == 1);  // within 0.5 s of the last line
  t = 102.5;
  p.update(75000, 500000);
  REQUIRE(out.size() == 2);
  CHECK(out[1] == "\rpasses.csv: 75 000 rows, 30 000 rows/s, 50 % read, ETA 3 s\033[K");
  p.finish();
  REQUIRE(out.size() == 3);
  CHECK(out[2] == "\r\033[K");
}

TEST_CASE("progress line: a short import draws and erases nothing") {
  double t = 0;
  std::vector<std::string> out;
  ProgressLine p(
      "x.csv", 10, [&] { return t; }, [&](const std::string& s) { out.push_back(s); });
  t = 1.0;
  p.update(10, 10);
  p.finish();
  CHECK(out.empty());
}

TEST_CASE("progress line: number and duration formats") {
  struct Row {
    double seconds;
    const char* text;
  };
  const Row rows[] = {
      {0, "0 s"}, {37.4, "37 s"}, {59.6, "1 min 0 s"}, {125, "2 min 5 s"}, {7300, "2 h 1 min"}};
  for (const Row& r : rows) {
    CAPTURE(r.seconds);
    CHECK(ProgressLine::duration(r.seconds) == r.text);
  }
  CHECK(ProgressLine::grouped(0) == "0");
  CHECK(ProgressLine::grouped(999) == "999");
  CHECK(ProgressLine::grouped(1000) == "1 000");
  CHECK(ProgressLine::grouped(1250152) == "1 250 152");
  // Without a known size: rows and rate only.
  ProgressLine p(
      "stdin", 0, [] { return 0.0; }, [](const std::string&) {});
  CHECK(p.line(5000, 100, 2.0) == "stdin: 5 000 rows, 2 500 rows/s");
}
