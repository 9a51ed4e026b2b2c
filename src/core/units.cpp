#include "core/units.h"

namespace sp {

std::string_view to_string(WeightUnit u) { return u == WeightUnit::lb ? "lb" : "kg"; }

std::string_view to_string(LengthUnit u) {
  switch (u) {
    case LengthUnit::in: return "in";
    case LengthUnit::ft: return "ft";
    case LengthUnit::mm: return "mm";
    case LengthUnit::cm: return "cm";
    case LengthUnit::m: return "m";
  }
  return "in";
}

std::optional<WeightUnit> parse_weight_unit(std::string_view s) {
  if (s == "lb") return WeightUnit::lb;
  if (s == "kg") return WeightUnit::kg;
  return std::nullopt;
}

std::optional<LengthUnit> parse_length_unit(std::string_view s) {
  if (s == "in") return LengthUnit::in;
  if (s == "ft") return LengthUnit::ft;
  if (s == "mm") return LengthUnit::mm;
  if (s == "cm") return LengthUnit::cm;
  if (s == "m") return LengthUnit::m;
  return std::nullopt;
}

double weight_factor(WeightUnit from, WeightUnit to) {
  if (from == to) return 1.0;
  return from == WeightUnit::lb ? kKgPerLb : 1.0 / kKgPerLb;
}

namespace {
double metres_per(LengthUnit u) {
  switch (u) {
    case LengthUnit::in: return kMetresPerInch;
    case LengthUnit::ft: return kMetresPerFoot;
    case LengthUnit::mm: return 0.001;
    case LengthUnit::cm: return 0.01;
    case LengthUnit::m: return 1.0;
  }
  return 1.0;
}
}  // namespace

double length_factor(LengthUnit from, LengthUnit to) { return metres_per(from) / metres_per(to); }
double length_to_metres(double v, LengthUnit u) { return v * metres_per(u); }
double metres_to_length(double metres, LengthUnit u) { return metres / metres_per(u); }

std::string_view moment_unit_name(WeightUnit w) { return w == WeightUnit::lb ? "lbf·ft" : "N·m"; }

double moment_factor(WeightUnit wu, LengthUnit lu) {
  if (wu == WeightUnit::lb) return length_factor(lu, LengthUnit::ft);  // lb·lu -> lbf·ft
  return kStandardGravity * metres_per(lu);                            // kgf·lu -> N·m
}

}  // namespace sp
