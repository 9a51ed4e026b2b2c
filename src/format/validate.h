// One validator for every input path (issue 16): the session file, the rig file (TOML or
// JSON), the pass CSV, the `rig add` / `scale add` / `pass add` flags, the browser console and
// the store itself call these functions, so the same fault gets the same message everywhere.
//
// Contract
//   * Pure: no I/O, no globals, no printing. A check returns, or throws
//     sp::Error(data_error) "<name>: <message>". <name> is what the caller's FieldNames makes
//     of the model field; <message> is the same on every path for the same fault:
//       "file.json: $.tow_vehicle.gvwr: expected a rating greater than 0 and at most 200000 lb, got
//       1e+308" "rig.toml: tow_vehicle.gvwr: expected a rating greater than 0 and at most 200000
//       lb, got 1e+308"
//       "--gvwr: expected a rating greater than 0 and at most 200000 lb, got 1e+308"
//   * Model field names are the session file's keys without "$.": "tow_vehicle.gvwr",
//     "trailer.ball_to_axle", "scale.division", "units.weight", "passes[2].steer"; the checks
//     of one pass / scale / rig use names relative to it ("steer", "division", ...; a rig's
//     fields keep their "tow_vehicle." / "trailer." part).
//   * Values that pass allocate nothing: a name is built only when a check fails (the CSV
//     import runs these checks on every row; bench/README.md item 1).
//   * Types are the parsers' job (a JSON string where a number belongs, "4460 lb" in a CSV
//     cell); they report it with not_a_number() so that message is shared too.
//
// Limits (why and where from)
//   Absurd-value limits catch keying errors (an extra digit, a unit mix-up), not overloads:
//   the ratings check judges overloads.
//   * weights (readings, ratings): 200 000 lb / 90 000 kg. 23 CFR 658.17 caps a US tandem
//     axle at 34 000 lb and a whole vehicle at 80 000 lb; no platform of a vehicle scale sees
//     a rig of this kind anywhere near 200 000 lb (90 000 kg, about the same), so a larger
//     reading or rating is a mistake (common practice). Printed gross: 3 platforms' worth.
//   * scale capacity: at most 3 x the weight limit; reading uncertainty at most 1/20 of it.
//   * scale division: > 0 and at most 1000 lb / 500 kg. Vehicle-scale divisions are 5-100 lb
//     (NIST HB 44 §2.20 Table 3 sets d >= 5 lb for III L; 20 lb is typical: common practice).
//   * lengths (wheelbase, ball_to_axle > 0; rear_axle_to_ball either sign): at most 100 ft
//     (30.48 m) in magnitude; no wheelbase, hitch offset or trailer length of a towed rig
//     comes near it (common practice). Length uncertainty: > 0 and at most 1 ft.
//   * coupling: a conventional trailer's ball sits behind the drive axle (> 0); a fifth wheel
//     sits over or ahead of it (<= 0) and takes no WD bars (no tensioned pass); either way
//     it is behind the steer axle (> -wheelbase). From the statics model (engine/statics.h).
//   * falr_target: a percentage, > 0 and at most 100 (restoring more than 100 % is not
//     recommended: SAE J2807 as quoted in ../shared/notes/references.md).
//   * text: labels, ids, names, dates <= 200 characters (one report line); tickets and bar
//     settings <= 64 (common practice for record keys); notes <= 4000 and may hold line
//     breaks and tabs. All text must be UTF-8 without control characters (C0, DEL, C1) and
//     without invisible format characters: Unicode general category Cf (bidirectional
//     controls U+202A-U+202E and U+2066-U+2069, zero-width U+200B-U+200F, U+2060-U+2064,
//     U+FEFF, soft hyphen U+00AD, tags U+E0001-U+E007F, ...) and the
//     separators U+2028/U+2029: text that displays differently from what is stored cannot be
//     evidence (issue 16; the spoofing classes of Unicode Technical Report #36 "Unicode
//     Security Considerations" and CVE-2021-42574, from memory). The Cf list is Unicode
//     15.0's, checked against Python's unicodedata in tests/unit/format_validate_test.cpp.
//   * dates: ISO 8601 as format/iso8601.h; at most 1000 passes in a session file.
#pragma once
#include <string>
#include <string_view>
#include <vector>

#include "core/model.h"

namespace sp::validate {

// How an input path names a model field in its messages. name() is called only on failure.
class FieldNames {
 public:
  virtual std::string name(std::string_view field) const = 0;

 protected:
  ~FieldNames() = default;
};

// "<prefix><field>": PrefixNames("rig.toml: "), PrefixNames("file.json: $.").
class PrefixNames final : public FieldNames {
 public:
  explicit PrefixNames(std::string prefix) : prefix_(std::move(prefix)) {}
  std::string name(std::string_view field) const override;

