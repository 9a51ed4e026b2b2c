// The forward statics model against the worked example of issue #2 (common practice, no
// source): trailer 8300 lb, tongue 996 lb (12 %), ball to axle 14 ft, WB ~ 145 in, o ~ 54 in.
#include <doctest/doctest.h>

#include <cmath>
#include <cstddef>

#include "engine/statics.h"

using namespace sp;

namespace {
// lb and inches; 1 lbf·ft = 12 lb·in.
RigParams example(double L_ft) {
  return {4000, 3000, 8300 - 996, 996, 54, 12 * L_ft, 145};
}
}  // namespace

TEST_CASE("worked example: ball load and trailer-axle gain for a 7000 lbf·ft bar moment") {
  // Worked example (common practice, no source).
  struct Row {
    double L_ft;
    double ball;
    double to_axles;
  };
  const Row rows[] = {{14, 496, 500}, {28, 746, 250}, {7, -4, 1000}};  // 7 ft: "about none"
  for (const Row& r : rows) {
    CAPTURE(r.L_ft);
    const RigParams p = example(r.L_ft);
    const double M = 7000 * 12;
    CHECK(ball_load(p, M) == doctest::Approx(r.ball).epsilon(1e-3));
    CHECK(predict_hitched(p, M).trailer - predict_hitched(p, 0).trailer ==
          doctest::Approx(r.to_axles).epsilon(1e-3));
  }
}

TEST_CASE("worked example: axle changes from unhitched") {
  // Worked example (common practice, no source): hitched no bars steer -371, drive +1367;
  // 7000 lbf·ft: steer +395, drive +101; 50 % FALR: steer -186, M ~ 1696 lbf·ft, 121 lb to the
  // trailer axles, drive +1060.
  const RigParams p = example(14);
  const AxleLoads u = predict_unhitched(p);
  const AxleLoads h = predict_hitched(p, 0);
  const AxleLoads t = predict_hitched(p, 7000 * 12);
  const double Mf = moment_for_falr(p, 50);
  const AxleLoads f = predict_hitched(p, Mf);
  struct Row {
    const char* what;
    double got;
    double want;
    double tol;
  };
  const Row rows[] = {
      {"hitched steer change", h.steer - u.steer, -371, 1},
      {"hitched drive change", h.drive - u.drive, 1367, 1},
      {"7000 steer change", t.steer - u.steer, 395, 1},
      {"7000 drive change", t.drive - u.drive, 101, 1},
      {"50 % steer change", f.steer - u.steer, -186, 1},
      {"50 % moment lbf·ft", Mf / 12, 1696, 1},
      {"50 % to trailer axles", f.trailer - h.trailer, 121, 1},
      {"50 % drive change", f.drive - u.drive, 1060, 1},
      {"50 % falr back", falr_percent(p, Mf), 50, 1e-9},
  };
  for (const Row& r : rows) {
    CAPTURE(r.what);
    CHECK(std::abs(r.got - r.want) <= r.tol);
  }
  // Total is conserved in every configuration (sum of vertical forces).
  CHECK(t.steer + t.drive + t.trailer == doctest::Approx(u.steer + u.drive + 8300));
}

TEST_CASE("analytic Jacobian matches central differences") {
  // Reference: numeric differentiation (common practice).
  const RigParams p0 = {4100, 3700, 7300, 1000, 50, 180, 150};
  const double M0 = 60000;
  const LoadJacobian J = jacobian_hitched(p0, M0);
  for (int k = 0; k < kRigParamCount; ++k) {
    CAPTURE(k);
    auto eval = [&](double h) {
      RigParams p = p0;
      double M = M0;
      double* fields[] = {&p.S0, &p.D0, &p.A0, &p.T, &M, &p.o, &p.L};
      *fields[k] += h;
      return predict_hitched(p, M);
    };
    const double h = 1e-3;
    const AxleLoads a = eval(h), b = eval(-h);
    CHECK(J[0][static_cast<size_t>(k)] ==
          doctest::Approx((a.steer - b.steer) / (2 * h)).epsilon(1e-6));
    CHECK(J[1][static_cast<size_t>(k)] ==
          doctest::Approx((a.drive - b.drive) / (2 * h)).epsilon(1e-6));
    CHECK(J[2][static_cast<size_t>(k)] ==
          doctest::Approx((a.trailer - b.trailer) / (2 * h)).epsilon(1e-6));
  }
}
