// Rig files (the same TOML or JSON `rig add --file` and the console's rig form take):
//   name = "heron-wren"
//   [units]      weight = "lb", length = "in"
//   [tow_vehicle] label, wheelbase, rear_axle_to_ball, gvwr, front_gawr, rear_gawr, gcwr,
//                 hitch_tongue_rating, hitch_trailer_rating, falr_target
//   [trailer]    label, type ("conventional" | "fifth-wheel"), ball_to_axle, gvwr, axle_gawr
// Unknown keys are refused (with a "did you mean"); ranges and text are validate::rig's.
// Throws sp::Error(data_error) "<name>: <key>: <what was expected>" (TOML: "<name>:<line>: ...",
// JSON keys as paths "<name>: $.tow_vehicle.gvwr"). Pure: text in, record out.
#pragma once
#include <string>

#include "store/store.h"

namespace sp::ops {

// `name` is how messages name the text (a file path, or the form field "rig_file").
store::RigRecord rig_from_text(const std::string& body, const std::string& name, bool is_json);
// The name ends in ".json" (else it is read as TOML).
bool is_json_name(const std::string& path);

}  // namespace sp::ops
