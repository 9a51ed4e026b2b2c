// `scaleproof plan`: for owners, before (or between) weighings. From the rig's geometry and
// ratings (flags, or a session file) and the loads with the bars slack (a session's passes, a
// hitched pass, or estimates), a table of axle loads across bar moments, the moment for the
// FALR target, where each rating would be exceeded, and a small chart; `--json` for machines.
// Exit: 0 planned; 2 usage (missing loads, bad flag); 65 invalid data; 66 no such file.
#include <fmt/format.h>

#include <iostream>
#include <iterator>
#include <memory>
#include <sstream>

#include "cli/commands.h"
#include "core/error.h"
#include "engine/plan.h"
#include "engine/reconcile.h"
#include "format/plan_output.h"
#include "format/result_units.h"
#include "format/session_json.h"
#include "ops/plan_session.h"
#include "report/key_files.h"

namespace sp::cli {

namespace {

struct PlanFlags {
  std::string session_file;
  std::string weight_unit = "lb", length_unit = "in";
  std::optional<double> wheelbase, rear_axle_to_ball, ball_to_axle;
  bool fifth_wheel = false;
  std::optional<double> gvwr, front_gawr, rear_gawr, gcwr, tongue_rating, trailer_rating;
  std::optional<double> trailer_gvwr, trailer_axle_gawr;
  std::string unhitched, hitched;
  std::optional<double> tongue, trailer_weight;
  std::optional<double> falr, max_moment;
  int steps = 10;
  bool json = false;
};

// "3480,2700" -> {3480, 2700}; usage error naming the flag otherwise.
std::vector<double> parse_loads(const std::string& text, const char* flag, std::size_t n,
                                const char* shape) {
  std::vector<double> v;
  std::stringstream ss(text);
  std::string item;
  while (std::getline(ss, item, ',')) {
    try {
      std::size_t used = 0;
      const double x = std::stod(item, &used);
      if (used != item.size() || !(x >= 0)) throw std::invalid_argument(item);
      v.push_back(x);
    } catch (const std::exception&) {
      v.clear();
      break;
    }
  }
  if (v.size() != n)
    throw usage_error(std::string("plan: ") + flag + ": expected " + shape +
                      " (weights >= 0 separated by commas), got \"" + text + "\"");
  return v;
}

void override(std::optional<double>& target, const std::optional<double>& flag) {
  if (flag) target = flag;
}

void run_plan(const PlanFlags& f, const Context& ctx) {
  TowVehicle tow;
  Trailer trailer;
  Units units;
  PlanLoads loads;
  bool from_session = false;  // loads are the engine's reconciled values of a session file
  std::vector<std::string> notes;
  PlanLabels labels;
  if (!f.session_file.empty()) {
    std::string text;
    if (f.session_file == "-") {
      text.assign(std::istreambuf_iterator<char>(std::cin), std::istreambuf_iterator<char>());
    } else {
      text = report::read_file_bytes(f.session_file);
    }
    const Session s = parse_session_json(text, f.session_file == "-" ? "<stdin>" : f.session_file);
    tow = s.tow_vehicle;
    trailer = s.trailer;
    units = s.units;
    loads = ops::loads_from_session(s, notes, tow, trailer, labels);
    from_session = loads.unhitched && loads.tongue && loads.trailer_weight && !loads.hitched;
  } else {
    auto wu = parse_weight_unit(f.weight_unit);
    auto lu = parse_length_unit(f.length_unit);
    if (!wu) throw usage_error("plan: --weight-unit: expected lb or kg, got " + f.weight_unit);
    if (!lu)
      throw usage_error("plan: --length-unit: expected in, ft, mm, cm or m, got " + f.length_unit);
    units = Units{*wu, *lu};
    if (!f.wheelbase || !f.rear_axle_to_ball || !f.ball_to_axle)
      throw usage_error(
          "plan: give a session file, or the geometry: --wheelbase, --rear-axle-to-ball and "
          "--ball-to-axle");
    trailer.type = f.fifth_wheel ? TrailerType::fifth_wheel : TrailerType::conventional;
  }
  // Flags override or complete what the file gave.
  if (f.wheelbase) tow.wheelbase = *f.wheelbase;
  if (f.rear_axle_to_ball) tow.rear_axle_to_ball = *f.rear_axle_to_ball;
  if (f.ball_to_axle) trailer.ball_to_axle = *f.ball_to_axle;
  if (f.fifth_wheel) trailer.type = TrailerType::fifth_wheel;
  override(tow.gvwr, f.gvwr);
  override(tow.front_gawr, f.front_gawr);
  override(tow.rear_gawr, f.rear_gawr);
  override(tow.gcwr, f.gcwr);
  override(tow.hitch_tongue_rating, f.tongue_rating);
  override(tow.hitch_trailer_rating, f.trailer_rating);
  override(trailer.gvwr, f.trailer_gvwr);
  override(trailer.axle_gawr, f.trailer_axle_gawr);
  if (!f.unhitched.empty() || !f.hitched.empty() || f.tongue || f.trailer_weight) {
    loads = PlanLoads{};  // loads given on the command line replace the session's
    from_session = false;
    labels = PlanLabels{};  // no longer the weighing's plan, nor its verdict
    notes.clear();
    if (!f.unhitched.empty()) {
      auto v = parse_loads(f.unhitched, "--unhitched", 2, "STEER,DRIVE");
      loads.unhitched = AxleLoads{v[0], v[1], 0};
    }
    if (!f.hitched.empty()) {
      auto v = parse_loads(f.hitched, "--hitched", 3, "STEER,DRIVE,TRAILER");
      loads.hitched = AxleLoads{v[0], v[1], v[2]};
    }
    loads.tongue = f.tongue;
    loads.trailer_weight = f.trailer_weight;
  }

  // --units: plan in the requested system (inputs converted first, so every number agrees).
  if (auto system = parse_unit_system(ctx.units)) {
    const Units to = units_of(*system);
    convert_rig_units(tow, trailer, units, to);
    const double wf = weight_factor(units.weight, to.weight);
    for (auto* a : {&loads.unhitched, &loads.hitched})
      if (*a) **a = AxleLoads{(*a)->steer * wf, (*a)->drive * wf, (*a)->trailer * wf};
    if (loads.tongue) *loads.tongue *= wf;
    if (loads.trailer_weight) *loads.trailer_weight *= wf;
    units = to;
  }

  PlanOptions po;
  po.falr_target = f.falr;
  po.max_moment = f.max_moment;
  po.steps = f.steps;
  PlanBaseline base = make_baseline(tow, trailer, loads, units);
  if (from_session) base.source = "the passes of " + f.session_file + ", reconciled";
  PlanResult r = plan(tow, trailer, base, units, po);
  r.notes.insert(r.notes.begin(), notes.begin(), notes.end());
  labels.tow = tow.label;
  labels.trailer = trailer.label;
  if (f.json) {
    std::cout << plan_to_json(r, labels).dump(2) << "\n";
  } else if (!ctx.quiet) {
    std::cout << plan_text(r, labels, ctx.colour);
  } else if (r.target_moment) {
    // --quiet: only the answer asked for, the moment for the target.
    std::cout << fmt::format("{:.0f} {}\n", *r.target_moment, r.moment_unit);
  }
}

}  // namespace

void register_plan(CLI::App& app, Context& ctx) {
  CLI::App* sub = app.add_subcommand(
      "plan",
      "Plan a bar setting: axle loads across bar moments, the moment for the FALR "
      "target, and where each rating would be exceeded");
  auto f = std::make_shared<PlanFlags>();
  sub->add_option("SESSION", f->session_file,
                  "Session file (scaleproof-session/1 JSON, - for stdin) giving the rig and its "
                  "unhitched/hitched passes; flags below override it");
  const char* g_rig = "Rig (without a session file)";
  sub->add_option("--weight-unit", f->weight_unit, "Weight unit of the flags: lb or kg")
      ->check(CLI::IsMember({"lb", "kg"}))
      ->group(g_rig);
  sub->add_option("--length-unit", f->length_unit, "Length unit of the flags: in, ft, mm, cm, m")
      ->check(CLI::IsMember({"in", "ft", "mm", "cm", "m"}))
      ->group(g_rig);
  sub->add_option("--wheelbase", f->wheelbase, "Steer axle to drive axle (maker's spec)")
      ->group(g_rig);
  sub->add_option("--rear-axle-to-ball", f->rear_axle_to_ball,
                  "Drive axle to hitch ball, positive behind the axle")
      ->group(g_rig);
  sub->add_option("--ball-to-axle", f->ball_to_axle,
                  "Hitch ball to the trailer's effective axle (tandem mid-point)")
      ->group(g_rig);
  sub->add_flag("--fifth-wheel", f->fifth_wheel, "The trailer is a fifth wheel / gooseneck")
      ->group(g_rig);
  const char* g_rat = "Ratings (weight unit; any may be left out)";
  sub->add_option("--gvwr", f->gvwr, "Tow vehicle GVWR")->group(g_rat);
  sub->add_option("--front-gawr", f->front_gawr, "Front (steer) axle GAWR")->group(g_rat);
  sub->add_option("--rear-gawr", f->rear_gawr, "Rear (drive) axle GAWR")->group(g_rat);
  sub->add_option("--gcwr", f->gcwr, "GCWR of the whole rig")->group(g_rat);
  sub->add_option("--hitch-tongue-rating", f->tongue_rating, "Hitch tongue-load rating")
      ->group(g_rat);
  sub->add_option("--hitch-trailer-rating", f->trailer_rating, "Hitch trailer-weight rating")
      ->group(g_rat);
  sub->add_option("--trailer-gvwr", f->trailer_gvwr, "Trailer GVWR")->group(g_rat);
  sub->add_option("--trailer-axle-gawr", f->trailer_axle_gawr, "GAWR of all trailer axles together")
      ->group(g_rat);
  const char* g_loads = "Loads with the bars slack (replace the session's)";
  sub->add_option("--unhitched", f->unhitched, "Tow vehicle alone: STEER,DRIVE")->group(g_loads);
  sub->add_option("--hitched", f->hitched, "Hitched, bars slack: STEER,DRIVE,TRAILER")
      ->group(g_loads);
  sub->add_option("--tongue", f->tongue, "Estimated tongue load (e.g. from a tongue scale)")
      ->group(g_loads);
  sub->add_option("--trailer-weight", f->trailer_weight, "Whole trailer weight")->group(g_loads);
  sub->add_option("--falr", f->falr, "FALR target in % (default: the rig's, else 50)")
      ->check(CLI::Range(0.0, 100.0));
  sub->add_option("--max-moment", f->max_moment,
                  "Last bar moment of the table, lbf·ft (lb) or N·m (kg); default 125 % of full "
                  "restoration");
  sub->add_option("--steps", f->steps, "Table rows after the first (1-200)")
      ->check(CLI::Range(1, 200));
  sub->add_flag("--json", f->json, "Print the plan as JSON");
  sub->footer(
      "Examples:\n"
      "  # from a weighing (reconciled unhitched + hitched passes):\n"
      "  scaleproof plan data-demo/sessions/01-pickup-travel-trailer.json\n"
      "  # before any weighing: geometry, ratings, one hitched pass and a tongue-scale reading\n"
      "  scaleproof plan --wheelbase 145 --rear-axle-to-ball 50 --ball-to-axle 204 \\\n"
      "      --front-gawr 3900 --rear-gawr 4250 --gvwr 7250 --hitched 3160,3940,6480 --tongue 920");
  sub->callback([f, &ctx] { run_plan(*f, ctx); });
}

}  // namespace sp::cli
