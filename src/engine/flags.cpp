// Flags: tests of fit, reading checks, and load checks. Severities: a reading that does not fit
// or a printed gross that disagrees is an error (a number on a ticket is wrong); a tape length
// that does not fit is an error too (every moment depends on it); load findings are warnings;
// off-division is a warning (a mis-key or a non-certified reading).
#include <fmt/format.h>

#include <cmath>

#include "engine/reconcile_parts.h"

namespace sp {
namespace {

Flag make_flag(const char* code, Severity severity, std::string message,
               std::optional<std::string> ticket = std::nullopt,
               std::optional<std::string> platform = std::nullopt) {
  Flag f;
  f.code = code;
  f.severity = severity;
  f.message = std::move(message);
  f.ticket = std::move(ticket);
  f.platform = std::move(platform);
  return f;
}

}  // namespace

std::optional<ExcludedMeasurement> add_fit_results(const RigFit& fit, const ReconcileOptions& opt,
                                                   ReconcileResult& out) {
  const Session& s = *fit.session;
  const GlobalTestResult g = global_test(fit.sol, opt.alpha);
  FitResult fr;
  fr.chi_square = g.chi_square;
  fr.dof = g.dof;
  fr.p_value = g.p_value;
  fr.critical = g.critical;
  fr.alpha = opt.alpha;
  fr.passed = g.passed;
  out.fit = fr;

  const MeasurementTestResult mt = measurement_test(fit.problem, fit.sol, opt.alpha);
  const std::string wunit(to_string(s.units.weight)), lunit(to_string(s.units.length));
  auto name_of = [&](size_t j) {
    const RigMeasurement& m = fit.meas[j];
    if (m.pass < 0) return m.field;
    return s.passes[static_cast<size_t>(m.pass)].ticket + " " + m.platform;
  };
  out.measurements.reserve(out.measurements.size() + fit.meas.size());
  for (size_t j = 0; j < fit.meas.size(); ++j) {
    const RigMeasurement& m = fit.meas[j];
    const Eigen::Index jj = static_cast<Eigen::Index>(j);
    MeasurementFit f;
    f.name = name_of(j);
    if (m.pass >= 0) {
      f.ticket = s.passes[static_cast<size_t>(m.pass)].ticket;
      f.platform = m.platform;
    } else {
      f.field = m.field;
    }
    f.measured = fit.problem.y(jj);
    f.fitted = fit.sol.fitted(jj);
    f.sigma = fit.problem.sigma(jj);
    f.normalized = mt.z[j] >= 0 ? mt.z[j] : 0.0;
    out.measurements.push_back(std::move(f));
  }
  if (g.passed) return std::nullopt;

  Flag fl;
  fl.severity = Severity::error;
  if (!mt.worst) {
    fl.code = "inconsistent-reading";
    fl.message = fmt::format(
        "the readings do not fit together (chi-square {:.1f} > {:.1f} at {} degrees of freedom) "
        "but no single reading or tape length stands out; re-weigh the rig",
        g.chi_square, g.critical, g.dof);
    out.flags.push_back(std::move(fl));
    return std::nullopt;
  }
  const size_t w = static_cast<size_t>(*mt.worst);
  const RigMeasurement& m = fit.meas[w];
  const double measured = fit.problem.y(static_cast<Eigen::Index>(w));
  std::string tied;
  for (int t : mt.tied) tied += (tied.empty() ? "" : ", ") + name_of(static_cast<size_t>(t));
  const std::string tie_note = tied.empty() ? "" : "; the data cannot tell it apart from " + tied;
  fl.needed = mt.needed;
  if (m.pass >= 0) {
    fl.code = "inconsistent-reading";
    fl.ticket = s.passes[static_cast<size_t>(m.pass)].ticket;
    fl.platform = m.platform;
    fl.message = fmt::format(
        "ticket {}, {} platform: the reading {:g} {} does not fit the other readings "
        "(normalized residual {:.2f} > {:.2f}); about {:.0f} {} would fit. Check the ticket or "
        "re-weigh{}",
        *fl.ticket, m.platform, measured, wunit, mt.z[w], mt.z_critical, *mt.needed, wunit,
        tie_note);
  } else {
    fl.code = "geometry-mismatch";
    fl.field = m.field;
    fl.message = fmt::format(
        "{}: the tape length {:g} {} does not fit the readings (normalized residual {:.2f} > "
        "{:.2f}); the readings suggest about {:.1f} {}. Re-measure it{}",
        m.field, measured, lunit, mt.z[w], mt.z_critical, *mt.needed, lunit, tie_note);
  }
  out.flags.push_back(std::move(fl));
  // Serial elimination removes one measurement the test singles out; a tie names several the
  // data cannot tell apart, so there is no one value to leave out.
  if (!mt.tied.empty()) return std::nullopt;
  ExcludedMeasurement ex;
  if (m.pass >= 0) {
    ex.ticket = s.passes[static_cast<size_t>(m.pass)].ticket;
    ex.platform = m.platform;
  } else {
    ex.field = m.field;
  }
  ex.entered = measured;
  return ex;
}

void add_reading_flags(const Session& s, ReconcileResult& out) {
  const double d = s.scale.division;
  const WeightUnit wu = s.units.weight;
  for (const Pass& p : s.passes) {
    if (p.voided) continue;
    const std::pair<const char*, std::optional<double>> readings[] = {
        {"steer", p.steer}, {"drive", p.drive}, {"trailer", p.trailer}};
    for (const auto& [platform, v] : readings) {
      if (!v) continue;
      const double q = *v / d;
      // Float noise of a decimal entry (e.g. 9.1 kg steps) is not an off-division reading.
      if (std::fabs(q - std::round(q)) <= 1e-6 * std::max(1.0, std::fabs(q))) continue;
      out.flags.push_back(make_flag(
          "off-division", Severity::warning,
          fmt::format(
              "ticket {}, {} platform: reading {:g} {} is not a multiple of the scale division "
              "{:g} {}; a certified reading always is (mis-keyed?)",
              p.ticket, platform, *v, to_string(wu), d, to_string(wu)),
          p.ticket, platform));
    }
    if (p.gross) {
      const double sum = p.steer + p.drive + p.trailer.value_or(0.0);
      if (std::fabs(*p.gross - sum) > 1e-6 * std::max(1.0, std::fabs(sum))) {
        out.flags.push_back(make_flag(
            "gross-mismatch", Severity::error,
            fmt::format(
                "ticket {}: printed gross {} differs from the sum of the platforms {} by {}",
                p.ticket, fmt_weight(*p.gross, wu), fmt_weight(sum, wu),
                fmt_weight(*p.gross - sum, wu)),
            p.ticket));
      }
    }
  }
}

void add_load_flags(const RigFit& fit, const ReconcileOptions& opt, ReconcileResult& out) {
  const Session& s = *fit.session;
  const std::string wunit(to_string(s.units.weight));
  // Restoration and rear-axle checks on the travel configuration (earlier tensioned passes
  // are the owner trying settings).
  if (!fit.tensioned.empty()) {
    const TensionedResult* t = nullptr;
    for (const auto& r : out.tensioned)
      if (r.ticket == out.travel_pass) t = &r;
    if (t && t->falr) {
      const double target = out.target ? out.target->falr : 50.0;
      if (t->falr->value > 100.0) {
        out.flags.push_back(make_flag(
            "over-restored", Severity::warning,
            fmt::format(
                "ticket {}: the bars restore {:.0f} ± {:.0f} % of the front-axle load, more than "
                "100 %: the steer axle carries more than with the trailer off and the drive axle "
                "less; loosen the bars (SAE J2807 limit, as quoted)",
                t->ticket, t->falr->value, 2 * t->falr->u),
            t->ticket));
      } else if (t->falr->value < target - opt.under_restored_points) {
        out.flags.push_back(make_flag(
            "under-restored", Severity::warning,
            fmt::format(
                "ticket {}: the bars restore {:.0f} ± {:.0f} % of the front-axle load, more than "
                "{:g} points below the {:g} % target; tighten the bars",
                t->ticket, t->falr->value, 2 * t->falr->u, opt.under_restored_points, target),
            t->ticket));
      }
    }
    if (t && out.tow_drive && t->drive.value < out.tow_drive->value) {
      out.flags.push_back(make_flag("rear-unloaded", Severity::warning,
                                    fmt::format("ticket {}: the drive axle carries {} with the "
                                                "bars tensioned, less than the {} of the "
                                                "tow vehicle alone; the bars are too tight",
                                                t->ticket, fmt_estimate(t->drive, wunit),
                                                fmt_estimate(*out.tow_drive, wunit)),
                                    t->ticket));
    }
  }
  if (out.tongue_percent) {
    // Common practice: 10-15 % conventional, 15-25 % fifth wheel / gooseneck.
    const bool fifth = s.trailer.type == TrailerType::fifth_wheel;
    const double lo = fifth ? 15 : 10, hi = fifth ? 25 : 15;
    const double v = out.tongue_percent->value;
    if (v < lo || v > hi) {
      out.flags.push_back(make_flag(
          "tongue-percent", Severity::warning,
          fmt::format(
              "the {} load is {:.1f} ± {:.1f} % of the trailer weight ({} of {}), outside the "
              "{:g}-{:g} % commonly used for a {} trailer; {}",
              fifth ? "pin" : "tongue", v, 2 * out.tongue_percent->u,
              fmt_estimate(*out.tongue_load, wunit), fmt_estimate(*out.trailer_weight, wunit), lo,
              hi, fifth ? "fifth-wheel" : "conventional",
              v < lo ? "too little can make the trailer sway; move load forward"
                     : "move load rearward or check the hitch and axle ratings")));
    }
  }
}

}  // namespace sp
