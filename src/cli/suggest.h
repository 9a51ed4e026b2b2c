// "Did you mean ...?" for unknown subcommands and options.
#pragma once
#include <CLI/CLI.hpp>
#include <string>
#include <vector>

namespace sp::cli {

// Levenshtein distance, for suggestions only.
std::size_t edit_distance(const std::string& a, const std::string& b);
// The candidate nearest to `word` when it is close enough to be a likely typo, else "".
std::string nearest(const std::string& word, const std::vector<std::string>& candidates);
// After a parse error: looks at argv for an unknown subcommand or option and prints
// "did you mean ...?" to stderr when there is a near match.
void print_suggestion(const CLI::App& app, int argc, char** argv);

}  // namespace sp::cli
