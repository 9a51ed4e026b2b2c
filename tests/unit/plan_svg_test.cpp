// The console's plan chart (serve/plan_svg.h): a well-formed SVG element with every rating line,
// the target, words escaped and no non-finite number.
//
// References: XML 1.0 (Fifth Edition), W3C 2008: §2.1 well-formed documents (every start tag
// closed, properly nested), §2.2 allowed characters (no C0 controls but tab, LF, CR), §2.4 '<'
// and '&' never literal in character data, §3.1 attribute values quoted; SVG 1.1 (Second
// Edition), W3C 2011: §7.7 viewBox, §5.4 <title>/<desc>, §9.7 polyline points as number pairs;
// WAI-ARIA 1.2, W3C 2023: role "img" needs an accessible name (aria-label).
// The plan's numbers are the engine's (tests/unit/engine_plan_test.cpp); here only the drawing.
#include "serve/plan_svg.h"

// GCC 12 at -O1 with the sanitizers (the CI's ASan build) warns inside <regex>, in std::function's
// move (-Wmaybe-uninitialized): a false positive in the library's code, not in this test's.
#pragma GCC diagnostic ignored "-Wmaybe-uninitialized"
#include <doctest/doctest.h>

#include <cmath>
#include <cstdlib>
#include <regex>
#include <string>
#include <vector>

#include "engine/plan.h"

using namespace sp;

