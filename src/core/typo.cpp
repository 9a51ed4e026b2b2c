#include "core/typo.h"

#include <algorithm>

namespace sp {

std::size_t typo_distance(const std::string& a, const std::string& b) {
  // Three rows of the dynamic-programming table: the transposition looks two rows back.
  std::vector<std::size_t> before(b.size() + 1), prev(b.size() + 1), cur(b.size() + 1);
  for (std::size_t j = 0; j <= b.size(); ++j) prev[j] = j;
  for (std::size_t i = 1; i <= a.size(); ++i) {
    cur[0] = i;
    for (std::size_t j = 1; j <= b.size(); ++j) {
      const std::size_t cost = a[i - 1] == b[j - 1] ? 0 : 1;
      cur[j] = std::min({prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + cost});
      if (i > 1 && j > 1 && a[i - 1] == b[j - 2] && a[i - 2] == b[j - 1]) {
        cur[j] = std::min(cur[j], before[j - 2] + 1);
      }
    }
    std::swap(before, prev);
    std::swap(prev, cur);
  }
  return prev[b.size()];
}

std::string likely_typo(const std::string& word, const std::vector<std::string>& candidates) {
  std::string best;
  std::size_t best_d = std::string::npos;
  for (const auto& c : candidates) {
    const std::size_t d = typo_distance(word, c);
    if (d < best_d) {
      best_d = d;
      best = c;
    }
  }
  const std::size_t allowed = std::clamp<std::size_t>(word.size() / 3, 1, 3);
  return best_d <= allowed ? best : std::string();
}

}  // namespace sp
