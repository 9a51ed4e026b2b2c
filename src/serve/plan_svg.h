// The plan chart of the browser console (`GET /sessions/ID/plan`), drawn on the server as SVG.
//
// plan_svg(plan, options) returns one standalone `<svg id="plan-chart" ...>` element (UTF-8,
// no XML prologue, so it can be inlined in an HTML page or served as image/svg+xml as is):
//  - panel "Axle loads": steer axle, drive axle and trailer axles against bar moment (the plan's
//    rows; loads are linear in the moment, engine/statics.h), the ball load when the plan has a
//    tongue load, and the limit of every axle rating the plan carries (front GAWR, rear GAWR,
//    trailer axle GAWR, hitch tongue rating, with the rated quantity beside it);
//  - panel "Totals" (only when the plan carries such a rating): every other rating (GVWR, GCWR,
//    trailer GVWR, hitch trailer rating, and any rating key added later) as its limit line and its
//    rated quantity, from PlanRating's at_zero + slope · M;
//  - the target bar moment (FALR target) and full restoration as vertical lines, the point where
//    a rating starts or stops being exceeded as a marker, axis ticks in the plan's units.
// Words are the plan's own (PlanRating::label "Steer axle vs front GAWR": the quantity before
// " vs ", the rating after it) so the chart says what `scaleproof plan` says.
// Accessible: role="img", aria-label with a one-sentence summary, <title> and <desc> (the
// numbers in words). Printable in black and white: every line has its own dash pattern and
// marker, and every line is labelled in words at its end, not by colour alone. Only
// presentation attributes (no <style>, no style="", no script), so a strict
// Content-Security-Policy (style-src 'self') does not strip it; classes are prefixed "pc-" so a
// page's stylesheet does not restyle the lines by accident.
// Every text from outside (labels) is XML-escaped; control characters become U+FFFD. Numbers
// are finite fixed-point decimals: a non-finite value is left out, never printed.
// Deterministic. Pure: no I/O, no globals. Never throws for a PlanResult made by plan().
#pragma once
#include <optional>
#include <string>

#include "engine/plan.h"

namespace sp::serve {

struct PlanSvgOptions {
  std::string title;  // e.g. "Tow vehicle + trailer" (escaped); empty: no rig words in the title
  // true: the baseline is a reconciled weighing ("Plan from the weighing"); false: numbers given
  // ("Plan before weighing"); unknown: the heading says neither.
  std::optional<bool> weighed;
  int width = 760;  // viewBox width in user units (the chart scales to its container)
};

std::string plan_svg(const PlanResult& plan, const PlanSvgOptions& options = {});

// XML-escapes `text` for element content and attribute values (& < > " '); C0 control
// characters other than tab/newline and DEL become U+FFFD (they are not allowed in XML 1.0).
std::string xml_escape(const std::string& text);

}  // namespace sp::serve
