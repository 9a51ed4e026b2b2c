// Derived quantities of a solved rig fit with their analytic gradients (engine-internal; used
// by reconcile.cpp, compliance.cpp, target.cpp). Each function returns the quantity's value
// at the solution x = fit.sol.x and its gradient g = dq/dx (x as in rig_fit.h:
// [S0, D0, A0, T, o, L, M_1 .. M_k]); RigFit::propagate turns the pair into an Estimate.
// Values use exactly the expressions of statics.h, so they are the same bits as before; the
// gradients replace numeric central differences (RigFit::derive, kept as the reference the
// tests compare them with) and are exact up to rounding. Formulas: engine/statics.h, by the
// chain rule through moment_for_falr where the moment is the FALR target's.
#pragma once
#include <Eigen/Dense>

#include "engine/rig_fit.h"

namespace sp {

struct Linearized {
  double value = 0;
  Eigen::VectorXd g;  // dq/dx, size of x
};

// Parameter x(i) times `factor` (e.g. a tow axle alone, a length, a bar moment for display).
Linearized parameter(const RigFit& fit, Eigen::Index i, double factor = 1.0);
// Trailer weight T + A0, and tongue percent 100·T/(T + A0).
Linearized trailer_weight(const RigFit& fit);
Linearized tongue_percent(const RigFit& fit);
// Platform load (0 steer, 1 drive, 2 trailer) with the bars at moment slot `slot` (-1: slack);
// platform 3: steer + drive (the tow vehicle), 4: steer + drive + trailer (the whole rig).
Linearized hitched_load(const RigFit& fit, int slot, int platform);
// Ball load T - M/L and FALR 100·M(L + o)/(L·T·o) at moment slot `slot` (>= 0).
Linearized ball_load_at(const RigFit& fit, int slot);
Linearized falr_at(const RigFit& fit, int slot);
// The bar moment that restores `falr` percent (moment_for_falr), times `factor`, and the
// loads at that moment: platform 0..2 as hitched_load, 3 the ball load.
Linearized target_moment(const RigFit& fit, double falr, double factor = 1.0);
Linearized target_load(const RigFit& fit, double falr, int platform);

}  // namespace sp
