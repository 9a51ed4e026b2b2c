// The plan page's chart: the full drawing of serve/plan_svg.h with its defaults.
#include "serve/plan_chart.h"

#include "serve/plan_svg.h"

namespace sp::serve {

std::string plan_chart(const PlanResult& p) {
  return plan_svg(p);
}

}  // namespace sp::serve