 private:
  std::string prefix_;
};

// Model field -> the name the user typed ("tow_vehicle.gvwr" -> "--gvwr"); a field not in the
// table is shown as "<fallback_prefix><field>".
class TableNames final : public FieldNames {
 public:
  struct Entry {
    std::string_view field, name;
  };
  TableNames(std::vector<Entry> table, std::string fallback_prefix = "")
      : table_(std::move(table)), fallback_(std::move(fallback_prefix)) {}
  std::string name(std::string_view field) const override;

 private:
  std::vector<Entry> table_;
  std::string fallback_;
};

// Throws sp::Error(data_error) "<names.name(field)>: <message>".
[[noreturn]] void fail(const FieldNames& names, std::string_view field, const std::string& message);

// ---- numbers ---------------------------------------------------------------------------
enum class Quantity {
  reading,              // platform reading, weight unit, [0, limit]
  gross,                // printed gross, weight unit, [0, 3 x limit]
  rating,               // GVWR, GAWR, GCWR, hitch ratings, weight unit, (0, limit]
  capacity,             // scale capacity, weight unit, (0, 3 x limit]
  division,             // scale division d, weight unit, (0, 1000 lb | 500 kg]
  reading_uncertainty,  // weight unit, (0, limit / 20]
  wheelbase,            // length unit, (0, 100 ft]
  rear_axle_to_ball,    // length unit, [-100 ft, 100 ft]
  ball_to_axle,         // length unit, (0, 100 ft]
  length_uncertainty,   // length unit, (0, 1 ft]
  falr_target,          // percent, (0, 100]
};

struct Range {
  double lo = 0, hi = 0;
  bool lo_open = false;   // lo itself is refused
  std::string_view what;  // "a weight", "a rating", "a length", ...
  std::string_view unit;  // "lb", "in", "%"
};
Range range(Quantity q, const Units& units);
// "a weight between 0 and 200000 lb", "a rating greater than 0 and at most 200000 lb".
std::string describe(const Range& r);
// Finite and inside range(q, units); else "expected <describe>, got <v>".
void number(double v, Quantity q, const Units& units, std::string_view field,
            const FieldNames& names);

// Parses the plain decimal form the CSV and the flags take: optional '-', digits, optional
// '.' and digits (no '+', exponent, spaces or unit). False when `s` is not of that form.
bool parse_number(std::string_view s, double& out);
// Throws "expected a number, got <quoted(got)>" (a value of the wrong type or form).
[[noreturn]] void not_a_number(std::string_view got, std::string_view field,
                               const FieldNames& names);
// A value as messages show it: JSON-quoted and escaped, cut to 40 characters ("...").
std::string quoted(std::string_view text);

// ---- text ------------------------------------------------------------------------------
enum class Text {
  label,   // one line, <= 200 characters: labels, names, ids, dates, void reasons
  ticket,  // one line, <= 64 characters: ticket numbers, bar settings, session keys
  notes,   // <= 4000 characters, line breaks and tabs allowed
};
// What is wrong with `s` as text of `kind`, in words ("expected text without control
// characters, got control character U+001B at character 4"), or "" when it is fine (and
// then nothing is allocated).
std::string text_fault(std::string_view s, Text kind);
// Throws text_fault() when it is not "" (and "expected a non-empty text" when `s` is empty
// and !allow_empty).
void text(std::string_view s, Text kind, std::string_view field, const FieldNames& names,
          bool allow_empty = true);

// ---- model structs ---------------------------------------------------------------------
// Fields: id, name, location, division, capacity, accuracy_class (III, IIIL),
// last_inspected (YYYY-MM-DD), reading_uncertainty.
void scale(const ScaleInfo& s, WeightUnit unit, const FieldNames& names);
// Fields: tow_vehicle.{label, wheelbase, rear_axle_to_ball, gvwr, front_gawr, rear_gawr,
// gcwr, hitch_tongue_rating, hitch_trailer_rating, falr_target},
// trailer.{label, ball_to_axle, gvwr, axle_gawr}; and the coupling rules above.
void rig(const Units& units, const TowVehicle& vehicle, const Trailer& trailer,
         const FieldNames& names);
// One pass on its own (no scale needed). Fields: ticket, setting (tensioned only), weighed_at,
// steer, drive, trailer (absent or 0 unhitched, present otherwise), gross, scale_id,
// void_reason (voided only), entered_by, entered_at.
void pass(const Pass& p, WeightUnit unit, const FieldNames& names);
// A pass against the scale it is stored on: each reading at most the scale's capacity and a
// whole number of divisions (NIST HB 44 §2.20: a scale indicates in multiples of d), printed
// gross = sum of the platforms (common practice; to 1e-9 of the sum, for divisions like
// 0.5 kg). Fields: steer, drive, trailer, gross.
void pass_on_scale(const Pass& p, const ScaleInfo& s, WeightUnit unit, const FieldNames& names);
// A whole session as a session file holds it: every rule above, station / operator / owner
// (label), notes, length_uncertainty, 1 to 1000 passes, each ticket once, no tensioned pass on
// a fifth wheel. Fields "passes[i].<field>" for the passes.
void session(const Session& s, const FieldNames& names);

}  // namespace sp::validate
