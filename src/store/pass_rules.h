// The checks a pass must meet before it is stored, shared by `pass add` (which checks each
// answer as it is typed), `import` and the store itself. Pure: no I/O. The rules themselves are
// format/validate.h's (one validator for every input path); these name the fields as the
// store's messages do.
//
// Units: readings in the scale's weight unit `unit`. Throws sp::Error(data_error) with the
// field named, e.g. "drive: reading 4705 lb is not a multiple of the scale division 20 lb";
// check_pass prefixes "ticket B-1042, pass tensioned: ".
#pragma once
#include <string_view>

#include "core/model.h"

namespace sp::store {

// Upper bound of a plausible platform reading: the validator's absurd-value limit (200 000 lb,
// 90 000 kg; reasons in format/validate.h). The scale's capacity, when recorded, is tighter.
double plausible_max(WeightUnit unit);

// One reading (`platform` is "steer", "drive" or "trailer"): a weight within the validator's
// range, <= the scale's capacity and a whole number of divisions (NIST HB 44 §2.20).
void check_reading(std::string_view platform, double value, const ScaleInfo& scale,
                   WeightUnit unit);
// The printed gross of a three-platform ticket is the sum of the platform readings
// (common practice); compared to 1e-9 of the sum to absorb decimal divisions such as 0.5 kg.
void check_gross(const Pass& pass, WeightUnit unit);
// All checks of one pass: validate::pass (text, dates, ranges, kind rules) and
// validate::pass_on_scale (capacity, divisions, gross = sum).
void check_pass(const Pass& pass, const ScaleInfo& scale, WeightUnit unit);

}  // namespace sp::store
