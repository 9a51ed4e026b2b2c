// ProgressLine: the one-line progress report of a long import on stderr, e.g.
//   "passes.csv: 412 288 rows, 61 204 rows/s, 37 % read, ETA 11 s"
// redrawn in place ("\r" then the line, cleared to its end with "\033[K").
//
// Contract:
//  - The caller decides whether to show it at all (`scaleproof import` shows it only when
//    stderr is a terminal and --quiet is not given; otherwise it constructs none).
//  - update(rows, bytes) may be called as often as wanted; nothing is drawn before `delay`
//    seconds have passed since construction (a short import prints nothing: 2 s, common
//    practice for progress output), and then at most once every `interval` seconds.
//  - rows/s is rows / elapsed seconds; ETA is the bytes left at the bytes-per-second so far
//    (rows are not known in advance; the file size is). Without a total size no ETA is shown.
//  - finish() (and the destructor) clears a line that was drawn, and draws nothing when none
//    was.
//  - `now` returns seconds from any fixed origin; `sink` receives the text to write. Both are
//    injected so that tests run without a terminal or a real clock. Header-only and pure.
#pragma once
#include <algorithm>
#include <cstdint>
#include <functional>
#include <string>
#include <utility>

namespace sp::cli {

class ProgressLine {
 public:
  ProgressLine(std::string label, std::uint64_t total_bytes, std::function<double()> now,
               std::function<void(const std::string&)> sink, double delay = 2.0,
               double interval = 0.5)
      : label_(std::move(label)),
        total_(total_bytes),
        now_(std::move(now)),
        sink_(std::move(sink)),
        delay_(delay),
        interval_(interval),
        start_(now_()) {}

  // Erases a drawn line, also when an error unwinds the import (its message then starts on a
  // clean line).
  ~ProgressLine() { finish(); }
  ProgressLine(const ProgressLine&) = delete;
  ProgressLine& operator=(const ProgressLine&) = delete;

  void update(long long rows, std::uint64_t bytes) {
    const double t = now_();
    const double elapsed = t - start_;
    if (elapsed < delay_ || (drawn_ && t - last_ < interval_) || elapsed <= 0) return;
    last_ = t;
    drawn_ = true;
    sink_("\r" + line(rows, bytes, elapsed) + "\033[K");
  }

  void finish() {
    if (drawn_) sink_("\r\033[K");
    drawn_ = false;
  }

  // The text of the line (no control characters), for the given state.
  std::string line(long long rows, std::uint64_t bytes, double elapsed) const {
    std::string s = label_ + ": " + grouped(rows) + " rows, " +
                    grouped(static_cast<long long>(static_cast<double>(rows) / elapsed + 0.5)) +
                    " rows/s";
    if (total_ > 0 && bytes > 0) {
      const double frac = std::min(1.0, static_cast<double>(bytes) / static_cast<double>(total_));
      s += ", " + std::to_string(static_cast<int>(frac * 100)) + " % read";
      const double left = elapsed * (1.0 - frac) / frac;
      s += ", ETA " + duration(left);
    }
    return s;
  }

  // 412288 -> "412 288" (thin groups of three, as elsewhere in our output).
  static std::string grouped(long long v) {
    std::string digits = std::to_string(v < 0 ? -v : v);
    std::string out;
    for (size_t i = 0; i < digits.size(); ++i) {
      if (i > 0 && (digits.size() - i) % 3 == 0) out.push_back(' ');
      out.push_back(digits[i]);
    }
    return v < 0 ? "-" + out : out;
  }

  // 37 -> "37 s", 125 -> "2 min 5 s", 7300 -> "2 h 1 min".
  static std::string duration(double seconds) {
    auto s = static_cast<long long>(seconds + 0.5);
    if (s < 60) return std::to_string(s) + " s";
    if (s < 3600) return std::to_string(s / 60) + " min " + std::to_string(s % 60) + " s";
    return std::to_string(s / 3600) + " h " + std::to_string((s % 3600) / 60) + " min";
  }

 private:
  std::string label_;
  std::uint64_t total_;
  std::function<double()> now_;
  std::function<void(const std::string&)> sink_;
  double delay_, interval_;
  double start_;
  double last_ = 0;
  bool drawn_ = false;
};

}  // namespace sp::cli
