// "Did you mean ...?": the one rule for suggesting a known name for a mistyped one, used by
// the session-file reader (unknown keys) and the CLI (unknown commands and options).
#pragma once
#include <cstddef>
#include <string>
#include <vector>

namespace sp {

// Optimal-string-alignment distance over bytes: Levenshtein (insert, delete, substitute)
// plus the swap of two adjacent characters ("gvrw" -> "gvwr" is one edit), the commonest
// typing slip. Not a metric (no triangle inequality), which suggestions do not need.
std::size_t typo_distance(const std::string& a, const std::string& b);

// The candidate nearest to `word` when it is close enough to be a likely typo, else "".
// Close enough: at most a third of the word's characters edited, at least 1 and at most 3
// edits; beyond that a suggestion misleads more often than it helps (common practice).
// Ties go to the first candidate in order.
std::string likely_typo(const std::string& word, const std::vector<std::string>& candidates);

}  // namespace sp
