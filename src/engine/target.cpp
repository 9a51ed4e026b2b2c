// Recommendation: the bar moment for the FALR target and the setting that reaches it.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "engine/derived.h"
#include "engine/reconcile_parts.h"

namespace sp {
namespace {

// SAE J2807 (from memory): 50 % when the vehicle maker gives no figure.
constexpr double kDefaultFalr = 50.0;

struct SettingPoint {
  size_t slot;
  double setting;
};

}  // namespace

void add_target(const RigFit& fit, ReconcileResult& out) {
  const Session& s = *fit.session;
  if (s.trailer.type != TrailerType::conventional) return;  // no WD bars on a fifth wheel
  const double mf = moment_factor(s.units.weight, s.units.length);
  TargetResult t;
  t.falr_from_rig = s.tow_vehicle.falr_target.has_value();
  t.falr = s.tow_vehicle.falr_target.value_or(kDefaultFalr);
  const double f = t.falr;
  t.bar_moment = estimate(fit, target_moment(fit, f, mf));
  if (!t.bar_moment) {
    out.unsolved.push_back(fmt::format("bar moment for {:g} % FALR: needs the tongue load; {}", f,
                                       fit.unhitched.empty()
                                           ? "weigh the tow vehicle alone (unhitched pass)"
                                           : "weigh the rig hitched with the bars slack"));
    t.note = "no target moment: the tongue load is not solved";
    out.target = std::move(t);
    return;
  }
  auto at_target = [&fit, f](int platform) { return estimate(fit, target_load(fit, f, platform)); };
  t.steer = at_target(0);
  t.drive = at_target(1);
  t.trailer = at_target(2);
  t.ball_load = at_target(3);

  // Setting fit: moment = a + b·setting over the tensioned passes with numeric settings,
  // generalised least squares with the moments' joint covariance from the rig fit.
  std::vector<SettingPoint> pts;
  for (size_t k = 0; k < fit.tensioned.size(); ++k) {
    const std::string& ticket = s.passes[static_cast<size_t>(fit.tensioned[k])].ticket;
    for (const auto& r : out.tensioned)
      if (r.ticket == ticket && r.setting_number) pts.push_back({k, *r.setting_number});
  }
  double smin = 0, smax = 0;
  if (!pts.empty()) {
    smin = smax = pts.front().setting;
    for (const auto& p : pts) smin = std::min(smin, p.setting), smax = std::max(smax, p.setting);
  }
  if (pts.size() < 2 || smax == smin) {
    t.note = "no setting: needs tensioned passes at two or more different numeric settings";
    out.target = std::move(t);
    return;
  }
  const Eigen::Index n = static_cast<Eigen::Index>(pts.size());
  Eigen::MatrixXd X(n, 2), C(n, n);
  for (Eigen::Index i = 0; i < n; ++i) {
    X(i, 0) = 1;
    X(i, 1) = pts[static_cast<size_t>(i)].setting;
    for (Eigen::Index j = 0; j < n; ++j)
      C(i, j) = fit.sol.cov(xM0 + static_cast<Eigen::Index>(pts[static_cast<size_t>(i)].slot),
                            xM0 + static_cast<Eigen::Index>(pts[static_cast<size_t>(j)].slot));
  }
  Eigen::LDLT<Eigen::MatrixXd> ldlt(C);
  Eigen::MatrixXd Ci;
  if (ldlt.info() == Eigen::Success && ldlt.isPositive() && ldlt.vectorD().minCoeff() > 0)
    Ci = ldlt.solve(Eigen::MatrixXd::Identity(n, n));
  else
    Ci = C.diagonal().cwiseMax(1e-300).cwiseInverse().asDiagonal();
  const Eigen::MatrixXd G = (X.transpose() * Ci * X).ldlt().solve(X.transpose() * Ci);  // 2 x n
  auto moments = [&pts, n](const Eigen::VectorXd& x) {
    Eigen::VectorXd m(n);
    for (Eigen::Index i = 0; i < n; ++i) m(i) = RigFit::moment(x, pts[static_cast<size_t>(i)].slot);
    return m;
  };
  const Eigen::Vector2d ab = G * moments(fit.sol.x);
  const Eigen::Matrix2d cov_ab = G * C * G.transpose();
  if (std::fabs(ab(1)) <= 2 * std::sqrt(std::max(0.0, cov_ab(1, 1)))) {
    t.note = "no setting: the bar moment does not change measurably with the setting";
    out.target = std::move(t);
    return;
  }
  // setting = (M*(x) - c0)/c1 with (c0, c1) = G·moments(x), linear in the moments.
  const Eigen::Vector2d c = G * moments(fit.sol.x);
  const Linearized m_target = target_moment(fit, f);
  Linearized q{(m_target.value - c(0)) / c(1), m_target.g / c(1)};
  const double rest = (m_target.value - c(0)) / (c(1) * c(1));
  for (Eigen::Index i = 0; i < n; ++i) {
    const Eigen::Index m = xM0 + static_cast<Eigen::Index>(pts[static_cast<size_t>(i)].slot);
    q.g(m) += -G(0, i) / c(1) - rest * G(1, i);
  }
  auto setting = estimate(fit, q);
  if (!setting) {
    t.note = "no setting: not determined by these passes";
    out.target = std::move(t);
    return;
  }
  // Points off the line beyond their uncertainty: widen u by the Birge ratio (common practice).
  if (n > 2) {
    const Eigen::VectorXd res = moments(fit.sol.x) - X * ab;
    const double chi = res.dot(Ci * res) / static_cast<double>(n - 2);
    if (chi > 1) setting->u *= std::sqrt(chi);
  }
  t.setting = setting;
  // Whole-step hitches (every numeric setting weighed is a whole number: links, holes): name
  // the whole settings either side. A fit within 2u of a whole step lands on it (k = 2, as
  // every decision here); otherwise the nearer one is tried first (the lower on a tie: less
  // tension is the side an under-restored rig is flagged on, never over-restored).
  const bool whole = std::all_of(pts.begin(), pts.end(), [](const SettingPoint& p) {
    return std::floor(p.setting) == p.setting;
  });
  if (whole) {
    WholeStepSetting w;
    const double nearest = std::round(setting->value);
    if (std::fabs(setting->value - nearest) <= 2 * setting->u) {
      w.lower = w.upper = w.try_first = nearest;
    } else {
      w.lower = std::floor(setting->value);
      w.upper = w.lower + 1;
      w.try_first = setting->value - w.lower <= 0.5 ? w.lower : w.upper;
    }
    t.whole_step = w;
  }
  if (setting->value < smin || setting->value > smax)
    t.note = fmt::format(
        "setting {:.2f} is outside the weighed settings {:g} to {:g} "
        "(extrapolated); weigh it to confirm",
        setting->value, smin, smax);
  out.target = std::move(t);
}

}  // namespace sp
