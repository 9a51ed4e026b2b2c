// The plan's chart as inline SVG (<svg id="plan-chart">): axle loads against bar moment, the
// target moment and every rating line. One function, so the drawing can be replaced without
// touching the page.
#pragma once
#include <string>

#include "engine/plan.h"

namespace sp::serve {

std::string plan_chart(const PlanResult& plan);

}  // namespace sp::serve
