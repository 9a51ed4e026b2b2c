// The readable summary `scaleproof reconcile FILE` prints for one session.
//
// Layout (plain text, 100 columns at most, our own): the verdict and its reason (always the
// first line), heading (source, rig, scale), the
// readings table, the solved quantities, the bar passes, the fit test in words, flags with a
// plain-language explanation each, the ratings table, the recommendation (marked PROVISIONAL
// on a failed fit), the if_excluded re-solve when there is one, what could not be solved, and a
// one-line caution. A fifth wheel / gooseneck is worded as such (pin load, kingpin, no bars). Every
// "±" is the expanded uncertainty U = 2u (coverage factor k = 2, about 95 %; JCGM 100:2008 §6.3),
// said so in the output. Numbers are rounded per format/rounding.h. Colour (ANSI) only when
// options.colour is set. Pure: builds a string; `session` must be the one `result` was solved from.
#pragma once
#include <string>

#include "core/model.h"
#include "engine/result.h"

namespace sp {

struct TextOptions {
  std::string source;   // file name shown in the heading ("-" reads as "<stdin>")
  bool colour = false;  // ANSI colour for statuses and flags
};

std::string render_result_text(const Session& session, const ReconcileResult& result,
                               const TextOptions& options);

// The recommended setting in words: "4.4 ± 0.2"; on a whole-step hitch "between 4 and 5: try 4,
// re-weigh (fit 4.4 ± 0.2)" or "4 (fit 4.0 ± 0.1)" (± is 2u). "" when no setting was solved.
std::string setting_text(const TargetResult& target);

// One sentence saying what a flag code means and what to do about it ("" for unknown codes).
std::string explain_flag(const std::string& code);

}  // namespace sp
