// Forward statics model of a tow vehicle + trailer on a three-platform scale.
//
// Symbols and frames as in core/model.h; statics per any text (e.g. Meriam & Kraige,
// Engineering Mechanics: Statics, ch. 3), formulas in /work/shared/notes/references.md.
// All quantities in one consistent unit system: weights in W (lb or kg), lengths in Ln
// (in, ft, mm, cm, m), bar moments in W·Ln (e.g. lb·in) -- convert to lbf·ft / N·m with
// core/units.h moment_factor() only for display.
//   S0, D0  tow vehicle steer and drive axle loads alone (unhitched)
//   A0      trailer axle load, hitched with the bars slack
//   T       slack tongue load (at the ball / king pin)
//   o       drive axle to ball, positive behind the axle (negative: fifth wheel ahead of it)
//   L       ball to the trailer's effective axle, > 0
//   WB      wheelbase, > 0
//   M       bar moment of a tensioned pass (0 = bars slack)
// Predicted platform loads:
//   unhitched:  steer = S0, drive = D0, trailer = 0
//   bars at M:  Fv = T - M/L; steer = S0 + (M - Fv·o)/WB; drive = D0 + Fv - (steer - S0);
//               trailer = A0 + M/L                (M = 0 is the hitched pass)
// Pure functions; no checks beyond what is stated (callers validate WB > 0, L > 0).
#pragma once
#include <array>

namespace sp {

struct RigParams {
  double S0 = 0, D0 = 0, A0 = 0, T = 0, o = 0, L = 0, WB = 0;
};

struct AxleLoads {
  double steer = 0, drive = 0, trailer = 0;
};

// Order of the parameters in LoadJacobian rows.
enum RigParam : int { kS0 = 0, kD0, kA0, kT, kM, kO, kL, kRigParamCount };

// d(steer, drive, trailer) / d(S0, D0, A0, T, M, o, L).
using LoadJacobian = std::array<std::array<double, kRigParamCount>, 3>;

AxleLoads predict_unhitched(const RigParams& p);
// Hitched with the bars at moment M (M = 0: hitched, bars slack).
AxleLoads predict_hitched(const RigParams& p, double M = 0);
LoadJacobian jacobian_unhitched();
LoadJacobian jacobian_hitched(const RigParams& p, double M = 0);

// Ball (king pin) load with the bars at M: T - M/L.
double ball_load(const RigParams& p, double M);
// Front axle load restoration in percent (SAE J2807 definition, from memory):
// (steer_M - steer_hitched) / (steer_unhitched - steer_hitched) x 100 = 100·M(L+o)/(L·T·o).
// Precondition: T·o != 0.
double falr_percent(const RigParams& p, double M);
// Bar moment that restores `falr` percent: M = f·T·o·L/(L + o), f = falr/100.
double moment_for_falr(const RigParams& p, double falr);

}  // namespace sp
