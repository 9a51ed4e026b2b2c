// Unit factors against NIST SP 811 (2008), Appendix B.8 (exact definitions and the
// derived lbf·ft -> N·m factor 1.355 817 948 given there).
#include <doctest/doctest.h>

#include "core/units.h"

using namespace sp;

TEST_CASE("unit factors match NIST SP 811 Appendix B.8") {
  struct Row { const char* what; double got; double want; };
  const Row rows[] = {
      {"lb -> kg", weight_factor(WeightUnit::lb, WeightUnit::kg), 0.45359237},
      {"kg -> lb", weight_factor(WeightUnit::kg, WeightUnit::lb), 1 / 0.45359237},
      {"in -> m", length_factor(LengthUnit::in, LengthUnit::m), 0.0254},
      {"ft -> m", length_factor(LengthUnit::ft, LengthUnit::m), 0.3048},
      {"ft -> in", length_factor(LengthUnit::ft, LengthUnit::in), 12.0},
      {"mm -> in", length_factor(LengthUnit::mm, LengthUnit::in), 1 / 25.4},
      {"cm -> mm", length_factor(LengthUnit::cm, LengthUnit::mm), 10.0},
      // 1 lbf·ft = 1.355 817 948 N·m (SP 811 B.8): a kgf·m is g_n N·m; lbf·ft via lb·in/12.
      {"lb·in -> lbf·ft", moment_factor(WeightUnit::lb, LengthUnit::in), 1 / 12.0},
      {"kgf·m -> N·m", moment_factor(WeightUnit::kg, LengthUnit::m), 9.80665},
      {"kgf·mm -> N·m", moment_factor(WeightUnit::kg, LengthUnit::mm), 0.00980665},
      {"lbf·ft in N·m", 0.45359237 * 9.80665 * 0.3048, 1.355817948},
  };
  for (const Row& r : rows) {
    CAPTURE(r.what);
    CHECK(r.got == doctest::Approx(r.want).epsilon(1e-9));
  }
}

TEST_CASE("unit names parse and print back") {
  for (const char* s : {"lb", "kg"}) CHECK(to_string(*parse_weight_unit(s)) == s);
  for (const char* s : {"in", "ft", "mm", "cm", "m"}) CHECK(to_string(*parse_length_unit(s)) == s);
  CHECK_FALSE(parse_weight_unit("lbs").has_value());
  CHECK_FALSE(parse_length_unit("inch").has_value());
}
