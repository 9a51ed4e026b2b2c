// The checks a pass must meet before it is stored, shared by `pass add` (which checks each
// answer as it is typed), `import` and the store itself. Pure: no I/O.
//
// Units: readings in the scale's weight unit `unit`. Throws sp::Error(data_error) with the
// platform named, e.g. "drive platform: reading 4705 lb is not a multiple of the division 20 lb";
// check_pass prefixes "ticket B-1042, pass tensioned: ".
#pragma once
#include <string_view>

#include "core/model.h"

namespace sp::store {

// Upper bound of a plausible platform reading when the scale's capacity is not recorded:
// 100 000 lb (45 000 kg), well above any single axle group of a tow vehicle or trailer
// (common practice; the same bound the session-file parser uses).
double plausible_max(WeightUnit unit);

// A reading must be finite, >= 0, <= the scale's capacity (or plausible_max) and a whole
// number of divisions (NIST HB 44 §2.20: a scale indicates in multiples of d).
void check_reading(std::string_view platform, double value, const ScaleInfo& scale,
                   WeightUnit unit);
// The printed gross of a three-platform ticket is the sum of the platform readings
// (common practice); compared to 1e-9 of the sum to absorb decimal divisions such as 0.5 kg.
void check_gross(const Pass& pass, WeightUnit unit);
// All checks of one pass: readings, trailer reading absent or 0 when unhitched and present
// when hitched or tensioned, setting only on tensioned passes, gross = sum, ticket non-empty.
void check_pass(const Pass& pass, const ScaleInfo& scale, WeightUnit unit);

}  // namespace sp::store
