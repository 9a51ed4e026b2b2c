#include "engine/reconcile.h"

#include <fmt/format.h>

#include <charconv>
#include <cmath>

#include "core/error.h"
#include "engine/reconcile_parts.h"

namespace sp {

std::optional<TravelConfig> travel_config(const RigFit& fit) {
  if (!fit.tensioned.empty())
    return TravelConfig{fit.tensioned.back(), static_cast<int>(fit.tensioned.size()) - 1};
  if (!fit.hitched.empty()) return TravelConfig{fit.hitched.back(), -1};
  return std::nullopt;
}

std::optional<Estimate> fitted_load(const RigFit& fit, int slot, int platform) {
  return fit.derive([&fit, slot, platform](const Eigen::VectorXd& x) {
    const double M = slot >= 0 ? RigFit::moment(x, static_cast<size_t>(slot)) : 0.0;
    const AxleLoads a = predict_hitched(fit.params(x), M);
    return platform == 0 ? a.steer : platform == 1 ? a.drive : a.trailer;
  });
}

std::string fmt_weight(double v, WeightUnit u) {
  return fmt::format("{:.0f} {}", v, to_string(u));
}

std::string fmt_estimate(const Estimate& e, std::string_view unit) {
  return fmt::format("{:.0f} ± {:.0f} {}", e.value, e.u, unit);
}

namespace {

std::optional<double> parse_number(const std::string& s) {
  // Plain decimal only ("4", "4.5", "-2"); anything else is a label, not a number.
  double v = 0;
  const char* b = s.data();
  const char* e = b + s.size();
  auto [ptr, ec] = std::from_chars(b, e, v);
  if (ec != std::errc() || ptr != e || !std::isfinite(v)) return std::nullopt;
  return v;
}

// Which pass would make the slack tongue load solvable.
std::string tongue_advice(const RigFit& fit) {
  if (fit.unhitched.empty()) return "no unhitched pass; weigh the tow vehicle alone";
  if (fit.hitched.empty() && fit.tensioned.empty())
    return "no hitched pass; weigh the rig hitched with the bars slack";
  return "the passes do not determine it; weigh the rig hitched with the bars slack";
}

}  // namespace

ReconcileResult reconcile(const Session& session, const ReconcileOptions& options) {
  if (!(options.alpha > 0 && options.alpha < 1))
    throw usage_error(fmt::format("alpha: expected a significance level between 0 and 1, got {:g}",
                                  options.alpha));
  if (!(options.tape_u_inches > 0) || !std::isfinite(options.tape_u_inches))
    throw usage_error(
        fmt::format("tape uncertainty: expected a length > 0 in, got {:g}", options.tape_u_inches));
  const RigFit fit = fit_rig(session, options);
  const WeightUnit wu = session.units.weight;
  const double mf = moment_factor(wu, session.units.length);

  ReconcileResult out;
  out.units = session.units;
  out.moment_unit = std::string(moment_unit_name(wu));
  out.wheelbase = fit.wheelbase;

  // Tow vehicle alone.
  out.tow_steer = fit.derive([](const Eigen::VectorXd& x) { return x(xS0); });
  out.tow_drive = fit.derive([](const Eigen::VectorXd& x) { return x(xD0); });
  if (!out.tow_steer || !out.tow_drive)
    out.unsolved.push_back(
        "tow vehicle axle loads: no unhitched pass; weigh the tow vehicle alone");

  // Tongue load, trailer weight, tongue percent.
  out.tongue_load = fit.derive([](const Eigen::VectorXd& x) { return x(xT); });
  out.trailer_weight = fit.derive([](const Eigen::VectorXd& x) { return x(xT) + x(xA0); });
  out.tongue_percent =
      fit.derive([](const Eigen::VectorXd& x) { return 100.0 * x(xT) / (x(xT) + x(xA0)); });
  const std::string tongue_name =
      session.trailer.type == TrailerType::fifth_wheel ? "pin (tongue) load" : "tongue load";
  if (!out.tongue_load) out.unsolved.push_back(tongue_name + ": " + tongue_advice(fit));
  if (!out.trailer_weight) {
    const bool no_trailer_reading = fit.hitched.empty() && fit.tensioned.empty();
    out.unsolved.push_back(std::string("trailer weight: ") +
                           (no_trailer_reading ? "no hitched pass; weigh the rig hitched with the "
                                                 "bars slack"
                                               : tongue_advice(fit)));
  }
  if (!out.tongue_percent && out.trailer_weight)
    out.unsolved.push_back("tongue percent: trailer weight is zero");

  // Lengths as back-solved.
  if (auto o = fit.derive([](const Eigen::VectorXd& x) { return x(xO); }))
    out.rear_axle_to_ball = LengthEstimate{o->value, o->u, session.tow_vehicle.rear_axle_to_ball};
  if (auto l = fit.derive([](const Eigen::VectorXd& x) { return x(xL); }))
    out.ball_to_axle = LengthEstimate{l->value, l->u, session.trailer.ball_to_axle};

  // Tensioned passes.
  if (fit.tensioned.empty() && session.trailer.type == TrailerType::conventional)
    out.unsolved.push_back(
        "bar moment and FALR: no tensioned pass; weigh the rig with the bars tensioned");
  out.tensioned.reserve(fit.tensioned.size());
  for (size_t k = 0; k < fit.tensioned.size(); ++k) {
    const Pass& p = session.passes[static_cast<size_t>(fit.tensioned[k])];
    const int slot = static_cast<int>(k);
    TensionedResult t;
    t.ticket = p.ticket;
    t.setting = p.setting;
    if (p.setting) t.setting_number = parse_number(*p.setting);
    auto m = fit.derive([k, mf](const Eigen::VectorXd& x) { return mf * RigFit::moment(x, k); });
    auto s = fitted_load(fit, slot, 0), d = fitted_load(fit, slot, 1),
         tr = fitted_load(fit, slot, 2);
    if (!m || !s || !d || !tr) {
      out.unsolved.push_back(fmt::format(
          "bar moment of ticket {}: the passes do not determine it; weigh the rig hitched with "
          "the bars slack (and the trailer platform reading of every hitched pass)",
          p.ticket));
      continue;  // a TensionedResult needs a solved moment and loads
    }
    t.bar_moment = *m;
    t.steer = *s;
    t.drive = *d;
    t.trailer = *tr;
    t.ball_load = fit.derive([&fit, k](const Eigen::VectorXd& x) {
      return ball_load(fit.params(x), RigFit::moment(x, k));
    });
    t.falr = fit.derive([&fit, k](const Eigen::VectorXd& x) {
      return falr_percent(fit.params(x), RigFit::moment(x, k));
    });
    if (!t.ball_load)
      out.unsolved.push_back(fmt::format("ball load of ticket {}: needs the tongue load ({})",
                                         p.ticket, tongue_advice(fit)));
    if (!t.falr)
      out.unsolved.push_back(
          fmt::format("FALR of ticket {}: needs the tow vehicle alone and the tongue load ({})",
                      p.ticket, tongue_advice(fit)));
    out.tensioned.push_back(std::move(t));
  }

  if (auto tc = travel_config(fit))
    out.travel_pass = session.passes[static_cast<size_t>(tc->pass)].ticket;

  add_fit_results(fit, options, out);
  add_reading_flags(session, out);
  add_target(fit, out);
  add_load_flags(fit, options, out);
  add_compliance(fit, out);
  return out;
}

}  // namespace sp
