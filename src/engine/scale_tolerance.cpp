#include "engine/scale_tolerance.h"

#include <fmt/format.h>

#include <cmath>

namespace sp {

std::optional<ScaleClass> parse_scale_class(std::string_view s) {
  if (s == "IIIL" || s == "III L") return ScaleClass::hb44_iii_l;
  if (s == "III") return ScaleClass::hb44_iii;
  if (s == "OIML-III") return ScaleClass::oiml_iii;
  return std::nullopt;
}

double hb44_maintenance_tolerance_iii_l(double divisions) {
  const double n = std::fabs(divisions);
  if (n <= 500) return 1;
  if (n <= 1000) return 2;
  // One division more for each further 500 d or fraction thereof (from memory).
  return 2 + std::ceil((n - 1000) / 500);
}

double hb44_maintenance_tolerance_iii(double divisions) {
  const double n = std::fabs(divisions);
  if (n <= 500) return 1;
  if (n <= 2000) return 2;
  if (n <= 4000) return 3;
  return 5;
}

double hb44_acceptance_tolerance(ScaleClass c, double divisions) {
  return 0.5 * in_service_tolerance(c, divisions);
}

double oiml_mpe_iii(double intervals, bool in_service) {
  const double n = std::fabs(intervals);
  const double mpe = n <= 500 ? 0.5 : n <= 2000 ? 1.0 : 1.5;
  return in_service ? 2 * mpe : mpe;
}

double in_service_tolerance(ScaleClass c, double divisions) {
  switch (c) {
    case ScaleClass::hb44_iii_l:
      return hb44_maintenance_tolerance_iii_l(divisions);
    case ScaleClass::hb44_iii:
      return hb44_maintenance_tolerance_iii(divisions);
    case ScaleClass::oiml_iii:
      return oiml_mpe_iii(divisions, true);
  }
  return hb44_maintenance_tolerance_iii_l(divisions);
}

double default_reading_uncertainty(ScaleClass c, double reading, double division) {
  return in_service_tolerance(c, reading / division) * division / std::sqrt(3.0);
}

DivisionCheck check_division_iii_l(double division, std::optional<double> capacity,
                                   WeightUnit unit) {
  DivisionCheck out;
  const double min_d = 5.0 * weight_factor(WeightUnit::lb, unit);  // HB 44 Table 3: d >= 5 lb
  if (!(division >= min_d - 1e-9)) {
    out.ok = false;
    out.reason = fmt::format("division {:g} {} is below the Class III L minimum of {:g} {}",
                             division, to_string(unit), min_d, to_string(unit));
  }
  if (capacity && division > 0) {
    const double n = *capacity / division;
    out.count = n;
    if (n < 2000 - 1e-9 || n > 10000 + 1e-9) {
      out.ok = false;
      if (!out.reason.empty()) out.reason += "; ";
      out.reason += fmt::format(
          "capacity {:g} {} / division {:g} {} = {:g} divisions, outside the Class III L range "
          "2000 to 10000",
          *capacity, to_string(unit), division, to_string(unit), n);
    }
  }
  return out;
}

}  // namespace sp
