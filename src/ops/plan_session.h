// Planning from a weighed session: what `scaleproof plan SESSION` and the console's plan page
// share (engine/plan.h does the statics; format/plan_output.h renders it).
//  - loads_from_session: the loads with the bars slack: the reconciled values when the engine
//    can solve them (they use every pass), else the first unhitched and hitched readings as
//    keyed. A passed fit also gives the back-solved lengths (written into `tow` / `trailer`),
//    so the plan's target moment is the one `reconcile` recommends; `labels` gets the verdict;
//    `notes` a caution when the fit failed.
//  - plan_of_session: the whole plan of a session with nothing overridden (`source` names it
//    in the baseline line, e.g. "session 3"). Throws what engine/plan.h throws.
#pragma once
#include <string>
#include <vector>

#include "core/model.h"
#include "engine/plan.h"
#include "format/plan_output.h"

namespace sp::ops {

PlanLoads loads_from_session(const Session& s, std::vector<std::string>& notes, TowVehicle& tow,
                             Trailer& trailer, PlanLabels& labels);

struct SessionPlan {
  PlanResult plan;
  PlanLabels labels;
};

SessionPlan plan_of_session(const Session& s, const std::string& source,
                            const PlanOptions& options = {});

}  // namespace sp::ops
