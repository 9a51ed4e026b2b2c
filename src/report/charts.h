// The report's pictures, drawn with PdfDocument vector primitives inside the flow:
//  1. axle loads (steer, drive, trailer; one panel each, shared x axis) against bar moment:
//     the solved statics model as lines, the measured passes as points, the unhitched loads as
//     dashed references, the target bar moment as a dashed vertical line;
//  2. a side view of the rig (not to scale) with the travel pass's axle loads, the ball load
//     and the back-solved lengths beside the entered ones.
// Model lines (reconcile.h, moments converted with units.h moment_factor):
//   Fv = T - M/L; steer = S0 + (M - Fv·o)/WB; drive = D0 + Fv - (steer - S0); trailer = A0 + M/L.
// When T, o or L is unsolved the charts are replaced by a sentence saying so.
#pragma once
#include "core/model.h"
#include "engine/result.h"
#include "report/layout.h"

namespace sp::report {

struct AxleLines {
  // Load = a + b·M for M in the result's moment unit, per axle; valid only when `ok`.
  bool ok = false;
  double steer_a = 0, steer_b = 0, drive_a = 0, drive_b = 0, trailer_a = 0, trailer_b = 0;
};
AxleLines axle_lines(const Session& s, const ReconcileResult& r);

void draw_charts(Flow& flow, const Session& s, const ReconcileResult& r, int weight_decimals);

}  // namespace sp::report

namespace sp::report {
// The side-view sketch (see above); needs the same solved quantities as the chart.
void draw_rig_sketch(Flow& flow, const Session& s, const ReconcileResult& r, int weight_decimals);
}  // namespace sp::report
