// The analytic gradients of the derived quantities (engine/derived.h) against the numeric
// reference: central differences of the same quantity through the statics (engine/statics.h),
// with the step RigFit::derive has always used, and RigFit::derive's own Estimate. Standard
// numerical-differentiation error bounds (from memory: truncation ~h^2, rounding ~eps/h) put
// the two within ~1e-7 of each other in the parameters' scaled units.
#include <doctest/doctest.h>

#include <cmath>
#include <functional>
#include <string>
#include <vector>

#include "engine/derived.h"
#include "engine/rig_fit.h"
#include "engine/statics.h"
#include "engine_reference.h"

using namespace sp;

namespace {

const test::Rig kRigs[] = {
    // clang-format off
    test::short_trailer_rig(),
    {"long trailer, lb/in, 4 settings", WeightUnit::lb, LengthUnit::in, TrailerType::conventional,
     4600, 4100, 9800, 1300, 54, 260, 160, {15000, 25000, 35000, 45000}, 20},
    {"kg/mm, 2 settings", WeightUnit::kg, LengthUnit::mm, TrailerType::conventional,
     1900, 1650, 3300, 430, 1300, 4600, 3600, {150000, 250000}, 10},
    {"lb/ft, 1 setting", WeightUnit::lb, LengthUnit::ft, TrailerType::conventional,
     3900, 3300, 6200, 800, 4.5, 15, 12, {1200}, 20},
    {"fifth wheel, lb/in", WeightUnit::lb, LengthUnit::in, TrailerType::fifth_wheel,
     4800, 4300, 11000, 2600, -4, 230, 158, {}, 20},
    // clang-format on
};

using Fn = std::function<double(const Eigen::VectorXd&)>;

// Reference: central differences, step 1e-4 of each parameter's scale (as RigFit::derive).
Eigen::VectorXd numeric_gradient(const RigFit& fit, const Fn& f) {
  const Eigen::VectorXd& x0 = fit.sol.x;
  Eigen::VectorXd g(x0.size()), x = x0;
  for (Eigen::Index k = 0; k < x0.size(); ++k) {
    const double h = 1e-4 * fit.sol.col_scale(k);
    x(k) = x0(k) + h;
    const double fp = f(x);
    x(k) = x0(k) - h;
    const double fm = f(x);
    x(k) = x0(k);
    g(k) = (fp - fm) / (2 * h);
  }
  return g;
}

double platform_of(const AxleLoads& a, int platform) {
  return platform == 0   ? a.steer
         : platform == 1 ? a.drive
         : platform == 2 ? a.trailer
         : platform == 3 ? a.steer + a.drive
                         : a.steer + a.drive + a.trailer;
}

struct Case {
  std::string name;
  Linearized analytic;
  Fn f;
};

void check_case(const RigFit& fit, const Case& c) {
  CAPTURE(c.name);
  CHECK(c.analytic.value == doctest::Approx(c.f(fit.sol.x)).epsilon(1e-12));
  const Eigen::VectorXd num = numeric_gradient(fit, c.f);
  REQUIRE(num.size() == c.analytic.g.size());
  // Compare in scaled units (df per parameter scale), relative to the largest component.
  const Eigen::VectorXd a = fit.sol.col_scale.cwiseProduct(c.analytic.g);
  const Eigen::VectorXd n = fit.sol.col_scale.cwiseProduct(num);
  const double scale = std::max(a.cwiseAbs().maxCoeff(), 1e-300);
  for (Eigen::Index k = 0; k < a.size(); ++k) {
    CAPTURE(k);
    CHECK(std::fabs(a(k) - n(k)) <= 1e-7 * scale);
  }
  // The Estimate: the numeric path (RigFit::derive) and the analytic one agree.
  const auto ea = fit.propagate(c.analytic.value, c.analytic.g);
  const auto en = fit.derive(c.f);
  REQUIRE(ea.has_value() == en.has_value());
  if (ea) {
    CHECK(ea->value == en->value);
    CHECK(ea->u == doctest::Approx(en->u).epsilon(1e-7));
  }
}

}  // namespace

