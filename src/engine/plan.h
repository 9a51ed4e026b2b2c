// Planning a weight-distributing (WD) hitch setting before (or between) weighings.
//
// From the rig's geometry and ratings and a baseline of axle loads with the bars slack, predict
// the axle loads across a range of bar moments, the moment for the target front axle load
// restoration (FALR), and where each rating would be exceeded. The predictions use the
// engine's forward statics model (engine/statics.h); nothing here re-derives it.
//
// Units: weights in `units.weight`, lengths in `units.length` (as in core/model.h), bar
// moments in the session moment unit (lbf·ft for lb, N·m for kg; core/units.h
// moment_unit_name), FALR in %. Frames as in core/model.h.
// Predictions are nominal values: they carry no uncertainty (weigh the rig to get one).
// Pure: no I/O, no globals. Throws sp::Error(data_error) naming the field for a violated
// precondition.
#pragma once
#include <optional>
#include <string>
#include <vector>

#include "core/model.h"
#include "engine/statics.h"

namespace sp {

// Axle loads with the bars slack, the starting point of a plan.
struct PlanBaseline {
  double steer0 = 0;   // tow vehicle alone, steer axle
  double drive0 = 0;   // tow vehicle alone, drive axle
  double axles0 = 0;   // trailer axles, hitched with the bars slack
  double tongue = 0;   // slack tongue load T
  std::string source;  // one line: where these came from
};

// What the owner knows; exactly one way of giving the loads is used (see make_baseline).
struct PlanLoads {
  std::optional<AxleLoads> unhitched;       // steer, drive of the tow vehicle alone
  std::optional<AxleLoads> hitched;         // steer, drive, trailer, hitched with bars slack
  std::optional<double> tongue;             // estimated (or tongue-scale) tongue load
  std::optional<double> trailer_weight;     // whole trailer weight (its own ticket, or GVWR)
};

// Builds the baseline from any sufficient combination, checked in this order:
//   unhitched + hitched                     T = hitched total - unhitched total (conserved)
//   hitched + tongue                        S0, D0 by undoing the hitch with the statics
//   hitched + trailer_weight                T = trailer weight - hitched trailer axles
//   unhitched + tongue + trailer_weight     A0 = trailer weight - T
// Throws sp::Error(usage) saying what is missing when no combination is complete, and
// sp::Error(data_error) when the result is impossible (negative tongue or axle load).
PlanBaseline make_baseline(const TowVehicle& tow, const Trailer& trailer, const PlanLoads& loads,
                           const Units& units);

struct PlanOptions {
  std::optional<double> falr_target;  // %, default: the rig's falr_target, else 50
                                      // (SAE J2807, from memory)
  std::optional<double> max_moment;   // moment unit; default: see plan()
  int steps = 10;                     // table rows - 1 (>= 1, <= 200)
};

struct PlanRow {
  double bar_moment = 0;           // moment unit
  AxleLoads loads;                 // steer, drive, trailer axles
  double ball_load = 0;            // T - M/L
  std::optional<double> falr;      // %, when the hitch is behind the axle (o > 0)
  double tow_total = 0;            // steer + drive
  double combined = 0;             // steer + drive + trailer axles
  std::vector<std::string> over;   // rating keys exceeded in this row
};

// Where a rating is exceeded within the table's range of bar moments [0, max] (loads are
// linear in M): never; always; above `boundary`; below `boundary`.
enum class Exceeded { never, always, above, below };
struct PlanRating {
  std::string rating;              // key as in the compliance table, e.g. "front_gawr"
  std::string label;               // e.g. "Steer axle vs front GAWR"
  double limit = 0;
  double at_zero = 0;              // the rated quantity with the bars slack
  double slope = 0;                // change per unit bar moment (weight per moment unit)
  Exceeded exceeded = Exceeded::never;
  std::optional<double> boundary;  // moment unit: where the line crosses the limit, when that
                                   // is at a positive moment (also beyond the table)
};

struct PlanResult {
  Units units;
  std::string moment_unit;
  TrailerType trailer_type = TrailerType::conventional;
  double wheelbase = 0, rear_axle_to_ball = 0, ball_to_axle = 0;
  PlanBaseline baseline;
  double trailer_weight = 0;                 // T + A0
  double tongue_percent = 0;
  double falr_target = 50;
  bool falr_from_rig = false;
  std::optional<double> target_moment;       // moment for the FALR target (o > 0 only)
  std::optional<PlanRow> at_target;          // predicted loads at that moment
  std::optional<double> full_restoration;    // moment for 100 % FALR (o > 0 only)
  std::vector<PlanRow> rows;                 // 0 .. max moment, steps + 1 rows
  std::vector<PlanRating> ratings;           // only the ratings that were given
  std::vector<std::string> notes;            // plain-language remarks
};

// Default sweep: 0 to 125 % of the full-restoration moment (so over-restoration shows),
// rounded up to a whole 100 lbf·ft / 100 N·m. A fifth wheel (o <= 0) takes no WD bars: one row
// at 0 and a note.
PlanResult plan(const TowVehicle& tow, const Trailer& trailer, const PlanBaseline& baseline,
                const Units& units, const PlanOptions& options = {});

std::string_view to_string(Exceeded e);

}  // namespace sp
