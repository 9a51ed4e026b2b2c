// A plain chart until the full drawing lands: one polyline per axle, a dashed line at the
// target moment and a horizontal line at each rating's limit of an axle.
#include "serve/plan_chart.h"

#include <fmt/format.h>

#include <algorithm>

#include "serve/html.h"

namespace sp::serve {

std::string plan_chart(const PlanResult& p) {
  constexpr double W = 640, H = 320, L = 60, R = 20, T = 20, B = 40;
  if (p.rows.empty()) return "<svg id=\"plan-chart\" role=\"img\" aria-label=\"no plan\"></svg>";
  double mmax = std::max(1.0, p.rows.back().bar_moment), wmax = 1;
  for (const auto& r : p.rows) wmax = std::max({wmax, r.loads.steer, r.loads.drive, r.loads.trailer});
  for (const auto& g : p.ratings) {
    if (g.rating == "front_gawr" || g.rating == "rear_gawr") wmax = std::max(wmax, g.limit);
  }
  wmax *= 1.1;
  auto x = [&](double m) { return L + (W - L - R) * m / mmax; };
  auto y = [&](double w) { return T + (H - T - B) * (1 - w / wmax); };
  std::string s = fmt::format(
      "<svg id=\"plan-chart\" xmlns=\"http://www.w3.org/2000/svg\" viewBox=\"0 0 {} {}\" "
      "role=\"img\" aria-label=\"Axle loads against bar moment\">\n",
      W, H);
  s += fmt::format("<line class=\"axis\" x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\"/>", L, y(0), W - R, y(0));
  s += fmt::format("<line class=\"axis\" x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\"/>\n", L, T, L, y(0));
  struct Series { const char* name; double AxleLoads::*f; };
  for (auto [name, f] : {Series{"steer", &AxleLoads::steer}, Series{"drive", &AxleLoads::drive},
                         Series{"trailer", &AxleLoads::trailer}}) {
    std::string pts;
    for (const auto& r : p.rows) pts += fmt::format("{:.1f},{:.1f} ", x(r.bar_moment), y(r.loads.*f));
    s += fmt::format("<polyline class=\"load {}\" points=\"{}\"><title>{} axle</title></polyline>\n", name, pts, name);
  }
  for (const auto& g : p.ratings) {
    if (g.rating != "front_gawr" && g.rating != "rear_gawr") continue;
    s += fmt::format("<line class=\"rating\" data-rating=\"{}\" x1=\"{}\" y1=\"{:.1f}\" x2=\"{}\" y2=\"{:.1f}\"><title>{}</title></line>\n",
                     esc(g.rating), L, y(g.limit), W - R, y(g.limit), esc(g.label));
  }
  if (p.target_moment) {
    s += fmt::format("<line class=\"target\" x1=\"{0:.1f}\" y1=\"{1}\" x2=\"{0:.1f}\" y2=\"{2}\"><title>target</title></line>\n",
                     x(*p.target_moment), T, y(0));
  }
  s += fmt::format("<text x=\"{}\" y=\"{}\">bar moment ({})</text></svg>\n", L, H - 8, esc(p.moment_unit));
  return s;
}

}  // namespace sp::serve
