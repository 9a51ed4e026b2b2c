// Test-only helpers for the engine tests: invented rigs, sessions made from them through an
// independent copy of the statics (written out again here on purpose, not via engine/statics.h),
// and a plain reference solver (dense normal equations, numeric-difference Jacobian) to
// cross-check the engine's Gauss-Newton/SVD solver.
#pragma once
#include <Eigen/Dense>
#include <cmath>
#include <string>
#include <vector>

#include "core/model.h"

namespace sp::test {

struct Rig {
  const char* name;
  WeightUnit wu;
  LengthUnit lu;
  TrailerType type;
  double S0, D0, A0, T, o, L, WB;  // session units
  std::vector<double> M;           // bar moments, weight·length (session units)
  double division;
};

// Independent statics (Meriam & Kraige, Statics ch. 3: sum of forces and moments).
// Returns {steer, drive, trailer} with the bars at M (M = 0: hitched, bars slack).
inline std::array<double, 3> ref_hitched(double S0, double D0, double A0, double T, double o,
                                         double L, double WB, double M) {
  const double ball = T - M / L;  // vertical force at the ball
  // Moments about the drive axle on the tow vehicle: steer·WB = S0·WB - ball·o + M.
  const double steer = S0 + (M - ball * o) / WB;
  const double total = S0 + D0 + ball;  // vertical balance on the tow vehicle
  return {steer, total - steer, A0 + M / L};
}

// The short-trailer rig used by several tests (invented): lb and inches, two settings.
inline Rig short_trailer_rig() {
  // clang-format off
  return {"short trailer, lb/in, 2 settings", WeightUnit::lb, LengthUnit::in,
          TrailerType::conventional, 4180, 3620, 5400, 720, 48, 130, 140, {8000, 14000}, 20};
  // clang-format on
}

inline double round_to(double v, double d) {
  return std::round(v / d) * d;
}

// A complete session: unhitched, hitched, one tensioned pass per M (settings "1", "2", ...).
inline Session make_session(const Rig& r, bool with_unhitched = true, bool with_hitched = true) {
  Session s;
  s.units = {r.wu, r.lu};
  s.scale.id = "ST-9";
  s.scale.division = r.division;
  s.scale.accuracy_class = "IIIL";
  s.tow_vehicle.label = "invented pickup";
  s.tow_vehicle.wheelbase = r.WB;
  s.tow_vehicle.rear_axle_to_ball = r.o;
  s.trailer.label = "invented camper";
  s.trailer.type = r.type;
  s.trailer.ball_to_axle = r.L;
  const double d = r.division;
  int n = 1;
  auto ticket = [&n] { return "Q-" + std::to_string(100 + n++); };
  if (with_unhitched) {
    Pass p;
    p.kind = PassKind::unhitched;
    p.ticket = ticket();
    p.steer = round_to(r.S0, d);
    p.drive = round_to(r.D0, d);
    s.passes.push_back(p);
  }
  auto coupled = [&](PassKind k, double M, int setting) {
    const auto a = ref_hitched(r.S0, r.D0, r.A0, r.T, r.o, r.L, r.WB, M);
    Pass p;
    p.kind = k;
    p.ticket = ticket();
    if (k == PassKind::tensioned) p.setting = std::to_string(setting);
    p.steer = round_to(a[0], d);
    p.drive = round_to(a[1], d);
    p.trailer = round_to(a[2], d);
    s.passes.push_back(p);
  };
  if (with_hitched) coupled(PassKind::hitched, 0, 0);
  for (size_t i = 0; i < r.M.size(); ++i)
    coupled(PassKind::tensioned, r.M[i], static_cast<int>(i + 1));
  return s;
}

// Reference WLS: same parameterisation as the engine ([S0, D0, A0, T, o, L, M...]), every
// non-voided reading with sigma = scale.reading_uncertainty (must be set), o and L with
// sigma_len. Dense normal equations, forward-difference Jacobian; full-rank problems only.
struct RefSolution {
  Eigen::VectorXd x;
  Eigen::MatrixXd cov;
};

inline RefSolution ref_solve(const Session& s, double sigma_len) {
  std::vector<int> tens;
  for (size_t i = 0; i < s.passes.size(); ++i)
    if (s.passes[i].kind == PassKind::tensioned) tens.push_back(static_cast<int>(i));
  const int n = 6 + static_cast<int>(tens.size());
  std::vector<double> y, sig;
  for (const Pass& p : s.passes) {
    y.push_back(p.steer);
    y.push_back(p.drive);
    if (p.kind != PassKind::unhitched) y.push_back(*p.trailer);
  }
  for (size_t j = 0; j < y.size(); ++j) sig.push_back(*s.scale.reading_uncertainty);
  y.push_back(s.tow_vehicle.rear_axle_to_ball);
  y.push_back(s.trailer.ball_to_axle);
  sig.push_back(sigma_len);
  sig.push_back(sigma_len);
  const double WB = s.tow_vehicle.wheelbase;
  auto model = [&](const Eigen::VectorXd& x) {
    std::vector<double> f;
    int k = 0;
    for (const Pass& p : s.passes) {
      if (p.kind == PassKind::unhitched) {
        f.push_back(x(0));
        f.push_back(x(1));
        continue;
      }
      const double M = p.kind == PassKind::tensioned ? x(6 + k++) : 0.0;
      const auto a = ref_hitched(x(0), x(1), x(2), x(3), x(4), x(5), WB, M);
      f.insert(f.end(), a.begin(), a.end());
    }
    f.push_back(x(4));
    f.push_back(x(5));
    return Eigen::Map<Eigen::VectorXd>(f.data(), static_cast<Eigen::Index>(f.size())).eval();
  };
  const Eigen::Index m = static_cast<Eigen::Index>(y.size());
  const Eigen::VectorXd Y = Eigen::Map<Eigen::VectorXd>(y.data(), m);
  Eigen::VectorXd W(m);
  for (Eigen::Index j = 0; j < m; ++j)
    W(j) = 1 / (sig[static_cast<size_t>(j)] * sig[static_cast<size_t>(j)]);
  Eigen::VectorXd x = Eigen::VectorXd::Zero(n);
  x(0) = s.passes[0].steer;
  x(1) = s.passes[0].drive;
  x(2) = s.passes[1].trailer.value_or(0);
  x(3) = 0;
  x(4) = s.tow_vehicle.rear_axle_to_ball;
  x(5) = s.trailer.ball_to_axle;
  Eigen::MatrixXd J(m, n), N(n, n);
  for (int it = 0; it < 60; ++it) {
    const Eigen::VectorXd f = model(x);
    for (int k = 0; k < n; ++k) {
      Eigen::VectorXd xp = x;
      const double h = 1e-6 * std::max(1.0, std::fabs(x(k)));
      xp(k) += h;
      J.col(k) = (model(xp) - f) / h;
    }
    N = J.transpose() * W.asDiagonal() * J;
    x += N.ldlt().solve(J.transpose() * W.asDiagonal() * (Y - f));
  }
  return {x, N.inverse()};
}

}  // namespace sp::test
