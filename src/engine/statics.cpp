#include "engine/statics.h"

namespace sp {

AxleLoads predict_unhitched(const RigParams& p) {
  return {p.S0, p.D0, 0.0};
}

AxleLoads predict_hitched(const RigParams& p, double M) {
  const double fv = p.T - M / p.L;
  const double ds = (M - fv * p.o) / p.WB;  // steer change from unhitched
  return {p.S0 + ds, p.D0 + fv - ds, p.A0 + M / p.L};
}

LoadJacobian jacobian_unhitched() {
  LoadJacobian j{};
  j[0][kS0] = 1;
  j[1][kD0] = 1;
  return j;
}

LoadJacobian jacobian_hitched(const RigParams& p, double M) {
  // steer   = S0 - T·o/WB + M/WB + M·o/(L·WB)
  // drive   = D0 + T + T·o/WB - M/L - M/WB - M·o/(L·WB)
  // trailer = A0 + M/L
  const double WB = p.WB, L = p.L, o = p.o, T = p.T;
  LoadJacobian j{};
  j[0][kS0] = 1;
  j[0][kT] = -o / WB;
  j[0][kM] = (L + o) / (L * WB);
  j[0][kO] = -T / WB + M / (L * WB);
  j[0][kL] = -M * o / (L * L * WB);
  j[1][kD0] = 1;
  j[1][kT] = 1 + o / WB;
  j[1][kM] = -1 / L - (L + o) / (L * WB);
  j[1][kO] = T / WB - M / (L * WB);
  j[1][kL] = M / (L * L) + M * o / (L * L * WB);
  j[2][kA0] = 1;
  j[2][kM] = 1 / L;
  j[2][kL] = -M / (L * L);
  return j;
}

double ball_load(const RigParams& p, double M) {
  return p.T - M / p.L;
}

double falr_percent(const RigParams& p, double M) {
  return 100.0 * M * (p.L + p.o) / (p.L * p.T * p.o);
}

double moment_for_falr(const RigParams& p, double falr) {
  return falr / 100.0 * p.T * p.o * p.L / (p.L + p.o);
}

}  // namespace sp
