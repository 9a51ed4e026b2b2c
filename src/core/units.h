// Units of measure. Factors are exact definitions from NIST SP 811 (2008), Appendix B.8:
//   1 lb = 0.45359237 kg, 1 in = 0.0254 m, 1 ft = 0.3048 m, g_n = 9.80665 m/s^2.
// Weights are what a vehicle scale shows: lb or kg (force in lbf or kgf, numerically equal).
// Moments are reported in lbf·ft for lb sessions and N·m for kg sessions.
#pragma once
#include <optional>
#include <string>
#include <string_view>

namespace sp {

enum class WeightUnit { lb, kg };
enum class LengthUnit { in, ft, mm, cm, m };

struct Units {
  WeightUnit weight = WeightUnit::lb;
  LengthUnit length = LengthUnit::in;
};

inline constexpr double kKgPerLb = 0.45359237;          // NIST SP 811 B.8, exact
inline constexpr double kMetresPerInch = 0.0254;        // exact
inline constexpr double kMetresPerFoot = 0.3048;        // exact
inline constexpr double kStandardGravity = 9.80665;     // m/s^2, exact (CGPM 1901)

std::string_view to_string(WeightUnit u);
std::string_view to_string(LengthUnit u);
// Parse "lb"/"kg" and "in"/"ft"/"mm"/"cm"/"m"; nullopt for anything else.
std::optional<WeightUnit> parse_weight_unit(std::string_view s);
std::optional<LengthUnit> parse_length_unit(std::string_view s);

// Conversions. Weights: factor to convert a value in `from` into `to`.
double weight_factor(WeightUnit from, WeightUnit to);
double length_factor(LengthUnit from, LengthUnit to);
double length_to_metres(double v, LengthUnit u);
double metres_to_length(double metres, LengthUnit u);

// The moment unit used for a session's weight unit: "lbf·ft" or "N·m".
std::string_view moment_unit_name(WeightUnit w);
// Moment of (weight w in unit wu) x (length l in unit lu), expressed in the session's moment unit.
// Factor: multiply weight*length (in wu*lu) by this to get lbf·ft (wu = lb) or N·m (wu = kg).
double moment_factor(WeightUnit wu, LengthUnit lu);

}  // namespace sp
