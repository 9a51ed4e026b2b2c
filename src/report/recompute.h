// The one path from a session to the JSON that goes into a weigh record, shared by issuing
// (cmd_report) and verifying (cmd_verify) so both compute results the same way.
#pragma once
#include <nlohmann/json.hpp>

#include "core/model.h"
#include "engine/result.h"

namespace sp::report {

// session_to_json / result_to_json of format/result_json.h.
nlohmann::json session_json(const Session& session);
nlohmann::json results_json(const ReconcileResult& result);
// Parses a record's "session" object (strictly, as a session file) and reconciles it with the
// default options. Throws sp::Error(data_error) naming "weigh-record.json: $.session...".
nlohmann::json recompute_results(const nlohmann::json& session);

}  // namespace sp::report
