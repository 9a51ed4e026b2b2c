// Side view of the rig, not to scale except along the centre line: axle positions follow the
// solved lengths. Tow vehicle faces left. Loads are the travel pass's fitted axle loads.
#include <algorithm>

#include "report/charts.h"
#include "report/pages.h"

namespace sp::report {
namespace {

void up_arrow(PdfDocument& doc, float x, float y_tip, float len) {
  doc.line(x, y_tip - len, x, y_tip, 0.8f);
  doc.polygon({x, y_tip, x - 2.5f, y_tip - 5, x + 2.5f, y_tip - 5}, 0.5f, 0);
}

void down_arrow(PdfDocument& doc, float x, float y_tip, float len) {
  doc.line(x, y_tip + len, x, y_tip, 0.8f);
  doc.polygon({x, y_tip, x - 2.5f, y_tip + 5, x + 2.5f, y_tip + 5}, 0.5f, 0);
}

void dimension(PdfDocument& doc, float xa, float xb, float y, const std::string& label, float size) {
  doc.line(xa, y, xb, y, 0.4f);
  doc.line(xa, y - 3, xa, y + 3, 0.4f);
  doc.line(xb, y - 3, xb, y + 3, 0.4f);
  float w = doc.text_width(label, size);
  doc.text((xa + xb) / 2 - w / 2, y + 2.5f, label, size);
}

}  // namespace

void draw_rig_sketch(Flow& flow, const Session& s, const ReconcileResult& r, int wd) {
  const ReportText& t = flow.text();
  PdfDocument& doc = flow.doc();
  if (!r.rear_axle_to_ball || !r.ball_to_axle || r.wheelbase <= 0) return;
  flow.need(static_cast<float>(t.number("chart.sketch_height")) + 70);
  flow.heading(t.get("sections.sketch"));
  const float small = static_cast<float>(t.number("sizes.small"));
  const float band = static_cast<float>(t.number("greys.band"));
  const float h = static_cast<float>(t.number("chart.sketch_height"));
  const std::string wu(to_string(s.units.weight)), lu(to_string(s.units.length));
  float top = flow.reserve(h);

  double WB = r.wheelbase, o = r.rear_axle_to_ball->value, L = r.ball_to_axle->value;
  double front = 0.35 * WB, tail = 0.35 * L;  // overhangs: drawing only
  double span = front + WB + std::max(o, 0.0) + L + tail;
  float xl = flow.left() + 10, xr = flow.left() + flow.width() - 10;
  auto X = [&](double d) { return static_cast<float>(xl + (xr - xl) * (d + front) / span); };
  float ground = top - h * 0.55f, wheel_r = 11;
  float xs = X(0), xd = X(WB), xb = X(WB + o), xt = X(WB + o + L);

  // Tow vehicle: body and cab, wheels on the ground; a fifth wheel's truck has its bed past
  // the drive axle, under the trailer's nose.
  const bool fifth = s.trailer.type == TrailerType::fifth_wheel;
  float body_bot = ground + wheel_r * 1.2f, body_top = body_bot + 26;
  const double body_end = fifth ? WB + std::max(o, 0.0) + 0.12 * WB : WB + std::max(o, 0.0) * 0.6;
  doc.rect(X(-front), body_bot, X(body_end) - X(-front), body_top - body_bot, 0.8f, band);
  doc.polygon({X(-front * 0.2), body_top, X(-front * 0.05), body_top + 20, X(WB * 0.45), body_top + 20,
               X(WB * 0.5), body_top},
              0.8f, band);
  // Trailer: box over its axle; a ball-hitch trailer's tongue runs down to the ball, a fifth
  // wheel's nose rides over the bed on its kingpin.
  float tr_bot = ground + wheel_r * 1.4f, tr_top = tr_bot + 58;
  float box_l = X(WB + o + L * 0.25);
  doc.rect(box_l, tr_bot, X(WB + o + L + tail) - box_l, tr_top - tr_bot, 0.8f, 1);
  const float couple_y = fifth ? body_top : body_bot + 6;  // where the load passes
  if (fifth) {
    const float nose_bot = body_top + 8, nose_l = xb - 28;
    doc.rect(nose_l, nose_bot, box_l - nose_l, tr_top - nose_bot, 0.8f, 1);
    doc.line(xb, nose_bot, xb, couple_y, 1.2f);
  } else {
    doc.line(xb, couple_y, box_l, tr_bot + 6, 1.2f);
  }
  doc.circle(xb, couple_y, 3, 0.8f, 0);
  for (float x : {xs, xd}) doc.circle(x, ground + wheel_r, wheel_r, 0.8f, 0.35f);
  doc.circle(xt - wheel_r * 1.1f, ground + wheel_r, wheel_r, 0.8f, 0.35f);
  doc.circle(xt + wheel_r * 1.1f, ground + wheel_r, wheel_r, 0.8f, 0.35f);
  doc.line(flow.left(), ground, flow.left() + flow.width(), ground, 0.6f);

  // Loads of the travel pass (fitted), as the note under the sketch says. A tensioned pass
  // has them with uncertainties; a hitched one (a fifth wheel's, or a rig weighed without
  // tensioning) has its fitted readings, shown without ±, and carries the slack tongue (pin)
  // load. Never the tow vehicle alone: that is not the rig as it travels.
  std::optional<Estimate> st, dr, trl, ball;
  for (const auto& tr : r.tensioned) {
    if (tr.ticket == r.travel_pass)
      st = tr.steer, dr = tr.drive, trl = tr.trailer, ball = tr.ball_load;
  }
  if (!st && !r.travel_pass.empty()) {
    for (const MeasurementFit& m : r.measurements) {
      if (m.ticket != r.travel_pass || !m.platform) continue;
      std::optional<Estimate>& slot = *m.platform == "steer"   ? st
                                      : *m.platform == "drive" ? dr
                                                               : trl;
      slot = Estimate{m.fitted, 0};
    }
    ball = r.tongue_load;
  }
  auto load = [&](const std::optional<Estimate>& e, const std::string& key) {
    std::string v = "—";
    if (e) v = fmt_number(e->value, wd) + (e->u > 0 ? " \u00b1 " + fmt_expanded(e->u, wd) : "");
    return t.get("charts." + key) + " " + v;
  };
  float arrow_tip = ground - 2;
  up_arrow(doc, xs, arrow_tip, 16);
  up_arrow(doc, xd, arrow_tip, 16);
  up_arrow(doc, xt, arrow_tip, 16);
  float ly = ground - 28;
  for (auto [x, txt] : {std::pair{xs, load(st, "steer_axle")}, std::pair{xd, load(dr, "drive_axle")},
                        std::pair{xt, load(trl, "trailer_axle")}}) {
    float w = doc.text_width(txt, small);
    float tx = std::clamp(x - w / 2, flow.left(), flow.left() + flow.width() - w);
    doc.text(tx, ly, txt, small, Font::bold);
  }
  if (ball) {
    // Above the coupling: over the ball, or over the fifth wheel's nose.
    const float label_y = fifth ? tr_top + 6 : body_bot + 36;
    if (!fifth) down_arrow(doc, xb, couple_y + 4, 22);
    std::string txt = load(ball, "ball");
    doc.text(xb - doc.text_width(txt, small) / 2, label_y, txt, small, Font::bold);
  }
  // Dimensions: solved ± (entered).
  float dy = ly - 18;
  // A length whose flag says it does not fit is labelled so, in the flag's words (the
  // drawing keeps its entered proportions).
  auto len = [&](const LengthEstimate& e, const char* field) {
    const std::string entered =
        " (" + t.get("charts.entered") + " " + fmt_number(e.entered, 1) + ")";
    if (const Flag* f = length_flag(r, field)) return disagreeing_length(t, *f, lu) + entered;
    return fmt_number(e.value, 1) + " \u00b1 " + fmt_expanded(e.u, 1) + " " + lu + entered;
  };
  dimension(doc, xs, xd, dy, "WB " + fmt_number(WB, 1) + " " + lu, small);
  dimension(doc, xd, xb, dy - 16, "o " + len(*r.rear_axle_to_ball, "rear_axle_to_ball"), small);
  dimension(doc, xb, xt, dy, "L " + len(*r.ball_to_axle, "ball_to_axle"), small);
  flow.paragraph(fill(t.get("charts.sketch_note"), {{"unit", wu}, {"ticket", r.travel_pass}}), Font::regular,
                 static_cast<float>(t.number("greys.muted")));
}

}  // namespace sp::report
