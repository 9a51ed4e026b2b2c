#include "engine/rig_fit.h"

#include <fmt/format.h>

#include <cmath>

#include "core/error.h"
#include "engine/scale_tolerance.h"

namespace sp {
namespace {

bool finite(double v) {
  return std::isfinite(v);
}

void validate(const Session& s) {
  const auto& tv = s.tow_vehicle;
  if (!finite(tv.wheelbase) || tv.wheelbase <= 0)
    throw data_error(
        fmt::format("tow_vehicle.wheelbase: expected a length > 0, got {:g}", tv.wheelbase));
  if (!finite(s.scale.division) || s.scale.division <= 0)
    throw data_error(
        fmt::format("scale.division: expected a weight > 0, got {:g}", s.scale.division));
  if (!parse_scale_class(s.scale.accuracy_class))
    throw data_error("scale.accuracy_class: expected \"IIIL\", \"III\" or \"OIML-III\", got \"" +
                     s.scale.accuracy_class + "\"");
  if (s.scale.reading_uncertainty &&
      (!finite(*s.scale.reading_uncertainty) || *s.scale.reading_uncertainty <= 0))
    throw data_error(fmt::format("scale.reading_uncertainty: expected a weight > 0, got {:g}",
                                 *s.scale.reading_uncertainty));
  if (s.length_uncertainty && (!finite(*s.length_uncertainty) || *s.length_uncertainty <= 0))
    throw data_error(
        fmt::format("length_uncertainty: expected a length > 0, got {:g}", *s.length_uncertainty));
  if (!finite(s.trailer.ball_to_axle) || s.trailer.ball_to_axle <= 0)
    throw data_error(fmt::format("trailer.ball_to_axle: expected a length > 0, got {:g}",
                                 s.trailer.ball_to_axle));
  const double o = tv.rear_axle_to_ball;
  if (s.trailer.type == TrailerType::conventional && (!finite(o) || o <= 0))
    throw data_error(fmt::format(
        "tow_vehicle.rear_axle_to_ball: expected a length > 0 behind the drive axle for a "
        "conventional trailer, got {:g}",
        o));
  if (s.trailer.type == TrailerType::fifth_wheel && (!finite(o) || o > 0 || -o >= tv.wheelbase))
    throw data_error(fmt::format(
        "tow_vehicle.rear_axle_to_ball: expected a length <= 0 (coupling ahead of the drive "
        "axle, behind the steer axle) for a fifth-wheel trailer, got {:g}",
        o));
  if (tv.falr_target && (!finite(*tv.falr_target) || *tv.falr_target <= 0 || *tv.falr_target > 100))
    throw data_error(fmt::format(
        "tow_vehicle.falr_target: expected a percent in (0, 100], got {:g}", *tv.falr_target));
  for (size_t i = 0; i < s.passes.size(); ++i) {
    const Pass& p = s.passes[i];
    const std::string where = fmt::format("passes[{}] (ticket {})", i, p.ticket);
    auto check = [&](const char* name, double v) {
      if (!finite(v) || v < 0)
        throw data_error(fmt::format("{}.{}: expected a weight >= 0, got {:g}", where, name, v));
    };
    check("steer", p.steer);
    check("drive", p.drive);
    if (p.trailer) check("trailer", *p.trailer);
    if (p.gross) check("gross", *p.gross);
    if (!p.voided && p.kind == PassKind::tensioned && s.trailer.type == TrailerType::fifth_wheel)
      throw data_error(where +
                       ".kind: a tensioned (weight-distributing) pass needs a "
                       "conventional trailer; this one is fifth-wheel");
  }
}

}  // namespace

RigParams RigFit::params(const Eigen::VectorXd& x) const {
  return {x(xS0), x(xD0), x(xA0), x(xT), x(xO), x(xL), wheelbase};
}

std::optional<Estimate> RigFit::derive(
    const std::function<double(const Eigen::VectorXd&)>& f) const {
  const Eigen::Index n = sol.x.size();
  const double v = f(sol.x);
  if (!std::isfinite(v)) return std::nullopt;
  Eigen::VectorXd g(n);
  Eigen::VectorXd xk = sol.x;  // moved one coordinate at a time, then put back
  for (Eigen::Index k = 0; k < n; ++k) {
    // Step: 1e-4 of the parameter's scale (1/|weighted column|, about its standard
    // uncertainty): small against curvature, large against rounding.
    const double h = 1e-4 * sol.col_scale(k);
    xk(k) = sol.x(k) + h;
    const double fp = f(xk);
    xk(k) = sol.x(k) - h;
    const double fm = f(xk);
    xk(k) = sol.x(k);
    if (!std::isfinite(fp) || !std::isfinite(fm)) return std::nullopt;
    g(k) = (fp - fm) / (2 * h);
  }
  return propagate(v, g);
}

std::optional<Estimate> RigFit::propagate(double value, const Eigen::VectorXd& g) const {
  if (!std::isfinite(value) || !g.allFinite()) return std::nullopt;
  // 1e-6: the tolerance derived quantities have always been tested with (the solver's
  // default in wls.h is 1e-7).
  if (!sol.estimable(g, 1e-6)) return std::nullopt;
  return Estimate{value, std::sqrt(sol.variance(g))};
}

RigFit fit_rig(const Session& s, const ReconcileOptions& opt) {
  validate(s);
  RigFit r;
  r.session = &s;
  r.wheelbase = s.tow_vehicle.wheelbase;
  for (size_t i = 0; i < s.passes.size(); ++i) {
    const Pass& p = s.passes[i];
    if (p.voided) continue;  // kept for the record, never in the fit
    const int idx = static_cast<int>(i);
    if (p.kind == PassKind::unhitched) r.unhitched.push_back(idx);
    if (p.kind == PassKind::hitched) r.hitched.push_back(idx);
    if (p.kind == PassKind::tensioned) r.tensioned.push_back(idx);
  }
  const ScaleClass cls = *parse_scale_class(s.scale.accuracy_class);
  const double d = s.scale.division;
  auto sigma_of = [&](double reading) {
    return s.scale.reading_uncertainty ? *s.scale.reading_uncertainty
                                       : default_reading_uncertainty(cls, reading, d);
  };
  std::vector<double> y, sig;
  std::vector<int> mslot;  // per measurement: moment slot (-1 none)
  // At most three readings a pass plus the two tape lengths: one allocation each.
  const size_t most = 3 * s.passes.size() + 2;
  r.meas.reserve(most);
  y.reserve(most);
  sig.reserve(most);
  mslot.reserve(most);
  for (size_t i = 0; i < s.passes.size(); ++i) {
    const Pass& p = s.passes[i];
    if (p.voided) continue;
    int slot = -1;
    if (p.kind == PassKind::tensioned)
      for (size_t k = 0; k < r.tensioned.size(); ++k)
        if (r.tensioned[k] == static_cast<int>(i)) slot = static_cast<int>(k);
    auto add = [&](const char* platform, double v) {
      if (opt.exclude && opt.exclude->ticket == p.ticket && opt.exclude->platform == platform)
        return;  // the if_excluded re-solve
      r.meas.push_back({static_cast<int>(i), platform, ""});
      y.push_back(v);
      sig.push_back(sigma_of(v));
      mslot.push_back(slot);
    };
    add("steer", p.steer);
    add("drive", p.drive);
    if (p.kind != PassKind::unhitched && p.trailer) add("trailer", *p.trailer);
  }
  const double tape_u = s.length_uncertainty
                            ? *s.length_uncertainty
                            : opt.tape_u_inches * length_factor(LengthUnit::in, s.units.length);
  for (const auto& [field, v] :
       {std::pair<const char*, double>{"rear_axle_to_ball", s.tow_vehicle.rear_axle_to_ball},
        {"ball_to_axle", s.trailer.ball_to_axle}}) {
    if (opt.exclude && opt.exclude->field == field) continue;  // the if_excluded re-solve
    r.meas.push_back({-1, "", field});
    y.push_back(v);
    sig.push_back(tape_u);
    mslot.push_back(-1);
  }

  const Eigen::Index m = static_cast<Eigen::Index>(y.size());
  const Eigen::Index n = xM0 + static_cast<Eigen::Index>(r.tensioned.size());
  r.problem.y = Eigen::Map<const Eigen::VectorXd>(y.data(), m);
  r.problem.sigma = Eigen::Map<const Eigen::VectorXd>(sig.data(), m);

  // Starting point from the readings (the model is only mildly nonlinear).
  Eigen::VectorXd x0 = Eigen::VectorXd::Zero(n);
  const double o = s.tow_vehicle.rear_axle_to_ball, L = s.trailer.ball_to_axle;
  x0(xO) = o;
  x0(xL) = L;
  const Pass* first = nullptr;
  for (int i : r.unhitched) {
    first = &s.passes[static_cast<size_t>(i)];
    break;
  }
  const Pass* hp = r.hitched.empty() ? nullptr : &s.passes[static_cast<size_t>(r.hitched.front())];
  const Pass* tp =
      r.tensioned.empty() ? nullptr : &s.passes[static_cast<size_t>(r.tensioned.front())];
  const Pass* any = first ? first : hp ? hp : tp;
  if (any) {
    x0(xS0) = any->steer;
    x0(xD0) = any->drive;
  }
  const Pass* coupled = hp ? hp : tp;
  if (coupled && coupled->trailer) x0(xA0) = *coupled->trailer;
  if (first && coupled)
    x0(xT) = coupled->steer + coupled->drive - first->steer - first->drive;
  else
    x0(xT) = 0.12 * x0(xA0);  // a typical tongue share (common practice) only as a start
  for (size_t k = 0; k < r.tensioned.size(); ++k) {
    const Pass& t = s.passes[static_cast<size_t>(r.tensioned[k])];
    if (hp && hp->trailer && t.trailer)
      x0(xM0 + static_cast<Eigen::Index>(k)) = (*t.trailer - *hp->trailer) * L;
  }
  r.problem.x0 = x0;

  // The model reads plain per-measurement codes: what it predicts (a platform of a pass kind,
  // or a tape length) and the moment slot, decided here once rather than per evaluation.
  struct Row {
    int what;      // 0 steer, 1 drive, 2 trailer, or -1 - parameter index (tape length)
    bool hitched;  // hitched or tensioned (else unhitched)
    int slot;      // moment slot, -1 none
  };
  std::vector<Row> rows;
  rows.reserve(r.meas.size());
  for (size_t j = 0; j < r.meas.size(); ++j) {
    const RigMeasurement& mm = r.meas[j];
    if (mm.pass < 0) {
      rows.push_back({-1 - (mm.field == "rear_axle_to_ball" ? xO : xL), false, -1});
      continue;
    }
    const int platform = mm.platform == "steer" ? 0 : mm.platform == "drive" ? 1 : 2;
    rows.push_back(
        {platform, s.passes[static_cast<size_t>(mm.pass)].kind != PassKind::unhitched, mslot[j]});
  }
  const double WB = r.wheelbase;
  r.problem.model = [rows, WB](const Eigen::VectorXd& x, Eigen::VectorXd& f, Eigen::MatrixXd& J) {
    J.setZero();
    const RigParams p{x(xS0), x(xD0), x(xA0), x(xT), x(xO), x(xL), WB};
    const LoadJacobian lj_unhitched = jacobian_unhitched();
    const AxleLoads a_unhitched = predict_unhitched(p);
    for (size_t j = 0; j < rows.size(); ++j) {
      const Eigen::Index jj = static_cast<Eigen::Index>(j);
      const Row& rw = rows[j];
      if (rw.what < 0) {
        const int k = -1 - rw.what;
        f(jj) = x(k);
        J(jj, k) = 1;
        continue;
      }
      const double M = rw.slot >= 0 ? x(xM0 + rw.slot) : 0.0;
      AxleLoads a;
      LoadJacobian lj;
      if (!rw.hitched) {
        a = a_unhitched;
        lj = lj_unhitched;
      } else {
        a = predict_hitched(p, M);
        lj = jacobian_hitched(p, M);
      }
      const int row = rw.what;
      f(jj) = row == 0 ? a.steer : row == 1 ? a.drive : a.trailer;
      const auto& g = lj[static_cast<size_t>(row)];
      J(jj, xS0) = g[kS0];
      J(jj, xD0) = g[kD0];
      J(jj, xA0) = g[kA0];
      J(jj, xT) = g[kT];
      J(jj, xO) = g[kO];
      J(jj, xL) = g[kL];
      if (rw.slot >= 0) J(jj, xM0 + rw.slot) = g[kM];
    }
  };
  r.sol = solve_wls(r.problem);
  return r;
}

}  // namespace sp
