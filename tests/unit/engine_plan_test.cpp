// scaleproof plan: predictions across bar moments (engine/plan.h).
//
// Reference: the worked example of issue #2 (common practice, no source): trailer 8 300 lb,
// tongue 996 lb (12 %), ball to trailer axle 14 ft (168 in); hitching with the bars slack the
// steer axle loses 371 lb and the drive axle gains 1 367 lb (WB 145 in, rear axle to ball
// 54 in); 7 000 lbf·ft leaves 496 lb on the ball, puts 500 lb on the trailer axles, and makes
// the changes from unhitched +395 lb steer, +101 lb drive; 50 % FALR needs about 1 696 lbf·ft,
// moves 121 lb to the trailer axles, leaves the steer axle 186 lb down and the drive axle about
// 1 060 lb up.
#include <doctest/doctest.h>

#include <cmath>
#include <string>

#include "core/error.h"
#include "engine/plan.h"

using namespace sp;

namespace {

const Units kLbIn{WeightUnit::lb, LengthUnit::in};
constexpr double kSteer0 = 4000, kDrive0 = 5000, kTongue = 996, kAxles0 = 8300 - 996;

TowVehicle example_tow() {
  TowVehicle t;
  t.wheelbase = 145;
  t.rear_axle_to_ball = 54;
  return t;
}

Trailer example_trailer() {
  Trailer t;
  t.ball_to_axle = 168;
  return t;
}

// The hitched pass the worked example describes (steer -371, drive +1367, rounded as printed).
PlanLoads example_loads() {
  PlanLoads l;
  l.unhitched = AxleLoads{kSteer0, kDrive0, 0};
  l.hitched = AxleLoads{kSteer0 - 370.9, kDrive0 + 1366.9, kAxles0};
  return l;
}

}  // namespace

TEST_CASE("plan reproduces the issue #2 worked example (common practice, no source)") {
  const PlanBaseline b = make_baseline(example_tow(), example_trailer(), example_loads(), kLbIn);
  CHECK(b.tongue == doctest::Approx(kTongue).epsilon(1e-3));
  PlanOptions o;
  o.falr_target = 50;
  o.max_moment = 7000;
  o.steps = 1;
  const PlanResult r = plan(example_tow(), example_trailer(), b, kLbIn, o);
  REQUIRE(r.rows.size() == 2);
  struct Row { std::string what; double got; double want; double tol; };
  const Row rows[] = {
      {"trailer weight", r.trailer_weight, 8300, 0.5},
      {"tongue percent", r.tongue_percent, 12, 0.01},
      {"hitched steer change", r.rows[0].loads.steer - kSteer0, -371, 0.5},
      {"hitched drive change", r.rows[0].loads.drive - kDrive0, 1367, 0.5},
      {"7000: ball load", r.rows[1].ball_load, 496, 0.5},
      {"7000: trailer axles gain", r.rows[1].loads.trailer - kAxles0, 500, 0.5},
      {"7000: steer change", r.rows[1].loads.steer - kSteer0, 395, 0.5},
      {"7000: drive change", r.rows[1].loads.drive - kDrive0, 101, 0.5},
      {"50 %: moment", *r.target_moment, 1696, 1.0},
      // Half of the 370.9 lb the steer axle lost: -185.5, which the issue prints as -186.
      {"50 %: steer change", r.at_target->loads.steer - kSteer0, -186, 1.0},
      {"50 %: trailer axles gain", r.at_target->loads.trailer - kAxles0, 121, 0.5},
      {"50 %: drive change", r.at_target->loads.drive - kDrive0, 1060, 2.0},
      {"50 %: FALR", *r.at_target->falr, 50, 1e-6},
  };
  for (const Row& row : rows) {
    CAPTURE(row.what);
    CAPTURE(row.got);
    CHECK(std::fabs(row.got - row.want) <= row.tol);
  }
}

