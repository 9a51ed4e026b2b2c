#include "engine/derived.h"

#include "engine/statics.h"

namespace sp {

namespace {

Eigen::Index slot_index(int slot) { return xM0 + static_cast<Eigen::Index>(slot); }

Linearized zero(const RigFit& fit, double value) {
  return {value, Eigen::VectorXd::Zero(fit.sol.x.size())};
}

// Adds row `row` of a LoadJacobian (d load / d(S0, D0, A0, T, M, o, L)) times `w` to g; the M
// column goes to `m_index` (none when < 0, the bars slack).
void add_load_row(const LoadJacobian& j, int row, double w, Eigen::Index m_index,
                  Eigen::VectorXd& g) {
  const auto& r = j[static_cast<size_t>(row)];
  g(xS0) += w * r[kS0];
  g(xD0) += w * r[kD0];
  g(xA0) += w * r[kA0];
  g(xT) += w * r[kT];
  g(xO) += w * r[kO];
  g(xL) += w * r[kL];
  if (m_index >= 0) g(m_index) += w * r[kM];
}

// Which rows of the LoadJacobian make up `platform` (see hitched_load).
template <class F>
void for_rows(int platform, F&& f) {
  if (platform <= 2) {
    f(platform);
    return;
  }
  f(0);
  f(1);
  if (platform == 4) f(2);
}

double platform_value(const AxleLoads& a, int platform) {
  switch (platform) {
    case 0: return a.steer;
    case 1: return a.drive;
    case 2: return a.trailer;
    case 3: return a.steer + a.drive;
    default: return a.steer + a.drive + a.trailer;
  }
}

// d moment_for_falr / d(T, o, L) at p: M* = c·T·o·L/(L + o), c = falr/100.
struct MomentGradient {
  double dT, dO, dL;
};
MomentGradient target_moment_gradient(const RigParams& p, double falr) {
  const double c = falr / 100.0, s = p.L + p.o;
  return {c * p.o * p.L / s, c * p.T * p.L * p.L / (s * s), c * p.T * p.o * p.o / (s * s)};
}

}  // namespace

Linearized parameter(const RigFit& fit, Eigen::Index i, double factor) {
  const Eigen::VectorXd& x = fit.sol.x;
  Linearized q = zero(fit, factor == 1.0 ? x(i) : factor * x(i));
  q.g(i) = factor;
  return q;
}

Linearized trailer_weight(const RigFit& fit) {
  const Eigen::VectorXd& x = fit.sol.x;
  Linearized q = zero(fit, x(xT) + x(xA0));
  q.g(xT) = 1;
  q.g(xA0) = 1;
  return q;
}

Linearized tongue_percent(const RigFit& fit) {
  const Eigen::VectorXd& x = fit.sol.x;
  const double T = x(xT), A0 = x(xA0), w = T + A0;
  Linearized q = zero(fit, 100.0 * T / w);
  q.g(xT) = 100.0 * A0 / (w * w);
  q.g(xA0) = -100.0 * T / (w * w);
  return q;
}

Linearized hitched_load(const RigFit& fit, int slot, int platform) {
  const Eigen::VectorXd& x = fit.sol.x;
  const RigParams p = fit.params(x);
  const double M = slot >= 0 ? RigFit::moment(x, static_cast<size_t>(slot)) : 0.0;
  Linearized q = zero(fit, platform_value(predict_hitched(p, M), platform));
  const LoadJacobian j = jacobian_hitched(p, M);
  const Eigen::Index m = slot >= 0 ? slot_index(slot) : -1;
  for_rows(platform, [&](int row) { add_load_row(j, row, 1.0, m, q.g); });
  return q;
}

Linearized ball_load_at(const RigFit& fit, int slot) {
  const Eigen::VectorXd& x = fit.sol.x;
  const RigParams p = fit.params(x);
  const double M = RigFit::moment(x, static_cast<size_t>(slot));
  Linearized q = zero(fit, ball_load(p, M));
  q.g(xT) = 1;
  q.g(slot_index(slot)) = -1 / p.L;
  q.g(xL) = M / (p.L * p.L);
  return q;
}

Linearized falr_at(const RigFit& fit, int slot) {
  const Eigen::VectorXd& x = fit.sol.x;
  const RigParams p = fit.params(x);
  const double M = RigFit::moment(x, static_cast<size_t>(slot));
  // F = (100·M/T)·(1/o + 1/L).
  Linearized q = zero(fit, falr_percent(p, M));
  const double k = 100.0 * M / p.T, sum = 1 / p.o + 1 / p.L;
  q.g(slot_index(slot)) = 100.0 / p.T * sum;
  q.g(xT) = -k / p.T * sum;
  q.g(xO) = -k / (p.o * p.o);
  q.g(xL) = -k / (p.L * p.L);
  return q;
}

Linearized target_moment(const RigFit& fit, double falr, double factor) {
  const RigParams p = fit.params(fit.sol.x);
  Linearized q = zero(fit, factor * moment_for_falr(p, falr));
  const MomentGradient d = target_moment_gradient(p, falr);
  q.g(xT) = factor * d.dT;
  q.g(xO) = factor * d.dO;
  q.g(xL) = factor * d.dL;
  return q;
}

Linearized target_load(const RigFit& fit, double falr, int platform) {
  const RigParams p = fit.params(fit.sol.x);
  const double M = moment_for_falr(p, falr);
  const MomentGradient d = target_moment_gradient(p, falr);
  if (platform == 3) {
    // Ball load T - M/L, with M = M*(T, o, L).
    Linearized q = zero(fit, ball_load(p, M));
    q.g(xT) = 1 - d.dT / p.L;
    q.g(xO) = -d.dO / p.L;
    q.g(xL) = M / (p.L * p.L) - d.dL / p.L;
    return q;
  }
  Linearized q = zero(fit, platform_value(predict_hitched(p, M), platform));
  const LoadJacobian j = jacobian_hitched(p, M);
  for_rows(platform, [&](int row) {
    add_load_row(j, row, 1.0, -1, q.g);
    const double dm = j[static_cast<size_t>(row)][kM];  // through M = M*(T, o, L)
    q.g(xT) += dm * d.dT;
    q.g(xO) += dm * d.dO;
    q.g(xL) += dm * d.dL;
  });
  return q;
}

}  // namespace sp
