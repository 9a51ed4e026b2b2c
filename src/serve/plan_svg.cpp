#include "serve/plan_svg.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <optional>
#include <utility>
#include <vector>

#include "format/plan_output.h"

namespace sp::serve {

namespace {

// Our own palette: dark enough to print on a grey-scale printer; the dash patterns (not the
// colours) tell the lines apart in black and white, one pattern per line of a panel.
constexpr const char* kColours[] = {"#1b4f8a", "#a3431c", "#2c6b3f", "#6a3b8c",
                                    "#7a5a00", "#0f6b6b", "#8a2b55", "#4a4a4a"};
constexpr const char* kSeriesDash[] = {"none",    "10 4", "3 3", "12 3 3 3",
                                       "6 2 1 2", "16 4", "2 5", "8 2 2 2 2 2"};
// Limit lines are thinner and take patterns of their own, so a rating never looks like a load.
constexpr const char* kLimitDash[] = {"1 3",     "5 3 1 3",      "7 7", "1 2 6 2",
                                      "4 2 4 6", "14 3 3 3 3 3", "2 9", "9 2 1 2 1 2"};
enum class Marker { circle, square, triangle, diamond, none };
constexpr Marker kMarkers[] = {Marker::circle, Marker::square, Marker::triangle, Marker::diamond};

struct Style {
  const char* colour;
  const char* dash;
  Marker marker = Marker::none;
};

struct Line {  // y = a + b·M over the plan's moments (or sampled rows)
  std::string words;
  std::vector<std::pair<double, double>> points;  // (moment, weight)
  Style style;
  bool limit = false;
};

struct Crossing {
  double moment = 0, value = 0;
  std::string words;  // "front GAWR exceeded above 850 lbf·ft"
  const char* colour = kColours[0];
};

struct Panel {
  std::string heading;
  std::vector<Line> lines;
  std::vector<Crossing> crossings;
};

bool finite(double v) {
  return std::isfinite(v);
}

std::string num(double v) {  // coordinates
  return fmt::format("{:.1f}", v);
}

std::string w0(double v) {  // weights and moments, as `scaleproof plan` prints them
  const std::string s = fmt::format("{:.0f}", v);
  return s == "-0" ? "0" : s;
}

// "Steer axle vs front GAWR" -> {"Steer axle", "front GAWR"}; no " vs ": {label, key}.
std::pair<std::string, std::string> split_label(const PlanRating& r) {
  const std::string& l = r.label;
  const std::size_t at = l.find(" vs ");
  if (at == std::string::npos) return {l.empty() ? r.rating : l, r.rating};
  return {l.substr(0, at), l.substr(at + 4)};
}

// Which axle series a rating limits, when it limits one drawn as is (-1: none).
int axle_of(const std::string& key) {
  if (key == "front_gawr") return 0;
  if (key == "rear_gawr") return 1;
  if (key == "trailer_axle_gawr") return 2;
  return -1;
}

// Tick values covering [lo, hi] with a step of 1, 2, 2.5 or 5 times a power of ten.
std::vector<double> ticks(double lo, double hi, int want) {
  std::vector<double> t;
  if (!(hi > lo) || !finite(lo) || !finite(hi)) return t;
  const double raw = (hi - lo) / std::max(1, want);
  const double p10 = std::pow(10.0, std::floor(std::log10(raw)));
  double step = p10 * 10;
  for (double m : {1.0, 2.0, 2.5, 5.0, 10.0})
    if (p10 * m >= raw) {
      step = p10 * m;
      break;
    }
  for (double v = std::ceil(lo / step) * step; v <= hi + 1e-9 * step; v += step)
    t.push_back(std::fabs(v) < 1e-9 * step ? 0.0 : v);
  return t;
}

struct Frame {  // one panel's plotting rectangle and scales
  double left, top, width, height;
  double x0, x1, y0, y1;
  double x(double m) const { return left + (m - x0) / (x1 - x0) * width; }
  double y(double v) const { return top + height - (v - y0) / (y1 - y0) * height; }
};

std::string marker_svg(Marker m, double cx, double cy, const char* colour) {
  const std::string c(colour);
  switch (m) {
    case Marker::circle:
      return fmt::format(
          "<circle cx=\"{}\" cy=\"{}\" r=\"3.2\" fill=\"#ffffff\" stroke=\"{}\" "
          "stroke-width=\"1.5\"/>",
          num(cx), num(cy), c);
    case Marker::square:
      return fmt::format("<rect x=\"{}\" y=\"{}\" width=\"6\" height=\"6\" fill=\"{}\"/>",
                         num(cx - 3), num(cy - 3), c);
    case Marker::triangle:
      return fmt::format("<path d=\"M{} {}L{} {}L{} {}Z\" fill=\"{}\"/>", num(cx), num(cy - 4),
                         num(cx + 3.6), num(cy + 2.6), num(cx - 3.6), num(cy + 2.6), c);
    case Marker::diamond:
      return fmt::format(
          "<path d=\"M{} {}L{} {}L{} {}L{} {}Z\" fill=\"#ffffff\" stroke=\"{}\" "
          "stroke-width=\"1.5\"/>",
          num(cx), num(cy - 4), num(cx + 4), num(cy), num(cx), num(cy + 4), num(cx - 4), num(cy),
          c);
    case Marker::none:
      break;
  }
  return "";
}

// Right-hand labels: in the order of their y, at least `gap` apart, kept inside [top, bottom].
void spread(std::vector<std::pair<double, std::size_t>>& ys, double gap, double top,
            double bottom) {
  std::sort(ys.begin(), ys.end());
  for (std::size_t i = 1; i < ys.size(); ++i)
    ys[i].first = std::max(ys[i].first, ys[i - 1].first + gap);
  if (!ys.empty() && ys.back().first > bottom) {
    ys.back().first = bottom;
    for (std::size_t i = ys.size() - 1; i-- > 0;)
      ys[i].first = std::min(ys[i].first, ys[i + 1].first - gap);
  }
  for (auto& y : ys) y.first = std::max(y.first, top);
}

std::string draw_panel(const Panel& panel, Frame f, const PlanResult& p, bool sweep,
                       bool label_marks) {
  // y range: every finite value of the panel, 6 % padding, never empty.
  double lo = INFINITY, hi = -INFINITY;
  for (const Line& l : panel.lines)
    for (const auto& [m, v] : l.points)
      if (finite(v)) {
        lo = std::min(lo, v);
        hi = std::max(hi, v);
      }
  if (!finite(lo) || !finite(hi)) return "";
  if (!(hi > lo)) {
    const double pad = std::max(1.0, std::fabs(hi) * 0.05);
    lo -= pad;
    hi += pad;
  }
  const double pad = 0.06 * (hi - lo);
  f.y0 = lo - pad;
  f.y1 = hi + pad;
  const std::string wu(to_string(p.units.weight));
  std::string o;
  o += fmt::format("<g class=\"pc-panel\" aria-label=\"{}\">\n", xml_escape(panel.heading));
  o += fmt::format("<text x=\"{}\" y=\"{}\" font-weight=\"bold\">{}</text>\n", num(f.left),
                   num(f.top - 10), xml_escape(panel.heading));
  o += fmt::format(
      "<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"none\" stroke=\"#333333\" "
      "stroke-width=\"1\"/>\n",
      num(f.left), num(f.top), num(f.width), num(f.height));
  // Ticks and grid.
  for (double v : ticks(f.y0, f.y1, 5)) {
    const double y = f.y(v);
    o += fmt::format(
        "<line x1=\"{0}\" y1=\"{1}\" x2=\"{2}\" y2=\"{1}\" stroke=\"#d9d9d9\" "
        "stroke-width=\"0.8\"/><line x1=\"{3}\" y1=\"{1}\" x2=\"{0}\" y2=\"{1}\" "
        "stroke=\"#333333\"/><text x=\"{4}\" y=\"{5}\" text-anchor=\"end\">{6}</text>\n",
        num(f.left), num(y), num(f.left + f.width), num(f.left - 5), num(f.left - 8), num(y + 4),
        w0(v));
  }
  if (sweep) {
    for (double m : ticks(f.x0, f.x1, 6)) {
      const double x = f.x(m);
      o += fmt::format(
          "<line x1=\"{0}\" y1=\"{1}\" x2=\"{0}\" y2=\"{2}\" stroke=\"#333333\"/><text x=\"{0}\" "
          "y=\"{3}\" text-anchor=\"middle\">{4}</text>\n",
          num(x), num(f.top + f.height), num(f.top + f.height + 5), num(f.top + f.height + 18),
          w0(m));
    }
  } else {
    o += fmt::format("<text x=\"{}\" y=\"{}\" text-anchor=\"middle\">0</text>\n", num(f.x(0)),
                     num(f.top + f.height + 18));
  }
  o +=
      fmt::format("<text x=\"{}\" y=\"{}\" text-anchor=\"middle\">bar moment ({})</text>\n",
                  num(f.left + f.width / 2), num(f.top + f.height + 34), xml_escape(p.moment_unit));
  o += fmt::format(
      "<text x=\"{0}\" y=\"{1}\" text-anchor=\"middle\" transform=\"rotate(-90 {0} {1})\">load "
      "({2})</text>\n",
      num(f.left - 52), num(f.top + f.height / 2), xml_escape(wu));

  // Target and full restoration, vertical.
  auto vline = [&](std::optional<double> m, const char* dash, const std::string& words,
                   bool above) {
    if (!m || !finite(*m) || *m < f.x0 || *m > f.x1) return;
    const double x = f.x(*m);
    o += fmt::format(
        "<line class=\"{}\" x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\" stroke=\"#111111\" "
        "stroke-width=\"1.4\" stroke-dasharray=\"{}\"><title>{}</title></line>\n",
        above ? "pc-target" : "pc-full-restoration", num(x), num(f.top), num(x),
        num(f.top + f.height), dash, xml_escape(words));
    if (label_marks) {
      const bool right_half = x > f.left + f.width * 0.6;
      // A white halo keeps the words readable across the lines they cross.
      o += fmt::format(
          "<text x=\"{}\" y=\"{}\" text-anchor=\"{}\" font-size=\"11\" "
          "stroke=\"#ffffff\" stroke-width=\"3\" paint-order=\"stroke\">{}</text>\n",
          num(right_half ? x - 4 : x + 4), num(above ? f.top + 13 : f.top + f.height - 6),
          right_half ? "end" : "start", xml_escape(words));
    }
  };
  if (p.target_moment)
    vline(p.target_moment, "7 3",
          fmt::format("target {:.0f} % FALR ({}): {} {}", p.falr_target,
                      p.falr_from_rig ? "the rig's figure" : "default", w0(*p.target_moment),
                      p.moment_unit),
          true);
  if (p.full_restoration)
    vline(
        p.full_restoration, "1 2",
        fmt::format("full restoration (100 % FALR): {} {}", w0(*p.full_restoration), p.moment_unit),
        false);

  // Lines, then their markers, then the labels at their right end.
  std::vector<std::pair<double, std::size_t>> label_y;
  for (std::size_t i = 0; i < panel.lines.size(); ++i) {
    const Line& l = panel.lines[i];
    std::string pts;
    std::optional<std::pair<double, double>> last;
    std::size_t n = 0;
    for (const auto& [m, v] : l.points) {
      if (!finite(m) || !finite(v)) continue;
      pts += (pts.empty() ? "" : " ") + num(f.x(m)) + "," + num(f.y(v));
      last = std::make_pair(f.x(m), f.y(v));
      ++n;
    }
    if (!last) continue;
    const char* dash = l.style.dash;
    o += fmt::format("<g class=\"{}\" aria-label=\"{}\">", l.limit ? "pc-rating" : "pc-load",
                     xml_escape(l.words));
    if (n >= 2)
      o += fmt::format(
          "<polyline points=\"{}\" fill=\"none\" stroke=\"{}\" stroke-width=\"{}\"{}>"
          "<title>{}</title></polyline>",
          pts, l.style.colour, l.limit ? "1.4" : "2.2",
          std::string(dash) == "none" ? "" : fmt::format(" stroke-dasharray=\"{}\"", dash),
          xml_escape(l.words));
    // Markers on at most ~9 points so the pattern reads in black and white.
    const std::size_t every = std::max<std::size_t>(1, (l.points.size() + 7) / 8);
    for (std::size_t k = 0; k < l.points.size(); k += every) {
      const auto& [m, v] = l.points[k];
      if (finite(m) && finite(v)) o += marker_svg(l.style.marker, f.x(m), f.y(v), l.style.colour);
    }
    o += "</g>\n";
    label_y.emplace_back(last->second + 4, i);
  }
  for (const Crossing& c : panel.crossings) {
    if (!finite(c.moment) || c.moment < f.x0 || c.moment > f.x1) continue;
    o += fmt::format(
        "<circle class=\"pc-crossing\" cx=\"{}\" cy=\"{}\" r=\"5\" fill=\"none\" stroke=\"{}\" "
        "stroke-width=\"2\"><title>{}</title></circle>\n",
        num(f.x(c.moment)), num(f.y(c.value)), c.colour, xml_escape(c.words));
  }
  spread(label_y, 13, f.top + 8, f.top + f.height + 4);
  for (const auto& [y, i] : label_y) {
    const Line& l = panel.lines[i];
    o += fmt::format("<text x=\"{}\" y=\"{}\" fill=\"{}\">{}</text>\n", num(f.left + f.width + 8),
                     num(y), l.style.colour, xml_escape(l.words));
  }
  o += "</g>\n";
  return o;
}

}  // namespace

std::string xml_escape(const std::string& text) {
  std::string o;
  o.reserve(text.size());
  for (char ch : text) {
    const auto c = static_cast<unsigned char>(ch);
    switch (ch) {
      case '&':
        o += "&amp;";
        break;
      case '<':
        o += "&lt;";
        break;
      case '>':
        o += "&gt;";
        break;
      case '"':
        o += "&quot;";
        break;
      case '\'':
        o += "&#39;";
        break;
      default:
        if ((c < 0x20 && ch != '\t' && ch != '\n') || c == 0x7f) {
          o += "\xEF\xBF\xBD";  // U+FFFD
        } else {
          o += ch;
        }
    }
  }
  return o;
}

std::string plan_svg(const PlanResult& p, const PlanSvgOptions& options) {
  const std::string wu(to_string(p.units.weight));
  const bool sweep = p.rows.size() >= 2;
  const bool fifth = p.trailer_type == TrailerType::fifth_wheel;

  // The moments at which lines are drawn: the plan's rows (loads are linear in M, so the rows'
  // ends suffice; the rows keep the markers evenly spaced).
  std::vector<double> moments;
  for (const PlanRow& r : p.rows) moments.push_back(r.bar_moment);
  if (moments.empty()) moments.push_back(0);
  const double x1 = sweep ? moments.back() : 1.0;

  Panel axles{"Axle loads", {}, {}};
  Panel totals{"Totals", {}, {}};
  const char* axle_words[] = {"Steer axle", "Drive axle", "Trailer axles"};
  std::string axle_names[3] = {axle_words[0], axle_words[1], axle_words[2]};
  for (const PlanRating& r : p.ratings)
    if (axle_of(r.rating) >= 0) axle_names[axle_of(r.rating)] = split_label(r).first;
  for (int a = 0; a < 3; ++a) {
    Line l{axle_names[a], {}, {kColours[a], kSeriesDash[a], kMarkers[a]}, false};
    for (const PlanRow& r : p.rows)
      l.points.emplace_back(r.bar_moment, a == 0   ? r.loads.steer
                                          : a == 1 ? r.loads.drive
                                                   : r.loads.trailer);
    axles.lines.push_back(std::move(l));
  }
  if (p.baseline.tongue > 0) {
    Line l{fifth ? "Pin load" : "Ball load", {}, {kColours[3], kSeriesDash[3], kMarkers[3]}, false};
    for (const PlanRow& r : p.rows) l.points.emplace_back(r.bar_moment, r.ball_load);
    axles.lines.push_back(std::move(l));
  }

  // Every rating: its limit, and its quantity unless that is an axle drawn above.
  std::size_t limit_style = 0, total_style = 0;
  std::vector<std::string> quantities_drawn;
  for (const PlanRating& r : p.ratings) {
    const auto [quantity, rating] = split_label(r);
    const int axle = axle_of(r.rating);
    const bool in_axles = axle >= 0 || r.rating == "hitch_tongue_rating";
    Panel& panel = in_axles ? axles : totals;
    const char* colour = axle >= 0                           ? kColours[axle]
                         : r.rating == "hitch_tongue_rating" ? kColours[3]
                                                             : kColours[4 + total_style % 4];
    if (axle < 0) {
      const bool drawn = std::find(quantities_drawn.begin(), quantities_drawn.end(), quantity) !=
                         quantities_drawn.end();
      if (!drawn) {
        quantities_drawn.push_back(quantity);
        const std::size_t s = in_axles ? 4 : 4 + total_style++ % 4;
        Line q{quantity, {}, {colour, kSeriesDash[s], kMarkers[s % 4]}, false};
        for (double m : moments) q.points.emplace_back(m, r.at_zero + r.slope * m);
        panel.lines.push_back(std::move(q));
      } else {
        for (const Line& l : panel.lines)
          if (!l.limit && l.words == quantity) colour = l.style.colour;
      }
    }
    Line lim{fmt::format("{} {} {}", rating, w0(r.limit), wu),
             {{0, r.limit}, {x1, r.limit}},
             {colour, kLimitDash[limit_style++ % 8], Marker::none},
             true};
    panel.lines.push_back(std::move(lim));
    if (r.boundary && (r.exceeded == Exceeded::above || r.exceeded == Exceeded::below))
      panel.crossings.push_back(
          {*r.boundary, r.limit, rating + " " + exceeded_words(r, p), colour});
  }

  // Layout.
  const double width = std::clamp(options.width, 480, 2400);
  const double ml = 78, mr = 210, top = 74, ph = 250, gap = 40;
  const bool two = !totals.lines.empty();
  const double bottom = top + ph + (two ? 46 + gap + ph : 0);  // of the last panel
  const double n_lines = static_cast<double>(std::max<std::size_t>(1, p.ratings.size() + 1));
  const double height = bottom + 46 + 16 * n_lines + (sweep ? 0 : 18) + 14;
  Frame f1{ml, top, width - ml - mr, ph, 0, x1, 0, 1};
  Frame f2{ml, top + ph + 46 + gap, width - ml - mr, ph, 0, x1, 0, 1};

  const std::string basis = !options.weighed   ? "Plan"
                            : *options.weighed ? "Plan from the weighing"
                                               : "Plan before weighing";
  const std::string heading = basis + (options.title.empty() ? "" : ": " + options.title);
  // Summary in words for assistive technology (and the <desc>).
  std::string over_words;
  for (const PlanRating& r : p.ratings)
    if (r.exceeded != Exceeded::never)
      over_words += (over_words.empty() ? "" : ", ") + split_label(r).second;
  std::string summary =
      sweep ? fmt::format("Axle loads against bar moment from 0 to {} {}", w0(x1), p.moment_unit)
            : std::string("Axle loads as hitched (no bar moment sweep)");
  if (p.target_moment)
    summary += fmt::format("; target {:.0f} % FALR at {} {}", p.falr_target, w0(*p.target_moment),
                           p.moment_unit);
  summary += fmt::format("; {} rating line{}", p.ratings.size(), p.ratings.size() == 1 ? "" : "s");
  summary += over_words.empty() ? (p.ratings.empty() ? "" : "; no rating exceeded in this range")
                                : "; exceeded in this range: " + over_words;
  summary += ".";

  std::string o;
  o += fmt::format(
      "<svg id=\"plan-chart\" xmlns=\"http://www.w3.org/2000/svg\" viewBox=\"0 0 {0} {1}\" "
      "width=\"{0}\" height=\"{1}\" role=\"img\" aria-label=\"{2}\" font-family=\"sans-serif\" "
      "font-size=\"12\" fill=\"#111111\">\n",
      num(width), num(height), xml_escape(heading + ". " + summary));
  o += fmt::format("<title>{}</title>\n", xml_escape(heading + ": axle loads against bar moment"));
  std::string desc = summary;
  for (const PlanRating& r : p.ratings)
    desc += fmt::format(" {} {} {}: {}.", r.label, w0(r.limit), wu, exceeded_words(r, p));
  desc +=
      " Predictions from the statics, without uncertainty: weigh the rig at the chosen "
      "setting to confirm.";
  o += fmt::format("<desc>{}</desc>\n", xml_escape(desc));
  o += fmt::format("<rect x=\"0\" y=\"0\" width=\"{}\" height=\"{}\" fill=\"#ffffff\"/>\n",
                   num(width), num(height));
  o += fmt::format("<text x=\"{}\" y=\"24\" font-size=\"15\" font-weight=\"bold\">{}</text>\n",
                   num(ml), xml_escape(heading));
  o += fmt::format(
      "<text x=\"{}\" y=\"42\" font-size=\"11\">Predicted from the statics, without "
      "uncertainty: weigh the rig at the chosen setting to confirm.</text>\n",
      num(ml));
  o += draw_panel(axles, f1, p, sweep, true);
  if (two) o += draw_panel(totals, f2, p, sweep, false);

  // The ratings in words under the chart (black and white, screen readers, print).
  double y = bottom + 46 + 16;
  if (!sweep) {
    o += fmt::format(
        "<text x=\"{}\" y=\"{}\">No bar moment sweep: a fifth-wheel or gooseneck coupling takes "
        "no weight-distributing bars; the loads are as hitched.</text>\n",
        num(ml), num(y));
    y += 18;
  }
  if (p.ratings.empty()) {
    o += fmt::format(
        "<text x=\"{}\" y=\"{}\">No ratings given: nothing to check the loads "
        "against.</text>\n",
        num(ml), num(y));
  } else {
    o += fmt::format(
        "<g class=\"pc-ratings\"><text x=\"{}\" y=\"{}\" font-weight=\"bold\">Ratings"
        "</text>\n",
        num(ml), num(y));
    for (const PlanRating& r : p.ratings) {
      y += 16;
      const bool bad = r.exceeded != Exceeded::never;
      o += fmt::format("<text x=\"{}\" y=\"{}\" data-rating=\"{}\"{}>{} {} {}: {}</text>\n",
                       num(ml + 8), num(y), xml_escape(r.rating),
                       bad ? " font-weight=\"bold\" fill=\"#a3121c\"" : "", xml_escape(r.label),
                       w0(r.limit), xml_escape(wu), xml_escape(exceeded_words(r, p)));
    }
    o += "</g>\n";
  }
  o += "</svg>\n";
  return o;
}

}  // namespace sp::serve