namespace {

const Units kLbIn{WeightUnit::lb, LengthUnit::in};

// The worked example of engine_plan_test.cpp (issue #2), with every rating the plan knows.
PlanResult example_plan(bool fifth_wheel = false) {
  TowVehicle tow;
  tow.wheelbase = 145;
  tow.rear_axle_to_ball = fifth_wheel ? -2 : 54;
  tow.front_gawr = 4100;
  tow.rear_gawr = 6200;
  tow.gvwr = 10200;
  tow.gcwr = 19000;
  tow.hitch_tongue_rating = 1200;
  tow.hitch_trailer_rating = 12000;
  Trailer tr;
  tr.type = fifth_wheel ? TrailerType::fifth_wheel : TrailerType::conventional;
  tr.ball_to_axle = 168;
  tr.gvwr = 9000;
  tr.axle_gawr = 7500;
  PlanLoads l;
  l.unhitched = AxleLoads{4000, 5000, 0};
  l.hitched = AxleLoads{4000 - 370.9, 5000 + 1366.9, 8300 - 996};
  const PlanBaseline b = make_baseline(tow, tr, l, kLbIn);
  PlanOptions o;
  o.falr_target = 50;
  return plan(tow, tr, b, kLbIn, o);
}

// A small XML 1.0 well-formedness check (§2.1, §2.4, §3.1): tags nest and close, attributes are
// quoted and unique, '&' starts a known entity, no '<' or C0 control in character data.
// Returns "" when well-formed, else what is wrong.
std::string xml_problem(const std::string& s) {
  std::vector<std::string> stack;
  std::size_t i = 0;
  const std::regex entity("^&(amp|lt|gt|quot|apos|#[0-9]+|#x[0-9A-Fa-f]+);");
  auto check_text = [&](const std::string& t) -> std::string {
    for (std::size_t k = 0; k < t.size(); ++k) {
      const auto c = static_cast<unsigned char>(t[k]);
      if (c < 0x20 && c != '\t' && c != '\n' && c != '\r') return "control character";
      if (t[k] == '<') return "literal < in text";
      if (t[k] == '&' && !std::regex_search(t.substr(k, 12), entity)) return "bare &";
    }
    return "";
  };
  while (i < s.size()) {
    const std::size_t lt = s.find('<', i);
    if (lt == std::string::npos) {
      if (auto e = check_text(s.substr(i)); !e.empty()) return e;
      break;
    }
    if (auto e = check_text(s.substr(i, lt - i)); !e.empty()) return e;
    // Find the tag's end outside quoted attribute values.
    std::size_t k = lt + 1;
    char quote = 0;
    for (; k < s.size(); ++k) {
      if (quote) {
        if (s[k] == quote) quote = 0;
      } else if (s[k] == '"' || s[k] == '\'') {
        quote = s[k];
      } else if (s[k] == '>') {
        break;
      }
    }
    if (k >= s.size()) return "unterminated tag";
    std::string tag = s.substr(lt + 1, k - lt - 1);
    i = k + 1;
    if (!tag.empty() && tag[0] == '/') {
      const std::string name = tag.substr(1);
      if (stack.empty() || stack.back() != name) return "mis-nested </" + name + ">";
      stack.pop_back();
      continue;
    }
    const bool self = !tag.empty() && tag.back() == '/';
    if (self) tag.pop_back();
    const std::regex name_re("^([A-Za-z][A-Za-z0-9:_-]*)");
    std::smatch m;
    if (!std::regex_search(tag, m, name_re)) return "bad tag <" + tag + ">";
    const std::string name = m[1];
    std::string rest = tag.substr(name.size());
    const std::regex attr_re("^\\s+([A-Za-z][A-Za-z0-9:_-]*)=\"([^\"<]*)\"");
    std::vector<std::string> seen;
    while (std::regex_search(rest, m, attr_re)) {
      for (const auto& a : seen)
        if (a == m[1]) return "duplicate attribute " + a + " on <" + name + ">";
      seen.push_back(m[1]);
      if (auto e = check_text(m[2]); !e.empty()) return e + " in attribute";
      rest = m.suffix();
    }
    if (rest.find_first_not_of(" \t\n") != std::string::npos)
      return "unquoted or malformed attribute in <" + tag + ">";
    if (!self) stack.push_back(name);
  }
  if (!stack.empty()) return "unclosed <" + stack.back() + ">";
  return "";
}

// Every numeric attribute parses as finite numbers (SVG 1.1 §9.7: points are number pairs).
std::string bad_number(const std::string& s) {
  const std::regex attr("\\s(x|y|x1|y1|x2|y2|cx|cy|r|width|height|points|viewBox)=\"([^\"]*)\"");
  for (auto it = std::sregex_iterator(s.begin(), s.end(), attr); it != std::sregex_iterator();
       ++it) {
    std::string v = (*it)[2];
    for (char& c : v)
      if (c == ',') c = ' ';
    const char* p = v.c_str();
    while (*p) {
      char* end = nullptr;
      const double d = std::strtod(p, &end);
      if (end == p || !std::isfinite(d)) return (*it)[1].str() + "=\"" + (*it)[2].str() + "\"";
      p = end;
      while (*p == ' ') ++p;
    }
  }
  return "";
}

std::size_t count(const std::string& s, const std::string& what) {
  std::size_t n = 0;
  for (std::size_t at = s.find(what); at != std::string::npos; at = s.find(what, at + 1)) ++n;
  return n;
}

}  // namespace

TEST_CASE("plan chart: one well-formed <svg id=plan-chart> element (XML 1.0 §2.1, SVG 1.1)") {
  const PlanResult p = example_plan();
  const std::string svg = serve::plan_svg(p, {"Example pickup + example travel trailer", false});
  CHECK(svg.rfind("<svg id=\"plan-chart\" xmlns=\"http://www.w3.org/2000/svg\"", 0) == 0);
  CHECK(xml_problem(svg) == "");
  CHECK(bad_number(svg) == "");
  CHECK(count(svg, "<svg") == 1);
  CHECK(svg.find("<script") == std::string::npos);
  CHECK(svg.find("style=") == std::string::npos);  // presentation attributes only (CSP)
  CHECK(svg.find("<style") == std::string::npos);
  // Deterministic.
  CHECK(svg == serve::plan_svg(p, {"Example pickup + example travel trailer", false}));
}

