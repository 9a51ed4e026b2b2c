// How many decimals our outputs print, per quantity and unit. One place so the JSON and the
// text summary agree. The JSON keeps one decimal more than the text.
//   weights (lb, kg)        text 0, JSON 1    a scale division is 5 lb / 2 kg or more
//   lengths in/ft/mm/cm/m   text 1/2/0/1/3    about 1/10 of the 0.5 in tape uncertainty
//   moments (lbf·ft, N·m)   text 0, JSON 1
//   percents (FALR, tongue) text 1, JSON 2
// Rounding is half away from zero (std::round); -0 prints as 0.
#pragma once
#include <cmath>

#include "core/units.h"

namespace sp::format {

inline int weight_decimals(WeightUnit) { return 0; }
inline int length_decimals(LengthUnit u) {
  switch (u) {
    case LengthUnit::in: return 1;
    case LengthUnit::ft: return 2;
    case LengthUnit::mm: return 0;
    case LengthUnit::cm: return 1;
    case LengthUnit::m: return 3;
  }
  return 1;
}
inline constexpr int kMomentDecimals = 0;
inline constexpr int kPercentDecimals = 1;
inline constexpr int kJsonExtraDecimals = 1;

inline double round_to(double v, int decimals) {
  const double f = std::pow(10.0, decimals);
  const double r = std::round(v * f) / f;
  return r == 0 ? 0.0 : r;  // no "-0"
}

}  // namespace sp::format
