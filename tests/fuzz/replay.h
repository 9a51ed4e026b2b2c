// Replays fuzz inputs in a normal (gcc) unit test: every file of the seed corpus
// tests/fuzz/corpus/<target>/, the regressions tests/fuzz/regressions/<target>/ (each a crash
// a fuzzer once found) and any extra folder is fed to the target's one-input function, which
// throws on a broken contract (see fuzz_common.h). Header-only, for tests/unit/*_fuzz_*.cpp.
#pragma once
#include <doctest/doctest.h>

#include <algorithm>
#include <cstdint>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

namespace sp::fuzz {

// The regular files under each of `dirs` that exist, sorted, so failures are reproducible.
inline std::vector<std::filesystem::path> replay_files(const std::vector<std::string>& dirs) {
  std::vector<std::filesystem::path> out;
  for (const auto& d : dirs) {
    if (!std::filesystem::is_directory(d)) continue;
    for (const auto& e : std::filesystem::directory_iterator(d)) {
      if (e.is_regular_file()) out.push_back(e.path());
    }
  }
  std::sort(out.begin(), out.end());
  return out;
}

inline std::string read_bytes(const std::filesystem::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

// Runs `one(data, size)` on every file; returns how many ran. Each failure names its file.
template <class F>
std::size_t replay(const std::vector<std::string>& dirs, F one) {
  std::size_t n = 0;
  for (const auto& p : replay_files(dirs)) {
    std::string bytes = read_bytes(p);
    std::string file = p.string();
    CAPTURE(file);
    CHECK_NOTHROW(one(reinterpret_cast<const uint8_t*>(bytes.data()), bytes.size()));
    ++n;
  }
  return n;
}

}  // namespace sp::fuzz