TEST_CASE("plan chart: accessible name, <title> and <desc> (WAI-ARIA 1.2 img, SVG 1.1 §5.4)") {
  const std::string svg = serve::plan_svg(example_plan(), {"Rig A", true});
  CHECK(svg.find("role=\"img\"") != std::string::npos);
  CHECK(std::regex_search(svg, std::regex("aria-label=\"Plan from the weighing: Rig A\\. Axle "
                                          "loads against bar moment from 0 to [0-9]+ lbf·ft")));
  CHECK(svg.find("<title>Plan from the weighing: Rig A: axle loads against bar moment</title>") !=
        std::string::npos);
  CHECK(svg.find("<desc>") != std::string::npos);
  // Before weighing, and when the caller does not say: the heading claims no weighing.
  CHECK(serve::plan_svg(example_plan(), {"Rig A", false}).find("<title>Plan before weighing: ") !=
        std::string::npos);
  CHECK(serve::plan_svg(example_plan()).find("<title>Plan: axle loads") != std::string::npos);
  CHECK(svg.find("without uncertainty") != std::string::npos);
}

TEST_CASE("plan chart: every rating the plan carries has a limit line and a line in words") {
  const PlanResult p = example_plan();
  REQUIRE(p.ratings.size() == 8);
  const std::string svg = serve::plan_svg(p);
  for (const PlanRating& r : p.ratings) {
    CAPTURE(r.rating);
    const std::string rating = r.label.substr(r.label.find(" vs ") + 4);
    const std::string limit_words = rating + " " + std::to_string(std::lround(r.limit)) + " lb";
    // The limit line (its <g> names it) and its label at the line's end.
    CHECK(svg.find("<g class=\"pc-rating\" aria-label=\"" + limit_words + "\">") !=
          std::string::npos);
    CHECK(svg.find(">" + limit_words + "</text>") != std::string::npos);
    // The rating in words under the chart, the plan's label first.
    CHECK(svg.find("data-rating=\"" + r.rating + "\"") != std::string::npos);
    CHECK(svg.find(r.label + " " + std::to_string(std::lround(r.limit)) + " lb: ") !=
          std::string::npos);
  }
  // Axle loads, ball load and the totals' quantities are drawn.
  for (const char* q : {"Steer axle", "Drive axle", "Trailer axles", "Ball load", "Tow vehicle",
                        "Whole rig", "Trailer weight", "Tongue load (bars slack)"})
    CHECK_MESSAGE(svg.find("<g class=\"pc-load\" aria-label=\"" + std::string(q) + "\">") !=
                      std::string::npos,
                  q);
  // Trailer weight is rated twice (trailer GVWR, hitch trailer rating) but drawn once.
  CHECK(count(svg, "<g class=\"pc-load\" aria-label=\"Trailer weight\">") == 1);
  // Every line of a panel has its own dash pattern (black-and-white print).
  const std::regex dash("stroke-dasharray=\"([^\"]+)\"><title>");
  std::vector<std::string> seen;
  for (auto it = std::sregex_iterator(svg.begin(), svg.end(), dash); it != std::sregex_iterator();
       ++it)
    seen.push_back((*it)[1]);
  CHECK(seen.size() >= 10);
}

TEST_CASE("plan chart: the target moment is marked where it is, in words") {
  const PlanResult p = example_plan();
  REQUIRE(p.target_moment);
  const std::string svg = serve::plan_svg(p);
  std::smatch m;
  REQUIRE(std::regex_search(svg, m, std::regex("<line class=\"pc-target\" x1=\"([0-9.]+)\"")));
  // Plot rectangle: left 78, width 760 - 78 - 210 = 472 user units (plan_svg.cpp layout);
  // x = left + M / max · width, to the 0.1 printed.
  const double want = 78 + *p.target_moment / p.rows.back().bar_moment * 472;
  CHECK(std::stod(m[1]) == doctest::Approx(want).epsilon(0.001));
  CHECK(std::regex_search(svg, std::regex("target 50 % FALR \\(default\\): [0-9]+ lbf·ft")));
  CHECK(svg.find("class=\"pc-full-restoration\"") != std::string::npos);
}

