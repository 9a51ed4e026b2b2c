// Session file (JSON, format "scaleproof-session/1") <-> core::Session.
//
// Parsing is strict: unknown keys, wrong types, unknown units, negative or absurd weights,
// duplicate tickets and a non-zero trailer reading on an unhitched pass are rejected with
// sp::Error(data_error) whose message is "<source>: <JSON path>: <what was expected>", e.g.
//   "rig.json: $.passes[2].steer: expected a weight between 0 and 100000 lb, got -40"
// Writing produces a file parse_session_json accepts and that round-trips losslessly.
#pragma once
#include <string>
#include <string_view>

#include "core/model.h"

namespace sp {

Session parse_session_json(std::string_view text, const std::string& source);
std::string write_session_json(const Session& session);

}  // namespace sp
