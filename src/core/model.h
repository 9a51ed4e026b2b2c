// The input model: one weigh session of a tow vehicle and trailer, as entered.
//
// Units: every weight is in session.units.weight, every length in session.units.length,
// exactly as entered (no conversion happens on load, so an export round-trips losslessly).
// Frames: lengths are horizontal distances along the rig's centre line.
//   wheelbase          steer axle to drive axle (maker's spec; held fixed by the engine)
//   rear_axle_to_ball  drive axle (mid-point of a tandem) to hitch ball, positive behind the
//                      axle; negative for a coupling ahead of it (fifth wheel / gooseneck)
//   ball_to_axle       hitch ball (king pin) to the trailer's effective axle (tandem mid-point)
// Optional ratings are std::nullopt when the owner did not give them; nothing is guessed.
#pragma once
#include <optional>
#include <string>
#include <vector>

#include "core/units.h"

namespace sp {

inline constexpr const char* kSessionFormat = "scaleproof-session/1";

struct ScaleInfo {
  std::string id;                       // station's own scale id, e.g. "ST-3"
  double division = 0;                  // scale division d, in session weight unit (> 0)
  std::string accuracy_class = "IIIL";  // NIST HB 44 class: "III", "IIIL"; OIML "III"
  std::optional<std::string> last_inspected;  // ISO date "YYYY-MM-DD"
  std::optional<double> reading_uncertainty;  // standard uncertainty override, weight unit
  std::optional<std::string> name;
  std::optional<std::string> location;
  std::optional<double> capacity;             // weight unit
};

struct TowVehicle {
  std::string label;
  double wheelbase = 0;          // length unit, > 0
  double rear_axle_to_ball = 0;  // length unit; see frame notes above
  std::optional<double> gvwr, front_gawr, rear_gawr, gcwr;               // weight unit
  std::optional<double> hitch_tongue_rating, hitch_trailer_rating;       // weight unit
  std::optional<double> falr_target;  // percent; engine default 50 when absent
};

enum class TrailerType { conventional, fifth_wheel };

struct Trailer {
  std::string label;
  TrailerType type = TrailerType::conventional;
  double ball_to_axle = 0;  // length unit, > 0
  std::optional<double> gvwr, axle_gawr;  // weight unit; axle_gawr is for all trailer axles
};

enum class PassKind { unhitched, hitched, tensioned };

struct Pass {
  PassKind kind = PassKind::unhitched;
  std::optional<std::string> setting;  // owner's label for the bar tension (tensioned only)
  std::string ticket;                  // scale ticket number, unique within a session
  std::string weighed_at;              // ISO 8601 date-time with offset, as printed
  double steer = 0;                    // weight unit, platform readings
  double drive = 0;
  std::optional<double> trailer;       // absent or 0 for unhitched
  std::optional<double> gross;         // printed gross, when the ticket shows one
  std::optional<std::string> scale_id; // scale that printed the ticket when it differs from
                                       // the session's (audits flag mixed scales)
  // Store-side facts; a session file may carry them too. Voided passes are kept for the
  // record (reports show them struck) but never enter the solution.
  std::optional<long long> id;         // store row id, when from the store
  bool voided = false;
  std::optional<std::string> void_reason;
  std::optional<std::string> entered_by;
  std::optional<std::string> entered_at;
};

struct Session {
  std::string format = kSessionFormat;
  Units units;
  ScaleInfo scale;
  TowVehicle tow_vehicle;
  Trailer trailer;
  std::vector<Pass> passes;
  std::optional<double> length_uncertainty;  // standard uncertainty of tape lengths, length unit
  // Descriptive, optional.
  std::optional<long long> session_id;       // store id when from the store
  std::optional<std::string> station;
  std::optional<std::string> operator_name;
  std::optional<std::string> owner;
  std::optional<std::string> notes;
};

std::string_view to_string(PassKind k);
std::string_view to_string(TrailerType t);
std::optional<PassKind> parse_pass_kind(std::string_view s);
std::optional<TrailerType> parse_trailer_type(std::string_view s);

}  // namespace sp
