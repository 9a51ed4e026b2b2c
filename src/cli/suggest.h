// "Did you mean ...?" for unknown subcommands and options.
#pragma once
#include <CLI/CLI.hpp>
#include <string>
#include <vector>

namespace sp::cli {

// After a parse error: looks at argv for an unknown subcommand or option and prints
// "did you mean ...?" to stderr when there is a near match.
void print_suggestion(const CLI::App& app, int argc, char** argv);

}  // namespace sp::cli
