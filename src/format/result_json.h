// Reconcile results and sessions as JSON values (nlohmann::json).
//
// result_to_json: the `--json` output of `scaleproof reconcile`, keys per issue #2:
//   units, tongue_load, trailer_weight, tongue_percent, rear_axle_to_ball, ball_to_axle
//   ({"value","u"}, lengths also "entered"), tensioned[], target, fit, flags[], compliance[],
//   plus unsolved[] and moment_unit. Unsolved quantities are JSON null, never NaN.
// session_to_json: the session-file object (the same document write_session_json prints).
// Both are deterministic: the same input gives the same bytes from .dump().
// append_result_json: appends exactly result_to_json(result).dump() (compact) to `out`, without
// building a JSON tree (the bulk `reconcile --all --json` path). Throws what dump() throws
// (nlohmann::json::type_error on a string that is not UTF-8).
#pragma once
#include <string>

#include <nlohmann/json.hpp>

#include "core/model.h"
#include "engine/result.h"

namespace sp {

nlohmann::ordered_json result_to_json(const ReconcileResult& result);
nlohmann::ordered_json session_to_json(const Session& session);
void append_result_json(std::string& out, const ReconcileResult& result);

}  // namespace sp