TEST_CASE("analytic gradients of derived quantities match central differences") {
  for (const test::Rig& rig : kRigs) {
    CAPTURE(rig.name);
    const Session s = test::make_session(rig);
    const RigFit fit = fit_rig(s, ReconcileOptions{});
    const double falr = 50;  // SAE J2807's default (from memory), as target.cpp uses
    std::vector<Case> cases;
    for (Eigen::Index i = 0; i < fit.sol.x.size(); ++i)
      cases.push_back({"x(" + std::to_string(i) + ") x 1.5", parameter(fit, i, 1.5),
                       [i](const Eigen::VectorXd& x) { return 1.5 * x(i); }});
    cases.push_back({"trailer weight", trailer_weight(fit),
                     [](const Eigen::VectorXd& x) { return x(xT) + x(xA0); }});
    cases.push_back({"tongue percent", tongue_percent(fit), [](const Eigen::VectorXd& x) {
                       return 100.0 * x(xT) / (x(xT) + x(xA0));
                     }});
    for (int slot = -1; slot < static_cast<int>(fit.tensioned.size()); ++slot) {
      for (int platform = 0; platform <= 4; ++platform) {
        cases.push_back({"load " + std::to_string(platform) + " at slot " + std::to_string(slot),
                         hitched_load(fit, slot, platform),
                         [&fit, slot, platform](const Eigen::VectorXd& x) {
                           const double M =
                               slot >= 0 ? RigFit::moment(x, static_cast<size_t>(slot)) : 0.0;
                           return platform_of(predict_hitched(fit.params(x), M), platform);
                         }});
      }
      if (slot < 0) continue;
      cases.push_back({"ball load at slot " + std::to_string(slot), ball_load_at(fit, slot),
                       [&fit, slot](const Eigen::VectorXd& x) {
                         return ball_load(fit.params(x),
                                          RigFit::moment(x, static_cast<size_t>(slot)));
                       }});
      cases.push_back({"FALR at slot " + std::to_string(slot), falr_at(fit, slot),
                       [&fit, slot](const Eigen::VectorXd& x) {
                         return falr_percent(fit.params(x),
                                             RigFit::moment(x, static_cast<size_t>(slot)));
                       }});
    }
    if (s.trailer.type == TrailerType::conventional) {
      cases.push_back({"target moment x 2", target_moment(fit, falr, 2.0),
                       [&fit, falr](const Eigen::VectorXd& x) {
                         return 2.0 * moment_for_falr(fit.params(x), falr);
                       }});
      for (int platform = 0; platform <= 3; ++platform) {
        cases.push_back({"target load " + std::to_string(platform),
                         target_load(fit, falr, platform),
                         [&fit, falr, platform](const Eigen::VectorXd& x) {
                           const RigParams p = fit.params(x);
                           const double M = moment_for_falr(p, falr);
                           if (platform == 3) return ball_load(p, M);
                           return platform_of(predict_hitched(p, M), platform);
                         }});
      }
    }
    for (const Case& c : cases) check_case(fit, c);
  }
}

TEST_CASE("an undetermined quantity stays undetermined with analytic gradients") {
  // No unhitched pass: the tow vehicle alone (S0, D0) and the tongue load are not determined.
  const Session s = test::make_session(test::short_trailer_rig(), /*with_unhitched=*/false);
  const RigFit fit = fit_rig(s, ReconcileOptions{});
  CHECK_FALSE(fit.propagate(parameter(fit, xS0).value, parameter(fit, xS0).g).has_value());
  CHECK_FALSE(fit.derive([](const Eigen::VectorXd& x) { return x(xS0); }).has_value());
  const Linearized t = parameter(fit, xT);
  CHECK(fit.propagate(t.value, t.g).has_value() ==
        fit.derive([](const Eigen::VectorXd& x) { return x(xT); }).has_value());
  // The trailer axles' load at the hitched pass is measured directly: determined either way.
  const Linearized a = hitched_load(fit, -1, 2);
  CHECK(fit.propagate(a.value, a.g).has_value());
}
