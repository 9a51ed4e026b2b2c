#include "cli/suggest.h"

#include <algorithm>
#include <iostream>

namespace sp::cli {

std::size_t edit_distance(const std::string& a, const std::string& b) {
  std::vector<std::size_t> prev(b.size() + 1), cur(b.size() + 1);
  for (std::size_t j = 0; j <= b.size(); ++j) prev[j] = j;
  for (std::size_t i = 1; i <= a.size(); ++i) {
    cur[0] = i;
    for (std::size_t j = 1; j <= b.size(); ++j) {
      std::size_t sub = prev[j - 1] + (a[i - 1] == b[j - 1] ? 0 : 1);
      cur[j] = std::min({prev[j] + 1, cur[j - 1] + 1, sub});
    }
    std::swap(prev, cur);
  }
  return prev[b.size()];
}

std::string nearest(const std::string& word, const std::vector<std::string>& candidates) {
  std::string best;
  std::size_t best_d = std::string::npos;
  for (const auto& c : candidates) {
    std::size_t d = edit_distance(word, c);
    if (d < best_d) {
      best_d = d;
      best = c;
    }
  }
  // A typo is at most a third of the word (at least 1, at most 3 edits): beyond that the
  // suggestion is more likely to mislead than help.
  std::size_t allowed = std::clamp<std::size_t>(word.size() / 3, 1, 3);
  return best_d <= allowed ? best : std::string();
}

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
        std::string n = nearest(name, names);
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
    std::string n = nearest(arg, subs);
    if (!n.empty()) std::cerr << "did you mean '" << n << "'?\n";
    return;
  }
}

}  // namespace sp::cli
