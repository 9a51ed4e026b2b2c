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
std::string entered(double v) { return format::number_text(v); }
std::string entered(const std::optional<double>& v) { return v ? entered(*v) : std::string("-"); }

void heading(std::string& out, const Session& s, const TextOptions& o, const Units2& u) {
  const std::string src = o.source == "-" ? "<stdin>" : o.source;
  out += "Weigh session " + (src.empty() ? std::string() : src);
  if (s.session_id) out += fmt::format(" (store session {})", *s.session_id);
  out += "\n";
  auto line = [&](const char* k, const std::string& v) { out += left(k, 14) + v + "\n"; };
  if (s.station) line("Station", *s.station);
  if (s.operator_name) line("Operator", *s.operator_name);
  if (s.owner) line("Owner", *s.owner);
  line("Tow vehicle", (s.tow_vehicle.label.empty() ? "(no label)" : s.tow_vehicle.label) +
                          ", wheelbase " + fixed(s.tow_vehicle.wheelbase, u.ld) + " " + u.l +
                          ", rear axle to ball " + fixed(s.tow_vehicle.rear_axle_to_ball, u.ld) +
                          " " + u.l);
  line("Trailer", (s.trailer.label.empty() ? "(no label)" : s.trailer.label) + ", " +
                      std::string(to_string(s.trailer.type)) + ", ball to axle " +
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

void solved(std::string& out, const ReconcileResult& r, const Units2& u) {
  out += "\nSolved (± is 2u: expanded uncertainty, k = 2, about 95 %)\n";
  auto line = [&](const char* k, const std::string& v) { out += "  " + left(k, 30) + v + "\n"; };
  auto w = [&](const std::optional<Estimate>& e) {
    return e ? pm(*e, u.wd) + " " + u.w : std::string("not solved");
  };
  auto len = [&](const std::optional<LengthEstimate>& e) {
    if (!e) return std::string("not solved");
    return pm(Estimate{e->value, e->u}, u.ld) + " " + u.l + "  (entered " +
           fixed(e->entered, u.ld) + " " + u.l + ")";
  };
  line("Tow vehicle alone, steer", w(r.tow_steer));
  line("Tow vehicle alone, drive", w(r.tow_drive));
  line("Tongue load, bars slack", w(r.tongue_load));
  line("Trailer weight, bars slack", w(r.trailer_weight));
  line("Tongue share of trailer", r.tongue_percent
                                      ? pm(*r.tongue_percent, format::kPercentDecimals) + " %"
                                      : std::string("not solved"));
  line("Rear axle to ball", len(r.rear_axle_to_ball));
  line("Ball to trailer axle", len(r.ball_to_axle));
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
}

std::string p_text(double p) {
  if (p < 0.0001) return "below 0.0001";
  return fmt::format("{:.4f}", p);
}

void fit(std::string& out, const ReconcileResult& r, const Style& st) {
  out += "\nFit test\n";
  if (!r.fit) {
    out += "  Not run: there are no more readings than unknowns, so nothing can be cross-checked.\n";
    return;
  }
  const FitResult& f = *r.fit;
  const std::string numbers =
      fmt::format("chi-square {:.2f} on {} degrees of freedom; limit {:.2f} at the {:g} % level; "
                  "p = {}",
                  f.chi_square, f.dof, f.critical, 100 * f.alpha, p_text(f.p_value));
  if (f.passed) {
    out += "  " + st.paint("Passed", "32") +
           ": the readings and tape lengths agree with the statics within the scale's "
           "tolerance\n" + wrap("(" + numbers + ").", "  ");
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
    const char* code = f.severity == Severity::error ? "31" : f.severity == Severity::warning ? "33" : "36";
    std::string where;
    if (f.ticket) where += *f.ticket;
    if (f.platform) where += (where.empty() ? "" : " ") + *f.platform;
    if (f.field) where += (where.empty() ? "" : " ") + *f.field;
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
    out += "  None checked: the session gives no ratings, or the loads they need were not "
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
                       : c.status == ComplianceStatus::over ? "31" : "33";
    out += "  " + left(c.label.empty() ? c.rating : c.label, lw) + right(fixed(c.limit, u.wd), 9) +
           right(pm(Estimate{c.value, c.u}, u.wd), 17) + right(fixed(c.margin, u.wd), 9) + "  " +
           st.paint(std::string(to_string(c.status)), code) + "\n";
  }
  out += "  within: measured + 2u is at or under the limit; over: measured - 2u is above it;\n"
         "  undecided: the limit lies inside the uncertainty (JCGM 100:2008 §6.3, k = 2).\n";
}

void recommendation(std::string& out, const ReconcileResult& r, const Units2& u) {
  out += "\nRecommendation\n";
  if (!r.target) {
    out += "  None: no bar moment could be recommended (see below).\n";
    return;
  }
  const TargetResult& t = *r.target;
  out += "  Target front axle load restoration (FALR): " + fixed(t.falr, format::kPercentDecimals) +
         " %" + (t.falr_from_rig ? " (from the tow vehicle's data)" : " (default; the rig gives none)") +
         "\n";
  if (t.bar_moment) {
    out += "  Bar moment for the target: " + pm(*t.bar_moment, format::kMomentDecimals) + " " +
           u.m + "\n";
  }
  if (t.setting) {
    out += "  Setting that reaches it:   " + pm(*t.setting, 1) + "\n" +
           "  (straight-line fit of bar moment against the numeric settings weighed)\n";
  }
  if (t.steer || t.drive || t.trailer || t.ball_load) {
    out += "  Predicted at that moment:  steer " + pm(t.steer, u.wd) + ", drive " +
           pm(t.drive, u.wd) + ", trailer " + pm(t.trailer, u.wd) + ", ball " +
           pm(t.ball_load, u.wd) + " " + u.w + "\n";
  }
  if (t.note) out += wrap(*t.note, "  ");
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
  std::string out;
  heading(out, s, o, su);
  readings(out, s, su);
  solved(out, r, ru);
  fit(out, r, st);
  flags(out, r, st);
  ratings(out, r, ru, st);
  recommendation(out, r, ru);
  if (!r.unsolved.empty()) {
    out += "\nNot solved\n";
    for (const auto& line : r.unsolved) out += wrap("- " + line, "  ");
  }
  out += "\n" + std::string(kCaution) + "\n";
  return out;
}

}  // namespace sp
