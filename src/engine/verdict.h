// The one verdict a result leads with (engine/result.h lists the four values and when each
// applies), and the `rating-over` flags that stand beside an `over`.
//
// Pure: reads a result whose fit, flags and compliance rows are filled; no I/O.
// Numbers in the reason are in the result's units, ± being 2u (k = 2, JCGM 100:2008 §6.3),
// as in the text summary.
#pragma once
#include <string>

#include "engine/result.h"

namespace sp {

struct VerdictDecision {
  Verdict verdict = Verdict::not_proven;
  std::string reason;  // one sentence naming the rating or the reading
};

// `ratings_unsolved`: ratings the session gives whose value the passes do not solve (such a
// rating was not shown to be within, so the verdict cannot be compliant).
VerdictDecision decide_verdict(const ReconcileResult& r, int ratings_unsolved);

// One error-severity flag (code kRatingOverFlag) per compliance row that is over.
void add_rating_over_flags(ReconcileResult& r);

}  // namespace sp
