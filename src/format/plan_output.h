// `scaleproof plan` output: the readable table with a small terminal chart, and `--json`.
//
// plan_text: a header (rig, geometry, where the baseline came from), the table of axle loads
// across bar moments (numbers right-aligned in fixed columns), the FALR target line, where
// each rating is exceeded, a chart, the notes and the cautions. `colour` adds ANSI colour to
// the words "over"/"within" only (callers pass false unless stdout is a terminal and NO_COLOR
// is unset).
// plan_to_json: the same content, keys: verdict, verdict_reason, units, moment_unit, geometry,
// baseline,
// trailer_weight, tongue_percent, falr_target, falr_from_rig, full_restoration, target,
// rows[], ratings[], notes[]. Values in the plan's units; absent values are null.
// Both are deterministic. Pure: strings out.
#pragma once
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <vector>

#include "engine/plan.h"
#include "engine/result.h"

namespace sp {

struct PlanLabels {
  std::string tow;      // tow vehicle label (may be empty)
  std::string trailer;  // trailer label (may be empty)
  // From a weighed session: the heading says so and the weighing's verdict leads the plan.
  // Otherwise the plan leads with not-proven: arithmetic on numbers given proves nothing.
  bool weighed = false;
  Verdict verdict = Verdict::not_proven;
  std::string verdict_reason;
};

// Words for a rating key of the compliance table ("rear_gawr" -> "rear GAWR"); the key itself
// when unknown.
std::string rating_words(const std::string& key);

// Where a rating of the plan is exceeded, in words ("not exceeded from 0 to 2400 lbf·ft",
// "exceeded above 1650 lbf·ft"): the one wording of the terminal, the JSON-fed console page and
// the SVG chart.
std::string exceeded_words(const PlanRating& r, const PlanResult& plan);

std::string plan_text(const PlanResult& plan, const PlanLabels& labels, bool colour = false);
nlohmann::ordered_json plan_to_json(const PlanResult& plan, const PlanLabels& labels);

// A small character chart: one symbol per series, x = bar moment over [x0, x1], y auto-scaled
// to the data (and `reference` when given, drawn as a dashed line), `width` x `height` cells.
struct ChartSeries {
  char symbol = '*';
  std::string name;
  std::vector<double> y;  // values at evenly spaced x from x0 to x1 (>= 2 points)
};
std::string text_chart(const std::vector<ChartSeries>& series, double x0, double x1,
                       const std::string& x_label, const std::string& y_label,
                       std::optional<double> reference, std::optional<double> x_mark,
                       int width = 56, int height = 12);

}  // namespace sp
