#include "format/plan_output.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

namespace sp {

namespace {

using nlohmann::ordered_json;

// Wording shared with the weigh-report's cautions (reports/): short form for a terminal.
constexpr const char* kPlanCaution =
    "Caution: towing can hurt people. This plan is arithmetic on the numbers given; it does not "
    "replace the vehicle and hitch makers' instructions, local law, or an inspection by a "
    "qualified person. Weigh the rig at the chosen setting before you travel.";

std::string w0(double v) {
  return fmt::format("{:.0f}", v);
}

std::string len(double v) {
  // Lengths to 0.1 of the unit, without a trailing ".0" for whole values.
  std::string s = fmt::format("{:.1f}", v);
  if (s.size() > 2 && s.compare(s.size() - 2, 2, ".0") == 0) s.resize(s.size() - 2);
  return s;
}

std::string paint(const std::string& s, const char* code, bool colour) {
  return colour ? fmt::format("\x1b[{}m{}\x1b[0m", code, s) : s;
}

double interpolate(const std::vector<PlanRow>& rows, double m, double (*f)(const PlanRow&)) {
  if (rows.size() == 1) return f(rows[0]);
  const double m0 = rows.front().bar_moment, m1 = rows.back().bar_moment;
  const double t = (m - m0) / (m1 - m0);
  return f(rows.front()) + t * (f(rows.back()) - f(rows.front()));  // loads are linear in M
}

ordered_json opt(const std::optional<double>& v) {
  return v ? ordered_json(*v) : ordered_json();
}

ordered_json row_json(const PlanRow& r) {
  return ordered_json{
      {"bar_moment", r.bar_moment}, {"steer", r.loads.steer},   {"drive", r.loads.drive},
      {"trailer", r.loads.trailer}, {"ball_load", r.ball_load}, {"falr", opt(r.falr)},
      {"tow_total", r.tow_total},   {"combined", r.combined},   {"over", r.over}};
}

// Lines of at most ~96 columns, each starting with `indent` (words never split).
std::string wrap_words(const std::string& text, const std::string& indent) {
  std::string out, line;
  std::size_t pos = 0;
  while (pos < text.size()) {
    std::size_t end = text.find(' ', pos);
    if (end == std::string::npos) end = text.size();
    const std::string word = text.substr(pos, end - pos);
    if (!line.empty() && indent.size() + line.size() + 1 + word.size() > 96) {
      out += indent + line + "\n";
      line.clear();
    }
    line += (line.empty() ? "" : " ") + word;
    pos = end + 1;
  }
  return out + indent + line + "\n";
}

std::string verdict_reason_of(const PlanLabels& l) {
  if (!l.verdict_reason.empty()) return l.verdict_reason;
  return "A plan before weighing is arithmetic on the numbers given, not a proof; weigh the rig "
         "at the chosen setting.";
}

}  // namespace

std::string rating_words(const std::string& key) {
  static const std::pair<const char*, const char*> kWords[] = {
      {"front_gawr", "front GAWR"},
      {"rear_gawr", "rear GAWR"},
      {"gvwr", "GVWR"},
      {"gcwr", "GCWR"},
      {"trailer_gvwr", "trailer GVWR"},
      {"trailer_axle_gawr", "trailer axle GAWR"},
      {"hitch_tongue_rating", "hitch tongue rating"},
      {"hitch_trailer_rating", "hitch trailer rating"}};
  for (const auto& [k, w] : kWords)
    if (key == k) return w;
  return key;
}

std::string text_chart(const std::vector<ChartSeries>& series, double x0, double x1,
                       const std::string& x_label, const std::string& y_label,
                       std::optional<double> reference, std::optional<double> x_mark, int width,
                       int height) {
  if (series.empty() || width < 8 || height < 3) return "";
  double lo = INFINITY, hi = -INFINITY;
  for (const ChartSeries& s : series)
    for (double v : s.y) {
      lo = std::min(lo, v);
      hi = std::max(hi, v);
    }
  if (reference) {
    lo = std::min(lo, *reference);
    hi = std::max(hi, *reference);
  }
  if (!(hi > lo)) {
    hi = lo + 1;
    lo -= 1;
  }
  const double pad = 0.05 * (hi - lo);
  lo -= pad;
  hi += pad;
  const auto W = static_cast<std::size_t>(width), H = static_cast<std::size_t>(height);
  std::vector<std::string> grid(H, std::string(W, ' '));
  auto row_of = [&](double y) {
    const double r = std::round((hi - y) / (hi - lo) * (height - 1));
    return static_cast<std::size_t>(std::clamp(r, 0.0, static_cast<double>(height - 1)));
  };
  auto col_of = [&](double x) {
    const double c = x1 > x0 ? std::round((x - x0) / (x1 - x0) * (width - 1)) : 0.0;
    return static_cast<std::size_t>(std::clamp(c, 0.0, static_cast<double>(width - 1)));
  };
  if (reference)
    for (std::size_t c = 0; c < W; c += 2) grid[row_of(*reference)][c] = '-';
  if (x_mark && *x_mark >= x0 && *x_mark <= x1)
    for (std::size_t r = 0; r < H; ++r) grid[r][col_of(*x_mark)] = ':';
  for (const ChartSeries& s : series) {
    const std::size_t n = s.y.size();
    for (std::size_t c = 0; c < W; ++c) {
      // Sample the series at this column (linear between its points).
      const double t =
          static_cast<double>(c) / static_cast<double>(W - 1) * static_cast<double>(n - 1);
      const auto i = std::min(static_cast<std::size_t>(t), n - 2);
      const double y = s.y[i] + (t - static_cast<double>(i)) * (s.y[i + 1] - s.y[i]);
      char& cell = grid[row_of(y)][c];
      cell = (cell == ' ' || cell == '-' || cell == ':' || cell == s.symbol) ? s.symbol : '#';
    }
  }
  std::string out = fmt::format("{:>8}\n", y_label);
  for (std::size_t r = 0; r < H; ++r) {
    const double y = hi - (hi - lo) * static_cast<double>(r) / static_cast<double>(H - 1);
    const bool ref_row = reference && r == row_of(*reference);
    const bool label = r == 0 || r == H - 1 || r == H / 2 || ref_row;
    out += fmt::format("{:>8} |{}\n", ref_row ? w0(*reference) : label ? w0(y) : "", grid[r]);
  }
  out += fmt::format("{:>8} +{}\n", "", std::string(W, '-'));
  std::string axis(W + 2, ' ');
  const std::string a = w0(x0), b = w0(x1);
  axis.replace(0, a.size(), a);
  axis.replace(W + 2 - b.size(), b.size(), b);
  out += fmt::format("{:>8} {}  {}\n", "", axis, x_label);
  std::string legend;
  for (const ChartSeries& s : series) legend += fmt::format("  {} {}", s.symbol, s.name);
  if (reference) legend += "  - 100 % of rating";
  if (x_mark) legend += "  : target";
  out += fmt::format("{:>8}{}   (# where lines cross)\n", "", legend);
  return out;
}

std::string exceeded_words(const PlanRating& r, const PlanResult& p) {
  const std::string& mu = p.moment_unit;
  const bool sweep = p.rows.size() >= 2;
  const std::string range =
      sweep ? fmt::format(" from 0 to {} {}", w0(p.rows.back().bar_moment), mu) : "";
  switch (r.exceeded) {
    case Exceeded::never:
      return "not exceeded" + range;
    case Exceeded::always:
      return "EXCEEDED" + range;
    case Exceeded::above:
      return r.boundary ? fmt::format("exceeded above {} {}", w0(*r.boundary), mu) : "exceeded";
    case Exceeded::below:
      return r.boundary ? fmt::format("exceeded below {} {}", w0(*r.boundary), mu) : "exceeded";
  }
  return "";
}

std::string plan_text(const PlanResult& p, const PlanLabels& labels, bool colour) {
  const std::string wu(to_string(p.units.weight)), lu(to_string(p.units.length));
  const std::string& mu = p.moment_unit;
  const bool fifth = p.trailer_type == TrailerType::fifth_wheel;
  std::string o;
  // The verdict leads (RULES.md), the weighing's when there is one.
  const char* vcode = labels.verdict == Verdict::compliant   ? "32"
                      : labels.verdict == Verdict::undecided ? "33"
                                                             : "31";
  o += (labels.weighed ? "Verdict of the weighing: " : "Verdict: ") +
       paint(std::string(to_string(labels.verdict)), vcode, colour) + "\n";
  o += wrap_words(verdict_reason_of(labels), "  ") + "\n";
  o += labels.weighed ? "Plan from the weighing" : "Plan before weighing";
  if (!labels.tow.empty() || !labels.trailer.empty())
    o += ": " + labels.tow + (labels.trailer.empty() ? "" : " + " + labels.trailer);
  o += "\n";
  o += fmt::format("  geometry     wheelbase {} {}, {} {} {}, {} {} {}\n", len(p.wheelbase), lu,
                   fifth ? "drive axle to kingpin" : "rear axle to ball", len(p.rear_axle_to_ball),
                   lu, fifth ? "kingpin to trailer axle" : "ball to trailer axle",
                   len(p.ball_to_axle), lu);
  o += fmt::format("  {}   from {}\n", fifth ? "hitched   " : "bars slack", p.baseline.source);
  o += fmt::format("               tow vehicle alone: steer {} {}, drive {} {}\n",
                   w0(p.baseline.steer0), wu, w0(p.baseline.drive0), wu);
  o += fmt::format("               trailer {} {}, {} {} {} ({:.1f} %)\n\n", w0(p.trailer_weight),
                   wu, fifth ? "pin load" : "tongue", w0(p.baseline.tongue), wu, p.tongue_percent);

  // The table: fixed-width right-aligned columns.
  o +=
      fmt::format("  {:>10} {:>7} {:>7} {:>8} {:>6} {:>6} {:>9} {:>9}  {}\n", "bar moment", "steer",
                  "drive", "trailer", "ball", "FALR", "tow total", "combined", "ratings exceeded");
  o += fmt::format("  {:>10} {:>7} {:>7} {:>8} {:>6} {:>6} {:>9} {:>9}\n", mu, wu, wu, wu, wu, "%",
                   wu, wu);
  auto line = [&](const PlanRow& r, const char* tag) {
    std::string over;
    for (const auto& k : r.over) over += (over.empty() ? "" : ", ") + rating_words(k);
    return fmt::format("  {:>10} {:>7} {:>7} {:>8} {:>6} {:>6} {:>9} {:>9}  {}{}\n",
                       w0(r.bar_moment), w0(r.loads.steer), w0(r.loads.drive), w0(r.loads.trailer),
                       w0(r.ball_load), r.falr ? fmt::format("{:.1f}", *r.falr) : "-",
                       w0(r.tow_total), w0(r.combined),
                       over.empty() ? "" : paint(over, "31", colour), tag);
  };
  for (const PlanRow& r : p.rows) o += line(r, "");
  o += "\n";

  if (p.target_moment && p.at_target) {
    o += fmt::format(
        "  Target: {:.0f} % FALR ({}) needs {} {};\n          predicted steer {} {}, "
        "drive {} {}, trailer axles {} {}, ball {} {}.\n",
        p.falr_target, p.falr_from_rig ? "the rig's figure" : "default", w0(*p.target_moment), mu,
        w0(p.at_target->loads.steer), wu, w0(p.at_target->loads.drive), wu,
        w0(p.at_target->loads.trailer), wu, w0(p.at_target->ball_load), wu);
    o += fmt::format("  Full restoration (100 % FALR) at {} {}; more than that over-restores.\n",
                     w0(*p.full_restoration), mu);
  }
  if (!p.ratings.empty()) {
    o += "\n  Ratings\n";
    std::size_t wlabel = 0;
    for (const PlanRating& r : p.ratings) wlabel = std::max(wlabel, r.label.size());
    for (const PlanRating& r : p.ratings) {
      const bool bad = r.exceeded != Exceeded::never;
      o += fmt::format("  {:<{}}  {:>7} {}  {}\n", r.label, wlabel, w0(r.limit), wu,
                       paint(exceeded_words(r, p), bad ? "31" : "32", colour));
    }
  } else {
    o += "\n  No ratings given: nothing to check the loads against (add --gvwr, --front-gawr, "
         "...).\n";
  }

  // Chart: each axle as a percentage of its rating when rated, else its change from slack.
  if (p.rows.size() >= 2) {
    std::vector<ChartSeries> series;
    const int n = 25;
    const double m0 = p.rows.front().bar_moment, m1 = p.rows.back().bar_moment;
    struct Pick {
      char sym;
      const char* key;
      const char* name;
      double (*f)(const PlanRow&);
    };
    const Pick picks[] = {
        {'S', "front_gawr", "steer", [](const PlanRow& r) { return r.loads.steer; }},
        {'D', "rear_gawr", "drive", [](const PlanRow& r) { return r.loads.drive; }},
        {'G', "gvwr", "tow total", [](const PlanRow& r) { return r.tow_total; }},
        {'A', "trailer_axle_gawr", "trailer axles",
         [](const PlanRow& r) { return r.loads.trailer; }},
    };
    bool rated = false;
    for (const Pick& k : picks)
      for (const PlanRating& r : p.ratings)
        if (r.rating == k.key) rated = true;
    for (const Pick& k : picks) {
      const PlanRating* rating = nullptr;
      for (const PlanRating& r : p.ratings)
        if (r.rating == k.key) rating = &r;
      if (rated && rating == nullptr) continue;
      if (!rated && k.sym == 'G') continue;
      ChartSeries s;
      s.symbol = k.sym;
      s.name = k.name;
      for (int i = 0; i < n; ++i) {
        const double m = m0 + (m1 - m0) * i / (n - 1);
        const double v = interpolate(p.rows, m, k.f);
        s.y.push_back(rated ? 100.0 * v / rating->limit : v - k.f(p.rows.front()));
      }
      series.push_back(std::move(s));
    }
    o += "\n";
    o += text_chart(series, m0, m1, "bar moment, " + mu, rated ? "% rating" : "change " + wu,
                    rated ? std::optional<double>(100.0) : std::nullopt, p.target_moment);
  }
  if (!p.notes.empty()) {
    o += "\n";
    for (const std::string& n : p.notes) o += "  Note: " + n + "\n";
  }
  o += "\n  " + std::string(kPlanCaution) + "\n";
  return o;
}

ordered_json plan_to_json(const PlanResult& p, const PlanLabels& labels) {
  ordered_json j;
  j["verdict"] = to_string(labels.verdict);
  j["verdict_reason"] = verdict_reason_of(labels);
  j["units"] = {{"weight", to_string(p.units.weight)}, {"length", to_string(p.units.length)}};
  j["moment_unit"] = p.moment_unit;
  j["tow_vehicle"] = labels.tow;
  j["trailer"] = labels.trailer;
  j["trailer_type"] = to_string(p.trailer_type);
  j["geometry"] = {{"wheelbase", p.wheelbase},
                   {"rear_axle_to_ball", p.rear_axle_to_ball},
                   {"ball_to_axle", p.ball_to_axle}};
  j["baseline"] = {{"steer", p.baseline.steer0},
                   {"drive", p.baseline.drive0},
                   {"trailer_axles", p.baseline.axles0},
                   {"tongue_load", p.baseline.tongue},
                   {"source", p.baseline.source}};
  j["trailer_weight"] = p.trailer_weight;
  j["tongue_percent"] = p.tongue_percent;
  j["falr_target"] = p.falr_target;
  j["falr_from_rig"] = p.falr_from_rig;
  j["full_restoration"] = opt(p.full_restoration);
  if (p.target_moment && p.at_target) {
    ordered_json t = row_json(*p.at_target);
    j["target"] = t;
  } else {
    j["target"] = nullptr;
  }
  j["rows"] = ordered_json::array();
  for (const PlanRow& r : p.rows) j["rows"].push_back(row_json(r));
  j["ratings"] = ordered_json::array();
  for (const PlanRating& r : p.ratings)
    j["ratings"].push_back({{"rating", r.rating},
                            {"label", r.label},
                            {"limit", r.limit},
                            {"at_zero", r.at_zero},
                            {"slope", r.slope},
                            {"exceeded", to_string(r.exceeded)},
                            {"boundary", opt(r.boundary)}});
  j["notes"] = p.notes;
  return j;
}

}  // namespace sp
