#include "report/charts.h"

#include <algorithm>
#include <cmath>

namespace sp::report {
namespace {

struct Point {
  double m, steer, drive, trailer;
  bool tensioned;
};

// Round `v` up to a "nice" step (1, 2, 2.5, 5 x 10^k) for axis ticks (common practice).
double nice_step(double range, int ticks) {
  double raw = range / std::max(1, ticks);
  double mag = std::pow(10.0, std::floor(std::log10(raw)));
  for (double f : {1.0, 2.0, 2.5, 5.0, 10.0}) {
    if (f * mag >= raw) return f * mag;
  }
  return 10 * mag;
}

void marker(PdfDocument& doc, float x, float y, bool tensioned) {
  if (tensioned) {
    doc.circle(x, y, 2.4f, 0.7f, 0);  // filled: bars tensioned
  } else {
    doc.rect(x - 2.4f, y - 2.4f, 4.8f, 4.8f, 0.7f, 1);  // open square: bars slack
  }
}

}  // namespace

AxleLines axle_lines(const Session& s, const ReconcileResult& r) {
  AxleLines a;
  if (!r.tow_steer || !r.tow_drive || !r.tongue_load || !r.trailer_weight || !r.rear_axle_to_ball ||
      !r.ball_to_axle || r.wheelbase <= 0 || r.ball_to_axle->value <= 0) {
    return a;
  }
  double k = moment_factor(s.units.weight, s.units.length);  // weight·length -> moment unit
  if (!(k > 0)) return a;
  double S0 = r.tow_steer->value, D0 = r.tow_drive->value, T = r.tongue_load->value;
  double A0 = r.trailer_weight->value - T, o = r.rear_axle_to_ball->value, L = r.ball_to_axle->value;
  double WB = r.wheelbase;
  // With m = M/k (weight·length): Fv = T - m/L; steer = S0 + (m - Fv·o)/WB.
  a.steer_a = S0 - T * o / WB;
  a.steer_b = (1 + o / L) / WB / k;
  // drive = D0 + Fv - (steer - S0)
  a.drive_a = D0 + T - (a.steer_a - S0);
  a.drive_b = -1 / L / k - a.steer_b;
  a.trailer_a = A0;
  a.trailer_b = 1 / L / k;
  a.ok = true;
  return a;
}

void draw_charts(Flow& flow, const Session& s, const ReconcileResult& r, int wd) {
  const ReportText& t = flow.text();
  PdfDocument& doc = flow.doc();
  flow.need(static_cast<float>(t.number("chart.height")) + 70);
  flow.heading(t.get("sections.charts"));
  AxleLines lines = axle_lines(s, r);
  if (!lines.ok) {
    flow.paragraph(t.get("charts.unavailable"));
    return;
  }
  const std::string wu(to_string(s.units.weight));
  const float small = static_cast<float>(t.number("sizes.small"));
  const float muted = static_cast<float>(t.number("greys.muted"));
  const float rule = static_cast<float>(t.number("greys.rule"));

  std::vector<Point> pts;
  for (const Pass& p : s.passes) {
    if (p.voided || p.kind == PassKind::unhitched) continue;
    double m = 0;
    if (p.kind == PassKind::tensioned) {
      auto it = std::find_if(r.tensioned.begin(), r.tensioned.end(),
                             [&](const TensionedResult& tr) { return tr.ticket == p.ticket; });
      if (it == r.tensioned.end()) continue;
      m = it->bar_moment.value;
    }
    pts.push_back({m, p.steer, p.drive, p.trailer.value_or(0), p.kind == PassKind::tensioned});
  }
  std::optional<double> target;
  if (r.target && r.target->bar_moment) target = r.target->bar_moment->value;
  double mmax = 0;
  for (const auto& p : pts) mmax = std::max(mmax, p.m);
  if (target) mmax = std::max(mmax, *target);
  if (mmax <= 0) mmax = 1000;
  double xstep = nice_step(mmax * 1.1, 5);
  mmax = std::ceil(mmax * 1.1 / xstep) * xstep;

  const float chart_h = static_cast<float>(t.number("chart.height"));
  float top = flow.reserve(chart_h + 28) - 14;  // room for the first panel's title
  const float x0 = flow.left() + 58, x1 = flow.left() + flow.width() - 90;
  const float panel_gap = 16, panel_h = (chart_h - 2 * panel_gap - 24) / 3;
  auto X = [&](double m) { return static_cast<float>(x0 + (x1 - x0) * m / mmax); };

  struct Panel {
    std::string key;
    double a, b;
    double Point::*field;
    std::optional<double> unhitched;
  };
  std::vector<Panel> panels = {
      {"steer", lines.steer_a, lines.steer_b, &Point::steer, r.tow_steer ? std::optional(r.tow_steer->value) : std::nullopt},
      {"drive", lines.drive_a, lines.drive_b, &Point::drive, r.tow_drive ? std::optional(r.tow_drive->value) : std::nullopt},
      {"trailer", lines.trailer_a, lines.trailer_b, &Point::trailer, std::nullopt}};
  for (std::size_t i = 0; i < panels.size(); ++i) {
    const Panel& pn = panels[i];
    float ptop = top - static_cast<float>(i) * (panel_h + panel_gap), pbot = ptop - panel_h;
    double lo = std::min(pn.a, pn.a + pn.b * mmax), hi = std::max(pn.a, pn.a + pn.b * mmax);
    for (const auto& p : pts) lo = std::min(lo, p.*pn.field), hi = std::max(hi, p.*pn.field);
    if (pn.unhitched) lo = std::min(lo, *pn.unhitched), hi = std::max(hi, *pn.unhitched);
    double ystep = nice_step(std::max(hi - lo, 50.0), 3);
    lo = std::floor(lo / ystep) * ystep - ystep * 0.5;
    hi = std::ceil(hi / ystep) * ystep + ystep * 0.5;
    auto Y = [&](double v) { return static_cast<float>(pbot + (ptop - pbot) * (v - lo) / (hi - lo)); };
    doc.rect(x0, pbot, x1 - x0, ptop - pbot, 0.5f);
    for (double v = std::ceil(lo / ystep) * ystep; v <= hi; v += ystep) {
      doc.line(x0, Y(v), x1, Y(v), 0.25f, rule, Dash::dotted);
      std::string lab = fmt_number(v, 0);
      doc.text(x0 - 4 - doc.text_width(lab, small), Y(v) - small * 0.35f, lab, small);
    }
    doc.line(X(0), Y(pn.a), X(mmax), Y(pn.a + pn.b * mmax), 1.1f);  // the solved model
    if (pn.unhitched) {
      doc.line(x0, Y(*pn.unhitched), x1, Y(*pn.unhitched), 0.6f, muted, Dash::dashed);
      doc.text(x1 + 4, Y(*pn.unhitched) - small * 0.35f, t.get("kinds.unhitched"), small, Font::regular, muted);
    }
    for (const auto& p : pts) marker(doc, X(p.m), Y(p.*pn.field), p.tensioned);
    doc.text(x0, ptop + 3, t.get("charts." + pn.key) + " (" + wu + ")", small, Font::bold);
    double end = pn.a + pn.b * mmax;
    doc.text(x1 + 4, Y(end) - small * 0.35f, fmt_number(end, wd), small);
  }
  float bottom = top - 3 * panel_h - 2 * panel_gap;
  for (double m = 0; m <= mmax + 1e-9; m += xstep) {
    std::string lab = fmt_number(m, 0);
    doc.line(X(m), bottom, X(m), bottom - 3, 0.5f);
    doc.text(X(m) - doc.text_width(lab, small) / 2, bottom - 4 - small, lab, small);
  }
  std::string xlab = t.get("charts.x_axis") + " (" + r.moment_unit + ")";
  doc.text((x0 + x1) / 2 - doc.text_width(xlab, small) / 2, bottom - 6 - 2 * small, xlab, small);
  if (target) {
    doc.line(X(*target), top, X(*target), bottom, 0.8f, 0, Dash::dashed);
    std::string lab = t.get("charts.target") + " " + fmt_number(*target, 0);
    doc.text(X(*target) - doc.text_width(lab, small, Font::bold) / 2, top + 3, lab, small, Font::bold);
  }
  // Legend.
  float ly = bottom - 8 - 3.5f * small;
  doc.line(x0, ly + 2, x0 + 18, ly + 2, 1.1f);
  doc.text(x0 + 22, ly, t.get("charts.model"), small);
  marker(doc, x0 + 90, ly + 2, false);
  doc.text(x0 + 96, ly, t.get("charts.measured") + ", " + t.get("kinds.hitched"), small);
  marker(doc, x0 + 240, ly + 2, true);
  doc.text(x0 + 246, ly, t.get("charts.measured") + ", " + t.get("kinds.tensioned"), small);
}

}  // namespace sp::report