TEST_CASE("every way of giving the loads leads to the same baseline") {
  const TowVehicle tow = example_tow();
  const Trailer tr = example_trailer();
  const PlanBaseline ref = make_baseline(tow, tr, example_loads(), kLbIn);
  PlanLoads hitched_tongue, hitched_weight, unhitched_estimates;
  hitched_tongue.hitched = example_loads().hitched;
  hitched_tongue.tongue = ref.tongue;
  hitched_weight.hitched = example_loads().hitched;
  hitched_weight.trailer_weight = ref.tongue + ref.axles0;
  unhitched_estimates.unhitched = example_loads().unhitched;
  unhitched_estimates.tongue = ref.tongue;
  unhitched_estimates.trailer_weight = ref.tongue + ref.axles0;
  struct Case { std::string name; PlanLoads loads; };
  const Case cases[] = {{"hitched + tongue", hitched_tongue},
                        {"hitched + trailer weight", hitched_weight},
                        {"unhitched + tongue + trailer weight", unhitched_estimates}};
  for (const Case& c : cases) {
    CAPTURE(c.name);
    const PlanBaseline b = make_baseline(tow, tr, c.loads, kLbIn);
    // The hitched pass was keyed to 0.1 lb, so undoing the hitch lands within 0.05 lb.
    CHECK(std::fabs(b.steer0 - ref.steer0) < 0.05);
    CHECK(std::fabs(b.drive0 - ref.drive0) < 0.05);
    CHECK(std::fabs(b.axles0 - ref.axles0) < 0.05);
    CHECK(std::fabs(b.tongue - ref.tongue) < 0.05);
  }
}

TEST_CASE("where each rating is exceeded along the moment axis") {
  TowVehicle tow = example_tow();
  Trailer tr = example_trailer();
  // Limits chosen around the worked example's loads. Full restoration (100 % FALR) gives back
  // the 371 lb the steer axle lost, at 996·54·168/222 lb·in = 3 391.9 lbf·ft (references.md:
  // M = f·T·o·L/(L + o)); the steer axle regains load linearly, so it reaches S0 - 100 at
  // 271/371 of that moment.
  tow.front_gawr = kSteer0 - 100;
  tow.rear_gawr = kDrive0 + 1000;      // exceeded hitched, relieved as the bars move load away
  tow.gcwr = kSteer0 + kDrive0 + 8300 - 1;  // total never changes: exceeded at every moment
  tr.axle_gawr = 1e6;               // crosses far beyond the table: never within its range
  const PlanBaseline b = make_baseline(tow, tr, example_loads(), kLbIn);
  const PlanResult r = plan(tow, tr, b, kLbIn);
  REQUIRE(r.full_restoration);
  CHECK(*r.full_restoration == doctest::Approx(996.0 * 54 * 168 / 222 / 12).epsilon(1e-3));
  struct Want { std::string rating; Exceeded where; double boundary; };
  const Want wants[] = {
      {"front_gawr", Exceeded::above, 271.0 / 371.0 * 996.0 * 54 * 168 / 222 / 12},
      {"rear_gawr", Exceeded::below, -1},
      {"gcwr", Exceeded::always, -1},
      {"trailer_axle_gawr", Exceeded::never, -1},
  };
  REQUIRE(r.ratings.size() == 4);
  for (const Want& w : wants) {
    CAPTURE(w.rating);
    const PlanRating* found = nullptr;
    for (const PlanRating& pr : r.ratings)
      if (pr.rating == w.rating) found = &pr;
    REQUIRE(found != nullptr);
    CHECK(found->exceeded == w.where);
    if (w.boundary > 0) {
      REQUIRE(found->boundary);
      CHECK(*found->boundary == doctest::Approx(w.boundary).epsilon(2e-3));
    }
  }
  // The rear axle sheds M/L + M(1 + o/L)/WB: at the boundary the drive load equals the limit.
  for (const PlanRating& pr : r.ratings) {
    if (pr.rating != "rear_gawr") continue;
    REQUIRE(pr.boundary);
    CHECK(pr.at_zero + pr.slope * *pr.boundary == doctest::Approx(pr.limit));
  }
  // Default sweep: 0 to 125 % of full restoration rounded up to 100 lbf·ft, 11 rows.
  CHECK(r.rows.size() == 11);
  CHECK(r.rows.back().bar_moment == doctest::Approx(4300));
  CHECK(r.rows.front().over.size() == 2);  // rear_gawr and gcwr hitched
}

