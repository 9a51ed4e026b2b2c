#include "cli/suggest.h"

#include <algorithm>
#include <iostream>

#include "core/typo.h"

namespace sp::cli {

namespace {

const CLI::App* find_sub(const CLI::App& app, const std::string& name) {
  for (const CLI::App* s : app.get_subcommands([](const CLI::App*) { return true; }))
    if (s->get_name() == name) return s;
  return nullptr;
}

std::vector<std::string> option_names(const CLI::App& app) {
  std::vector<std::string> names;
  for (const CLI::Option* o : app.get_options())
    for (const auto& l : o->get_lnames()) names.push_back("--" + l);
  if (app.get_parent() != nullptr)
    for (const CLI::Option* o : app.get_parent()->get_options())
      for (const auto& l : o->get_lnames()) names.push_back("--" + l);
  return names;
}

}  // namespace

void print_suggestion(const CLI::App& app, int argc, char** argv) {
  const CLI::App* level = &app;
  for (int i = 1; i < argc; ++i) {
    std::string arg = argv[i];
    if (arg.rfind("--", 0) == 0) {
      std::string name = arg.substr(0, arg.find('='));
      auto names = option_names(*level);
      if (std::find(names.begin(), names.end(), name) == names.end()) {
        std::string n = likely_typo(name, names);
        if (!n.empty()) std::cerr << "did you mean " << n << "?\n";
        return;
      }
      continue;
    }
    if (arg.rfind('-', 0) == 0) continue;
    if (const CLI::App* sub = find_sub(*level, arg)) {
      level = sub;
      continue;
    }
    std::vector<std::string> subs;
    for (const CLI::App* s : level->get_subcommands([](const CLI::App*) { return true; }))
      subs.push_back(s->get_name());
    if (subs.empty()) return;  // a positional argument, not a command
    std::string n = likely_typo(arg, subs);
    if (!n.empty()) std::cerr << "did you mean '" << n << "'?\n";
    return;
  }
}

}  // namespace sp::cli
