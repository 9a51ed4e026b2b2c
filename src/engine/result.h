// The engine's output for one session. Plain data; rendering lives elsewhere.
//
// Units: weights in the session's weight unit, lengths in its length unit, bar moments in
// `moment_unit` (lbf·ft for lb sessions, N·m for kg sessions), FALR and percents in %.
// Every `u` is a standard uncertainty (k = 1, JCGM 100:2008); reports show ±2u where they
// say "95 %" (GUM §6.3).
// A quantity that could not be solved is std::nullopt and `unsolved` says why; the engine
// never reports NaN or a value it did not solve.
//
// Every result leads with one verdict (RULES.md: a proof never misleads at a glance):
//   compliant   the fit passed and every rating checked is within at k = 2, none left unsolved
//   over        the fit passed and at least one rating is over at k = 2 (also a `rating-over`
//               flag of error severity, so no "no flags" line can sit beside it)
//   undecided   the fit passed, none over, at least one undecided (or a given rating could not
//               be solved, or no rating was given at all: nothing was shown to be within)
//   not-proven  the fit failed (a reading or a tape length does not fit) or could not run: the
//               numbers cannot be relied on; re-weigh or re-measure
// `verdict_reason` is one sentence naming the rating or the reading behind the verdict.
// A failed fit that names one reading or one tape length is re-solved without it (serial
// elimination, Narasimhan & Jordache 2000, ch. 7): `if_excluded` holds what the rig would be
// if that value is the error; the verdict of the result itself stays not-proven.
#pragma once
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "core/units.h"

namespace sp {

struct Estimate {
  double value = 0;
  double u = 0;  // standard uncertainty, same unit as value
};

struct LengthEstimate {
  double value = 0;  // back-solved
  double u = 0;
  double entered = 0;  // tape-measured, as entered
};

struct TensionedResult {
  std::string ticket;
  std::optional<std::string> setting;    // as entered
  std::optional<double> setting_number;  // when the label parses as a number
  Estimate bar_moment;                   // moment_unit
  std::optional<Estimate> ball_load;     // needs the slack tongue load
  std::optional<Estimate> falr;          // %, needs unhitched + hitched
  Estimate steer, drive, trailer;        // fitted axle loads of this pass
  // Plain-language explanation when the bar moment or FALR came out negative (bars cannot
  // lift the front; a reading or length is probably wrong). Absent otherwise.
  std::optional<std::string> note;
};

// A fitted setting on a hitch whose settings are whole steps (every numeric setting weighed
// is a whole number): the whole settings either side and the one to try first.
struct WholeStepSetting {
  double lower = 0;      // floor of the fitted setting (equal to upper when it lands on one)
  double upper = 0;      // lower + 1, or lower when the fit lands on a whole step
  double try_first = 0;  // the nearer of the two (the fitted setting rounded)
};

struct TargetResult {
  double falr = 50;                    // % target used
  bool falr_from_rig = false;          // false: the 50 % default (SAE J2807, from memory)
  std::optional<Estimate> bar_moment;  // moment for the target
  std::optional<Estimate> setting;     // setting that reaches it (linear fit), when solvable
  std::optional<Estimate> steer, drive, trailer, ball_load;  // predicted at the target moment
  std::optional<std::string> note;                           // why setting is absent, etc.
  // True when this recommendation must not be relied on: the fit failed, or the result is an
  // `if_excluded` re-solve (advice only if the excluded value is the error). Text says so.
  bool provisional = false;
  // Set when the settings weighed are whole steps; `setting` keeps the fractional fit.
  std::optional<WholeStepSetting> whole_step;
};

struct FitResult {
  double chi_square = 0;
  int dof = 0;
  double p_value = 1;
  double critical = 0;  // chi-square upper critical value at alpha
  double alpha = 0.05;
  bool passed = true;
};

// One measurement as used in the fit (platform reading or tape length).
struct MeasurementFit {
  std::string name;                     // e.g. "A-1003 drive" or "ball_to_axle"
  std::optional<std::string> ticket;    // for readings
  std::optional<std::string> platform;  // "steer" | "drive" | "trailer"
  std::optional<std::string> field;     // "rear_axle_to_ball" | "ball_to_axle"
  double measured = 0;
  double fitted = 0;
  double sigma = 0;       // standard uncertainty used as weight
  double normalized = 0;  // |r| / sqrt((V_r)_jj); 0 when not defined
};

enum class Severity { error, warning, note };

struct Flag {
  std::string code;  // e.g. "inconsistent-reading"
  Severity severity = Severity::warning;
  std::string message;  // plain language, with the numbers
  std::optional<std::string> ticket;
  std::optional<std::string> platform;
  std::optional<std::string> field;
  std::optional<double> needed;       // the value the named measurement would need to fit
  std::optional<std::string> rating;  // `rating-over`: the rating key, e.g. "rear_gawr"
};

// Code of the error-severity flag raised for each rating over at k = 2.
inline constexpr const char* kRatingOverFlag = "rating-over";

enum class ComplianceStatus { within, over, undecided };

struct ComplianceRow {
  std::string rating;  // e.g. "front_gawr"
  std::string label;   // e.g. "Steer axle vs front GAWR"
  double limit = 0;
  double value = 0;
  double u = 0;
  double margin = 0;  // limit - value (negative when over)
  ComplianceStatus status = ComplianceStatus::within;
};

enum class Verdict { compliant, over, undecided, not_proven };

struct ReconcileResult;

// The value left out of an `if_excluded` re-solve: a platform reading (ticket + platform) or a
// tape length (field), with the value as entered (weight or length unit of the result).
struct ExcludedMeasurement {
  std::optional<std::string> ticket;    // readings
  std::optional<std::string> platform;  // "steer" | "drive" | "trailer"
  std::optional<std::string> field;     // "rear_axle_to_ball" | "ball_to_axle"
  double entered = 0;
};

struct IfExcluded {
  ExcludedMeasurement excluded;
  // The full result without that value, with its own fit test and verdict. Never null; shared
  // and immutable so results copy cheaply (convert functions build a new one). Its own
  // `if_excluded` is always empty (one elimination step).
  std::shared_ptr<const ReconcileResult> result;
};

struct ReconcileResult {
  Verdict verdict = Verdict::not_proven;
  std::string verdict_reason;  // one sentence naming the rating or the reading
  Units units;
  std::string moment_unit;                       // "lbf·ft" or "N·m"
  std::optional<Estimate> tow_steer, tow_drive;  // tow vehicle alone (unhitched), fitted
  std::optional<Estimate> tongue_load;           // slack tongue load T
  std::optional<Estimate> trailer_weight;        // T + trailer axles, bars slack
  std::optional<Estimate> tongue_percent;        // 100 T / trailer weight
  std::optional<LengthEstimate> rear_axle_to_ball, ball_to_axle;
  double wheelbase = 0;                    // held fixed
  std::vector<TensionedResult> tensioned;  // in the order the passes were given
  std::optional<TargetResult> target;
  std::optional<FitResult> fit;
  std::vector<MeasurementFit> measurements;
  std::vector<Flag> flags;
  std::vector<ComplianceRow> compliance;
  std::string travel_pass;                // ticket of the pass compliance was judged on
  std::vector<std::string> unsolved;      // one line each: what, why, which pass fixes it
  std::optional<IfExcluded> if_excluded;  // failed fit naming one value: re-solve without it
};

std::string_view to_string(Severity s);
std::string_view to_string(ComplianceStatus s);
// "compliant", "over", "undecided", "not-proven": the same words on every surface.
std::string_view to_string(Verdict v);

}  // namespace sp