TEST_CASE("a fifth wheel gets one row, no bar moment, and a note") {
  TowVehicle tow = example_tow();
  tow.rear_axle_to_ball = -3;
  Trailer tr = example_trailer();
  tr.type = TrailerType::fifth_wheel;
  PlanLoads l;
  l.unhitched = AxleLoads{4900, 3700, 0};
  l.hitched = AxleLoads{4945, 6255, 10400};
  const PlanResult r = plan(tow, tr, make_baseline(tow, tr, l, kLbIn), kLbIn);
  CHECK(r.rows.size() == 1);
  CHECK_FALSE(r.target_moment.has_value());
  CHECK_FALSE(r.rows[0].falr.has_value());
  CHECK(r.tongue_percent == doctest::Approx(2600.0 / 13000 * 100).epsilon(1e-3));
}

TEST_CASE("plan refuses what it cannot use, naming the field") {
  const TowVehicle tow = example_tow();
  const Trailer tr = example_trailer();
  PlanLoads only_unhitched;
  only_unhitched.unhitched = AxleLoads{kSteer0, kDrive0, 0};
  CHECK_THROWS_WITH_AS(make_baseline(tow, tr, only_unhitched, kLbIn),
                       doctest::Contains("not enough loads"), Error);
  TowVehicle bad = tow;
  bad.rear_axle_to_ball = 0;
  CHECK_THROWS_WITH_AS(make_baseline(bad, tr, example_loads(), kLbIn),
                       doctest::Contains("tow_vehicle.rear_axle_to_ball"), Error);
  PlanLoads backwards = example_loads();
  backwards.hitched->steer = kSteer0 - 2000;  // a hitched total below the unhitched one
  CHECK_THROWS_WITH_AS(make_baseline(tow, tr, backwards, kLbIn),
                       doctest::Contains("tongue load"), Error);
  PlanOptions o;
  o.steps = 0;
  CHECK_THROWS_WITH_AS(plan(tow, tr, make_baseline(tow, tr, example_loads(), kLbIn), kLbIn, o),
                       doctest::Contains("--steps"), Error);
}

TEST_CASE("kg and mm sessions give N·m moments that agree with the lb/in example") {
  // Same rig in kg and mm (NIST SP 811 B.8: 1 lb = 0.45359237 kg, 1 in = 25.4 mm exactly);
  // 1 696 lbf·ft for 50 % FALR is 1 696 x 1.355 817 948 N·m.
  const double kg = 0.45359237, mm = 25.4;
  TowVehicle tow = example_tow();
  tow.wheelbase *= mm;
  tow.rear_axle_to_ball *= mm;
  Trailer tr = example_trailer();
  tr.ball_to_axle *= mm;
  PlanLoads l = example_loads();
  l.unhitched->steer *= kg;
  l.unhitched->drive *= kg;
  l.hitched->steer *= kg;
  l.hitched->drive *= kg;
  l.hitched->trailer *= kg;
  const Units kgmm{WeightUnit::kg, LengthUnit::mm};
  PlanOptions o;
  o.falr_target = 50;
  const PlanResult r = plan(tow, tr, make_baseline(tow, tr, l, kgmm), kgmm, o);
  CHECK(r.moment_unit == "N·m");
  CHECK(*r.target_moment == doctest::Approx(1696 * 1.355817948).epsilon(1e-3));
  CHECK(r.rows.back().bar_moment == doctest::Approx(5800));  // 1.25 x 4599 N·m, rounded up
}
