// `--units us|metric`: converting a reconcile result for printing.
//
// Contract: convert_result_units returns a copy of `r` with every weight, length and bar
// moment expressed in the target system; percentages, the fit statistics (dimensionless),
// setting labels and numbers (the owner's own scale) and tickets are unchanged. Standard
// uncertainties scale with their values. Flag `message` strings and the verdict reason are the
// engine's text and keep the numbers they were written with; `needed` is converted (weight or
// length by its field). The CLI's `--units` therefore solves convert_session_units instead.
//   us:     weights lb, lengths in, moments lbf·ft
//   metric: weights kg, lengths mm, moments N·m
// Factors are the exact definitions of NIST SP 811 (2008) Appendix B.8 via core/units.h.
// Weights are scale indications, so kgf and kg are numerically equal (a scale shows mass).
// Pure; never throws.
#pragma once
#include <optional>
#include <string_view>

#include "core/model.h"
#include "core/units.h"
#include "engine/result.h"

namespace sp {

enum class UnitSystem { us, metric };

// "us" / "metric"; nullopt for anything else (also ""), so callers keep the session's units.
std::optional<UnitSystem> parse_unit_system(std::string_view s);
// The weight and length units of a system.
Units units_of(UnitSystem system);

ReconcileResult convert_result_units(const ReconcileResult& r, UnitSystem to);

// The session with every weight (readings, printed gross, division, reading uncertainty,
// capacity, ratings) and length (geometry, length uncertainty) in the target system; labels,
// tickets, times, settings and falr_target unchanged. Solving this session gives the result
// of convert_result_units (the model is linear in the unit scale) and, unlike it, flag
// messages and the verdict reason written in the target units: what `--units` prints.
Session convert_session_units(const Session& s, UnitSystem to);

// Converts a rig's lengths and ratings (not falr_target, a percentage) from `from` to `to`
// in place: the tow vehicle's and trailer's as in core/model.h.
void convert_rig_units(TowVehicle& tow, Trailer& trailer, const Units& from, const Units& to);

// Converts a bar moment given in the moment unit of `from` (lbf·ft for lb, N·m for kg) into
// that of `to`.
double convert_moment(double value, WeightUnit from, WeightUnit to);

}  // namespace sp