TEST_CASE("plan chart: a crossing inside the sweep is marked with its words") {
  PlanResult p = example_plan();
  // The steer axle gains with M: a front GAWR just above the slack load is exceeded inside.
  bool found = false;
  for (const PlanRating& r : p.ratings)
    if (r.exceeded == Exceeded::above || r.exceeded == Exceeded::below) found = true;
  if (!found) {
    PlanRating r;
    r.rating = "front_gawr";
    r.label = "Steer axle vs front GAWR";
    r.limit = p.rows.front().loads.steer + 50;
    r.at_zero = p.rows.front().loads.steer;
    r.slope = 0.2;
    r.exceeded = Exceeded::above;
    r.boundary = 250;
    p.ratings.push_back(r);
  }
  const std::string svg = serve::plan_svg(p);
  CHECK(xml_problem(svg) == "");
  CHECK(std::regex_search(svg, std::regex("<circle class=\"pc-crossing\"[^>]*><title>[^<]+ "
                                          "exceeded (above|below) [0-9]+ lbf·ft</title>")));
}

TEST_CASE("plan chart: words from outside are escaped (XML 1.0 §2.4, §2.2)") {
  const std::string evil = "<script>alert(1)</script> & \"quoted\" 'single' \x01\x1b";
  const std::string svg = serve::plan_svg(example_plan(), {evil, false});
  CHECK(svg.find("<script") == std::string::npos);
  CHECK(
      svg.find("&lt;script&gt;alert(1)&lt;/script&gt; &amp; &quot;quoted&quot; &#39;single&#39;") !=
      std::string::npos);
  CHECK(svg.find('\x01') == std::string::npos);
  CHECK(svg.find('\x1b') == std::string::npos);
  CHECK(xml_problem(svg) == "");
  CHECK(serve::xml_escape("a&b") == "a&amp;b");
  CHECK(serve::xml_escape("\x7f") == "\xEF\xBF\xBD");
  CHECK(serve::xml_escape("tab\tnewline\n") == "tab\tnewline\n");
  CHECK(serve::xml_escape("lbf·ft") == "lbf·ft");  // UTF-8 passes through
}

TEST_CASE("plan chart: a non-finite value is left out, never printed") {
  PlanResult p = example_plan();
  p.rows[3].loads.steer = std::nan("");
  p.rows[4].loads.drive = INFINITY;
  const std::string svg = serve::plan_svg(p);
  CHECK(xml_problem(svg) == "");
  CHECK(bad_number(svg) == "");
  CHECK(svg.find("nan") == std::string::npos);
  CHECK(svg.find("inf") == std::string::npos);
}

TEST_CASE("plan chart: a fifth wheel (no sweep) and a plan without ratings still draw") {
  const PlanResult fifth = example_plan(true);
  REQUIRE(fifth.rows.size() == 1);
  const std::string a = serve::plan_svg(fifth);
  CHECK(xml_problem(a) == "");
  CHECK(bad_number(a) == "");
  CHECK(a.find("No bar moment sweep") != std::string::npos);
  CHECK(a.find("Pin load") != std::string::npos);

  PlanResult bare = example_plan();
  bare.ratings.clear();
  const std::string b = serve::plan_svg(bare);
  CHECK(xml_problem(b) == "");
  CHECK(b.find("No ratings given") != std::string::npos);
  CHECK(b.find("Totals") == std::string::npos);  // only the axle panel
  // The x axis has ticks in the moment unit and the y axis in the weight unit.
  CHECK(b.find(">bar moment (lbf·ft)</text>") != std::string::npos);
  CHECK(b.find(">load (lb)</text>") != std::string::npos);
}
