#include "report/recompute.h"

#include "engine/reconcile.h"
#include "format/result_json.h"
#include "format/session_json.h"

namespace sp::report {

nlohmann::json session_json(const Session& session) {
  // Through text: the record holds plain JSON values whatever container the writer uses.
  return nlohmann::json::parse(session_to_json(session).dump());
}

nlohmann::json results_json(const ReconcileResult& result) {
  return nlohmann::json::parse(result_to_json(result).dump());
}

nlohmann::json recompute_results(const nlohmann::json& session) {
  Session s = parse_session_json(session.dump(), "weigh-record.json: session");
  return results_json(reconcile(s));
}

}  // namespace sp::report
