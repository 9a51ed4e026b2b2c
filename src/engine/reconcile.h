// Reconciliation of one weigh session: statics + weighted nonlinear least squares.
//
// Model (frames and symbols as in core/model.h; statics per any text, e.g. Meriam & Kraige,
// Engineering Mechanics: Statics, ch. 3). WB wheelbase (fixed), o rear axle to ball,
// L ball to trailer axle, T slack tongue load, M_i bar moment of tensioned pass i:
//   unhitched:   steer = S0,                 drive = D0
//   hitched:     steer = S0 - T·o/WB,        drive = D0 + T(WB+o)/WB,   trailer = A0
//   tensioned i: Fv = T - M_i/L;  steer = S0 + (M_i - Fv·o)/WB;  drive = D0 + Fv - (steer - S0);
//                trailer = A0 + M_i/L
// Unknowns: S0, D0, A0, T, M_i, o, L. Measurements: every platform reading of every
// non-voided pass, plus o and L as entered (pseudo-measurements).
//
// Preconditions: the session passed format validation (positive wheelbase, lengths, division;
// unique tickets). Throws sp::Error(data_error) naming the field if one is violated anyway.
// Pure: no I/O, no globals; deterministic for identical input.
#pragma once
#include "core/model.h"
#include "engine/result.h"

namespace sp {

struct ReconcileOptions {
  // Significance level of the global chi-square test and (Šidák-adjusted) of the measurement
  // test. 0.05 is the customary level in data reconciliation (Narasimhan & Jordache 2000, ch. 7).
  double alpha = 0.05;
  // Default standard uncertainty of a tape-measured length, in inches (common practice: a
  // tape read to the nearest half inch on a rig that sits on its tyres).
  double tape_u_inches = 0.5;
  // Points below the FALR target that raise `under-restored` (issue #2: 10 points).
  double under_restored_points = 10.0;
  // Leave this one measurement out of the fit (ticket + platform, or field; `entered` is not
  // read): the `if_excluded` re-solve. nullopt: every measurement. A result solved with an
  // exclusion is itself never re-solved again, and its recommendation is provisional.
  std::optional<ExcludedMeasurement> exclude;
};

ReconcileResult reconcile(const Session& session, const ReconcileOptions& options = {});

}  // namespace sp
