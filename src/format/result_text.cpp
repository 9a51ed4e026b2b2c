#include "format/result_text.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "format/json_strict.h"
#include "format/rounding.h"

namespace sp {

namespace {

constexpr const char* kCaution =
    "Caution: this summary reports what the scale measured and what statics make of it; it\n"
    "does not replace the vehicle and hitch makers' instructions, local law, or an inspection\n"
    "by a qualified person.";

// Display width in code points (our text is ASCII plus a few BMP symbols such as "±", "·").
std::size_t width(const std::string& s) {
  return static_cast<std::size_t>(std::count_if(
      s.begin(), s.end(), [](char c) { return (static_cast<unsigned char>(c) & 0xC0) != 0x80; }));
}
std::string left(const std::string& s, std::size_t w) {
  return s + std::string(w > width(s) ? w - width(s) : 0, ' ');
}
std::string right(const std::string& s, std::size_t w) {
  return std::string(w > width(s) ? w - width(s) : 0, ' ') + s;
}

std::string fixed(double v, int decimals) {
  return fmt::format("{:.{}f}", format::round_to(v, decimals), decimals);
}

// Word-wraps `text` to lines of at most 96 columns, each starting with `indent`.
std::string wrap(const std::string& text, const std::string& indent) {
  std::string out, line = indent;
  std::size_t pos = 0;
  while (pos < text.size()) {
    std::size_t end = text.find(' ', pos);
    if (end == std::string::npos) end = text.size();
    const std::string word = text.substr(pos, end - pos);
    if (width(line) > width(indent) && width(line) + 1 + width(word) > 96) {
      out += line + "\n";
      line = indent;
    }
    line += (width(line) > width(indent) ? " " : "") + word;
    pos = end + 1;
  }
  return out + line + "\n";
}

struct Style {
  bool colour = false;
  std::string paint(const std::string& s, const char* code) const {
    return colour ? std::string("\033[") + code + "m" + s + "\033[0m" : s;
  }
};

struct Units2 {
  std::string w, l, m;
  int wd, ld;
};

Units2 units2(const Units& units, const std::string& moment_unit) {
  Units2 u;
  u.w = std::string(to_string(units.weight));
  u.l = std::string(to_string(units.length));
  u.m = moment_unit.empty() ? std::string(moment_unit_name(units.weight)) : moment_unit;
  u.wd = format::weight_decimals(units.weight);
  u.ld = format::length_decimals(units.length);
  return u;
}

// "value ± U" with U = 2u (k = 2).
std::string pm(const Estimate& e, int decimals) {
  return fixed(e.value, decimals) + " ± " + fixed(2 * e.u, decimals);
}
std::string pm(const std::optional<Estimate>& e, int decimals) {
  return e ? pm(*e, decimals) : std::string("not solved");
}

// Readings print as entered (they are evidence), not rounded.
std::string entered(double v) {
  return format::number_text(v);
}
std::string entered(const std::optional<double>& v) {
  return v ? entered(*v) : std::string("-");
}

bool is_fifth(const Session& s) {
  return s.trailer.type == TrailerType::fifth_wheel;
}

// The verdict leads every summary (RULES.md), in the words of engine/result.h.
void verdict(std::string& out, const ReconcileResult& r, const Style& st) {
  const char* code = r.verdict == Verdict::compliant   ? "32"
                     : r.verdict == Verdict::undecided ? "33"
                                                       : "31";
  out += "Verdict: " + st.paint(std::string(to_string(r.verdict)), code) + "\n";
  if (!r.verdict_reason.empty()) out += wrap(r.verdict_reason, "  ");
  out += "\n";
}

std::string dof_text(int dof) {
  return fmt::format("{} degree{} of freedom", dof, dof == 1 ? "" : "s");
}

void heading(std::string& out, const Session& s, const TextOptions& o, const Units2& u) {
  const std::string src = o.source == "-" ? "<stdin>" : o.source;
  out += "Weigh session " + (src.empty() ? std::string() : src);
  if (s.session_id) out += fmt::format(" (store session {})", *s.session_id);
  out += "\n";
  auto line = [&](const char* k, const std::string& v) { out += left(k, 14) + v + "\n"; };
  if (s.station) line("Station", *s.station);
  if (s.operator_name) line("Operator", *s.operator_name);
  if (s.owner) line("Owner", *s.owner);
  const bool fifth = is_fifth(s);
  line("Tow vehicle", (s.tow_vehicle.label.empty() ? "(no label)" : s.tow_vehicle.label) +
                          ", wheelbase " + fixed(s.tow_vehicle.wheelbase, u.ld) + " " + u.l +
                          (fifth ? ", drive axle to kingpin " : ", rear axle to ball ") +
                          fixed(s.tow_vehicle.rear_axle_to_ball, u.ld) + " " + u.l +
                          (fifth ? " (negative: ahead of the axle)" : ""));
  line("Trailer", (s.trailer.label.empty() ? "(no label)" : s.trailer.label) + ", " +
                      (fifth ? "fifth wheel / gooseneck (no weight-distributing bars)"
                             : "conventional, weight-distributing hitch") +
                      (fifth ? ", kingpin to axle " : ", ball to axle ") +
                      fixed(s.trailer.ball_to_axle, u.ld) + " " + u.l);
  std::string scale = s.scale.id + ", division " + entered(s.scale.division) + " " + u.w +
                      ", class " + s.scale.accuracy_class;
  if (s.scale.last_inspected) scale += ", inspected " + *s.scale.last_inspected;
  line("Scale", scale);
}

void readings(std::string& out, const Session& s, const Units2& u) {
  const bool printed = std::any_of(s.passes.begin(), s.passes.end(),
                                   [](const Pass& p) { return p.gross.has_value(); });
  out += "\nReadings (" + u.w + ")\n";
  std::string head = "  " + left("Ticket", 12) + left("Pass", 11) + left("Setting", 9) +
                     left("Weighed at", 27) + right("Steer", 8) + right("Drive", 8) +
                     right("Trailer", 9) + right("Total", 8);
  if (printed) head += right("Printed", 9);
  out += head + "\n";
  for (const Pass& p : s.passes) {
    const double total = p.steer + p.drive + p.trailer.value_or(0);
    std::string row = "  " + left(p.ticket, 12) + left(std::string(to_string(p.kind)), 11) +
                      left(p.setting.value_or(""), 9) + left(p.weighed_at, 27) +
                      right(entered(p.steer), 8) + right(entered(p.drive), 8) +
                      right(entered(p.trailer), 9) + right(entered(total), 8);
    if (printed) row += right(entered(p.gross), 9);
    if (p.voided) row += "  VOID" + (p.void_reason ? ": " + *p.void_reason : std::string());
    out += row + "\n";
  }
  if (std::any_of(s.passes.begin(), s.passes.end(), [](const Pass& p) { return p.voided; })) {
    out += "  (VOID passes are kept on record and left out of the solution.)\n";
  }
}

// The flag a failed fit raised against a tape length, if any.
const Flag* geometry_flag(const ReconcileResult& r, const char* field) {
  for (const Flag& f : r.flags)
    if (f.code == "geometry-mismatch" && f.field == std::string(field)) return &f;
  return nullptr;
}

void solved(std::string& out, const ReconcileResult& r, const Units2& u, bool fifth,
            const std::string& indent = "  ") {
  auto line = [&](const char* k, const std::string& v) { out += indent + left(k, 30) + v + "\n"; };
  auto w = [&](const std::optional<Estimate>& e) {
    return e ? pm(*e, u.wd) + " " + u.w : std::string("not solved");
  };
  auto len = [&](const std::optional<LengthEstimate>& e, const char* field) {
    if (!e) return std::string("not solved");
    std::string s = pm(Estimate{e->value, e->u}, u.ld) + " " + u.l + "  (entered " +
                    fixed(e->entered, u.ld) + " " + u.l;
    // Same words as the geometry-mismatch flag, so the two never tell different stories.
    if (const Flag* f = geometry_flag(r, field); f && f->needed)
      s += ": the tape length does not fit the readings; the readings suggest about " +
           fixed(*f->needed, u.ld) + " " + u.l;
    return s + ")";
  };
  line("Tow vehicle alone, steer", w(r.tow_steer));
  line("Tow vehicle alone, drive", w(r.tow_drive));
  line(fifth ? "Pin load on the kingpin" : "Tongue load, bars slack", w(r.tongue_load));
  line(fifth ? "Trailer weight, hitched" : "Trailer weight, bars slack", w(r.trailer_weight));
  line(fifth ? "Pin share of trailer" : "Tongue share of trailer",
       r.tongue_percent ? pm(*r.tongue_percent, format::kPercentDecimals) + " %"
                        : std::string("not solved"));
  line(fifth ? "Drive axle to kingpin" : "Rear axle to ball",
       len(r.rear_axle_to_ball, "rear_axle_to_ball"));
  line(fifth ? "Kingpin to trailer axle" : "Ball to trailer axle",
       len(r.ball_to_axle, "ball_to_axle"));
}

void solved_section(std::string& out, const ReconcileResult& r, const Units2& u, bool fifth) {
  out += "\nSolved (± is 2u: expanded uncertainty, k = 2, about 95 %)\n";
  solved(out, r, u, fifth);
  if (fifth) {
    out +=
        "  (a fifth wheel or gooseneck couples on the kingpin: no weight-distributing bars,\n"
        "  so no bar moment)\n";
  }
  if (r.tensioned.empty()) return;
  out += "\nBar passes (moments in " + u.m + ", loads in " + u.w + ", ± is 2u)\n";
  out += "  " + left("Ticket", 12) + left("Setting", 9) + right("Bar moment", 14) +
         right("Ball load", 14) + right("FALR %", 14) + right("Steer", 13) + right("Drive", 13) +
         right("Trailer", 13) + "\n";
  for (const TensionedResult& t : r.tensioned) {
    out += "  " + left(t.ticket, 12) + left(t.setting.value_or(""), 9) +
           right(pm(t.bar_moment, format::kMomentDecimals), 14) +
           right(t.ball_load ? pm(*t.ball_load, u.wd) : "-", 14) +
           right(t.falr ? pm(*t.falr, format::kPercentDecimals) : "-", 14) +
           right(pm(t.steer, u.wd), 13) + right(pm(t.drive, u.wd), 13) +
           right(pm(t.trailer, u.wd), 13) + "\n";
  }
  for (const TensionedResult& t : r.tensioned)
    if (t.note) out += wrap("Note: " + *t.note, "  ");
}

std::string p_text(double p) {
  if (p < 0.0001) return "below 0.0001";
  return fmt::format("{:.4f}", p);
}

void fit(std::string& out, const ReconcileResult& r, const Style& st) {
  out += "\nFit test\n";
  if (!r.fit) {
    out +=
        "  Not run: there are no more readings than unknowns, so nothing can be cross-checked.\n";
    return;
  }
  const FitResult& f = *r.fit;
  const std::string numbers =
      fmt::format("chi-square {:.2f} on {}; limit {:.2f} at the {:g} % level; p = {}", f.chi_square,
                  dof_text(f.dof), f.critical, 100 * f.alpha, p_text(f.p_value));
  if (f.passed) {
    out += "  " + st.paint("Passed", "32") +
           ": the readings and tape lengths agree with the statics within the scale's "
           "tolerance\n" +
           wrap("(" + numbers + ").", "  ");
  } else {
    out += "  " + st.paint("FAILED", "31") +
           ": the readings and tape lengths do not agree with the statics within the scale's "
           "tolerance\n" +
           wrap("(" + numbers + "). The flags below name the measurement that fits worst.", "  ");
  }
}

void flags(std::string& out, const ReconcileResult& r, const Style& st) {
  out += "\nFlags\n";
  if (r.flags.empty()) {
    out += "  None.\n";
    return;
  }
  for (const Flag& f : r.flags) {
    const char* code = f.severity == Severity::error     ? "31"
                       : f.severity == Severity::warning ? "33"
                                                         : "36";
    std::string where;
    if (f.ticket) where += *f.ticket;
    if (f.platform) where += (where.empty() ? "" : " ") + *f.platform;
    if (f.field) where += (where.empty() ? "" : " ") + *f.field;
    if (f.rating) where += (where.empty() ? "" : " ") + *f.rating;
    out += "  " + st.paint(left(std::string(to_string(f.severity)), 8), code) + f.code +
           (where.empty() ? "" : " [" + where + "]") + "\n";
    out += wrap(f.message, "      ");
    if (auto e = explain_flag(f.code); !e.empty()) out += wrap("What it means: " + e, "      ");
  }
}

void ratings(std::string& out, const ReconcileResult& r, const Units2& u, const Style& st) {
  out += "\nRatings";
  if (!r.travel_pass.empty()) out += " (travel configuration: ticket " + r.travel_pass + ")";
  out += "\n";
  if (r.compliance.empty()) {
    out +=
        "  None checked: the session gives no ratings, or the loads they need were not "
        "solved.\n";
    return;
  }
  std::size_t lw = 24;
  for (const ComplianceRow& c : r.compliance) {
    lw = std::max(lw, width(c.label.empty() ? c.rating : c.label) + 2);
  }
  out += "  " + left("Rating", lw) + right("Limit", 9) + right("Measured ± 2u", 17) +
         right("Margin", 9) + "  Status (" + u.w + ")\n";
  for (const ComplianceRow& c : r.compliance) {
    const char* code = c.status == ComplianceStatus::within ? "32"
                       : c.status == ComplianceStatus::over ? "31"
                                                            : "33";
    out += "  " + left(c.label.empty() ? c.rating : c.label, lw) + right(fixed(c.limit, u.wd), 9) +
           right(pm(Estimate{c.value, c.u}, u.wd), 17) + right(fixed(c.margin, u.wd), 9) + "  " +
           st.paint(std::string(to_string(c.status)), code) + "\n";
  }
  out +=
      "  within: measured + 2u is at or under the limit; over: measured - 2u is above it;\n"
      "  undecided: the limit lies inside the uncertainty (JCGM 100:2008 §6.3, k = 2).\n";
}

std::string step_text(double v) {
  return fmt::format("{:.0f}", v);
}

}  // namespace

std::string setting_text(const TargetResult& t) {
  if (!t.setting) return "";
  const std::string fit = pm(*t.setting, 1);
  if (!t.whole_step) return fit;
  const WholeStepSetting& w = *t.whole_step;
  if (w.lower == w.upper) return step_text(w.lower) + " (fit " + fit + ")";
  return "between " + step_text(w.lower) + " and " + step_text(w.upper) + ": try " +
         step_text(w.try_first) + ", re-weigh (fit " + fit + ")";
}

namespace {

void recommendation(std::string& out, const ReconcileResult& r, const Units2& u, bool fifth,
                    const std::string& indent = "  ") {
  if (fifth) {
    out += wrap(
        "None needed: a fifth wheel or gooseneck has no weight-distributing bars, so "
        "there is no bar moment or setting to recommend.",
        indent);
    return;
  }
  if (!r.target) {
    out += indent + "None: no bar moment could be recommended (see Not solved).\n";
    return;
  }
  const TargetResult& t = *r.target;
  if (t.provisional) {
    out += wrap(r.fit && !r.fit->passed
                    ? "PROVISIONAL: the fit failed, so these figures are not advice; do not set "
                      "the bars by them. Correct the value the flags name, or re-weigh, first."
                    : "PROVISIONAL: figures of a what-if re-solve, not advice; confirm by "
                      "re-weighing first.",
                indent);
  }
  out += indent +
         "Target front axle load restoration (FALR): " + fixed(t.falr, format::kPercentDecimals) +
         " %" +
         (t.falr_from_rig ? " (from the tow vehicle's data)" : " (default; the rig gives none)") +
         "\n";
  const std::string pv = t.provisional ? " (provisional)" : "";
  if (t.bar_moment) {
    out += indent + "Bar moment for the target" + pv + ": " +
           pm(*t.bar_moment, format::kMomentDecimals) + " " + u.m + "\n";
  }
  if (t.setting) {
    out += indent + "Setting that reaches it" + pv + ": " + setting_text(t) + "\n" + indent +
           "(straight-line fit of bar moment against the numeric settings weighed)\n";
  }
  if (t.steer || t.drive || t.trailer || t.ball_load) {
    out += indent + "Predicted at that moment:  steer " + pm(t.steer, u.wd) + ", drive " +
           pm(t.drive, u.wd) + ", trailer " + pm(t.trailer, u.wd) + ", ball " +
           pm(t.ball_load, u.wd) + " " + u.w + "\n";
  }
  if (t.note) out += wrap(*t.note, indent);
}

std::string excluded_name(const ExcludedMeasurement& e, const Units2& u) {
  if (e.field) return "the tape length " + *e.field + " (" + entered(e.entered) + " " + u.l + ")";
  return "the " + e.platform.value_or("") + " reading of ticket " + e.ticket.value_or("") + " (" +
         entered(e.entered) + " " + u.w + ")";
}

// The serial-elimination re-solve: what the rig would be if the named value is the error.
void if_excluded(std::string& out, const ReconcileResult& r, const Units2& u, bool fifth,
                 const Style& st) {
  if (!r.if_excluded || !r.if_excluded->result) return;
  const ReconcileResult& x = *r.if_excluded->result;
  const std::string what = excluded_name(r.if_excluded->excluded, u);
  out += "\nIf " + what + " is the error (re-solved without it)\n";
  out += wrap(
      "What the rig would be if that value is wrong; not a proof. The verdict above "
      "stays not-proven until the value is corrected or the rig re-weighed.",
      "  ");
  if (x.fit) {
    out += wrap(fmt::format("Fit test without it: {} (chi-square {:.2f} on {}; limit {:.2f}).",
                            x.fit->passed ? "passed" : "FAILED", x.fit->chi_square,
                            dof_text(x.fit->dof), x.fit->critical),
                "  ");
  }
  out += "  Verdict if so: " + st.paint(std::string(to_string(x.verdict)), "33") + "\n";
  if (!x.verdict_reason.empty()) out += wrap(x.verdict_reason, "    ");
  solved(out, x, u, fifth, "    ");
  for (const TensionedResult& t : x.tensioned) {
    out += "    " + left("Bar moment, ticket " + t.ticket, 30) +
           pm(t.bar_moment, format::kMomentDecimals) + " " + u.m +
           (t.falr ? ", FALR " + pm(*t.falr, format::kPercentDecimals) + " %" : "") + "\n";
  }
  for (const ComplianceRow& c : x.compliance) {
    if (c.status == ComplianceStatus::within) continue;
    out += "    " + left(c.label.empty() ? c.rating : c.label, 30) +
           pm(Estimate{c.value, c.u}, u.wd) + " " + u.w + " against " + fixed(c.limit, u.wd) + " " +
           u.w + ": " + std::string(to_string(c.status)) + "\n";
  }
  if (!fifth && x.target) recommendation(out, x, u, fifth, "    ");
}

}  // namespace

std::string explain_flag(const std::string& code) {
  if (code == "inconsistent-reading") {
    return "this platform reading does not fit the other readings within the scale's "
           "tolerance. It may be mis-keyed, or the rig moved or was not square on the platform. "
           "Check the ticket, and weigh again if it was entered correctly.";
  }
  if (code == "geometry-mismatch") {
    return "this tape length does not fit the readings. Measure it again on level ground "
           "(drive axle centre to ball centre; ball to the middle of the trailer axles).";
  }
  if (code == "off-division") {
    return "a scale shows only multiples of its division, so this reading was probably typed "
           "wrong. Check it against the ticket.";
  }
  if (code == "gross-mismatch") {
    return "the gross printed on the ticket is not the sum of its platform readings. One of "
           "them was probably typed wrong.";
  }
  if (code == "over-restored") {
    return "the bars put more load back on the steer axle than hitching took off (above 100 % "
           "FALR). Reduce bar tension.";
  }
  if (code == "under-restored") {
    return "the bars restore well under the target share of steer-axle load. Add tension; the "
           "recommendation below gives the moment.";
  }
  if (code == "rear-unloaded") {
    return "the drive axle carries less than with no trailer at all: the bars are lifting the "
           "rear. Reduce bar tension.";
  }
  if (code == kRatingOverFlag) {
    return "a rating is exceeded by more than the measurement uncertainty. Do not tow like "
           "this: lighten or redistribute the load, or use a vehicle or hitch rated for it.";
  }
  if (code == "tongue-percent") {
    return "the tongue's share of the trailer weight is outside the usual range (10-15 % for a "
           "conventional trailer, 15-25 % for a fifth wheel; common practice). Too little "
           "invites sway, too much overloads hitch and rear axle: move cargo.";
  }
  return "";
}

std::string render_result_text(const Session& s, const ReconcileResult& r, const TextOptions& o) {
  // The session (heading, readings) prints in its own units, as entered; the solution in the
  // result's units, which differ when the caller converted it (--units).
  const Units2 su = units2(s.units, r.moment_unit);
  const Units2 ru = units2(r.units, r.moment_unit);
  const Style st{o.colour};
  const bool fifth = is_fifth(s);
  std::string out;
  verdict(out, r, st);
  heading(out, s, o, su);
  readings(out, s, su);
  solved_section(out, r, ru, fifth);
  fit(out, r, st);
  flags(out, r, st);
  ratings(out, r, ru, st);
  out += "\nRecommendation\n";
  recommendation(out, r, ru, fifth);
  if_excluded(out, r, ru, fifth, st);
  if (!r.unsolved.empty()) {
    out += "\nNot solved\n";
    for (const auto& line : r.unsolved) out += wrap("- " + line, "  ");
  }
  out += "\n" + std::string(kCaution) + "\n";
  return out;
}

}  // namespace sp
