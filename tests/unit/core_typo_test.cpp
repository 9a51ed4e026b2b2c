// The "did you mean ...?" rule shared by the session-file reader and the CLI.
#include <doctest/doctest.h>

#include "core/typo.h"

// The typo rule shared by the session reader and the CLI ("did you mean ...?").
TEST_CASE("typo_distance and likely_typo") {
  struct Row {
    const char* a;
    const char* b;
    std::size_t d;
  };
  // kitten -> sitting = 3: the standard worked example of Levenshtein distance (Levenshtein
  // 1966 as retold in every text on edit distance; from memory). ca -> abc = 3 under optimal
  // string alignment but 2 under unrestricted Damerau-Levenshtein: the usual example telling
  // the two apart (from memory). The rest are worked by hand from the definition.
  const Row rows[] = {{"", "", 0},          {"kitten", "sitting", 3}, {"gvrw", "gvwr", 1},
                      {"wheelbse", "wheelbase", 1}, {"ca", "abc", 3},      {"abc", "", 3}};
  for (const auto& r : rows) {
    CAPTURE(r.a);
    CAPTURE(r.b);
    CHECK(sp::typo_distance(r.a, r.b) == r.d);
    CHECK(sp::typo_distance(r.b, r.a) == r.d);
  }
  const std::vector<std::string> keys = {"gvwr", "wheelbase", "front_gawr", "reconcile"};
  CHECK(sp::likely_typo("gvrw", keys) == "gvwr");
  CHECK(sp::likely_typo("wheelbse", keys) == "wheelbase");
  CHECK(sp::likely_typo("reconcil", keys) == "reconcile");
  CHECK(sp::likely_typo("colour", keys).empty());
  CHECK(sp::likely_typo("x", {}).empty());
}
