// Ratings of the travel configuration, each with a status decided at k = 2 (GUM §6.3):
// within when value + 2u <= limit, over when value - 2u > limit, else undecided.
#include <fmt/format.h>

#include "engine/derived.h"
#include "engine/reconcile_parts.h"

namespace sp {
namespace {

// Coverage factor for the decision (JCGM 100:2008 §6.3: k = 2, about 95 %).
constexpr double kCoverage = 2.0;

ComplianceStatus decide(double value, double u, double limit) {
  if (value + kCoverage * u <= limit) return ComplianceStatus::within;
  if (value - kCoverage * u > limit) return ComplianceStatus::over;
  return ComplianceStatus::undecided;
}

}  // namespace

int add_compliance(const RigFit& fit, ReconcileResult& out) {
  const Session& s = *fit.session;
  const auto tc = travel_config(fit);
  const int slot = tc ? tc->slot : -1;
  auto load = [&](int platform) -> std::optional<Estimate> {
    if (!tc) return std::nullopt;
    return fitted_load(fit, slot, platform);
  };
  auto sum = [&](bool with_trailer) -> std::optional<Estimate> {
    if (!tc) return std::nullopt;
    return estimate(fit, hitched_load(fit, slot, with_trailer ? 4 : 3));
  };
  const auto trailer_weight = out.trailer_weight;
  const auto tongue = out.tongue_load;
  struct Row {
    const char* rating;
    const char* label;
    std::optional<double> limit;
    std::function<std::optional<Estimate>()> value;
  };
  const Row rows[] = {
      {"front_gawr", "Steer axle vs front GAWR", s.tow_vehicle.front_gawr, [&] { return load(0); }},
      {"rear_gawr", "Drive axle vs rear GAWR", s.tow_vehicle.rear_gawr, [&] { return load(1); }},
      {"gvwr", "Tow vehicle vs GVWR", s.tow_vehicle.gvwr, [&] { return sum(false); }},
      {"gcwr", "Whole rig vs GCWR", s.tow_vehicle.gcwr, [&] { return sum(true); }},
      {"trailer_gvwr", "Trailer weight vs trailer GVWR", s.trailer.gvwr,
       [&] { return trailer_weight; }},
      {"trailer_axle_gawr", "Trailer axles vs trailer axle GAWR", s.trailer.axle_gawr,
       [&] { return load(2); }},
      {"hitch_tongue_rating",
       s.trailer.type == TrailerType::fifth_wheel
           ? "Pin load vs hitch pin-weight rating"
           : "Tongue load (bars slack) vs hitch tongue rating",
       s.tow_vehicle.hitch_tongue_rating, [&] { return tongue; }},
      {"hitch_trailer_rating", "Trailer weight vs hitch trailer rating",
       s.tow_vehicle.hitch_trailer_rating, [&] { return trailer_weight; }},
  };
  int unsolved = 0;
  for (const Row& r : rows) {
    if (!r.limit) continue;  // absent ratings are skipped, never guessed
    const auto v = r.value();
    if (!v) {
      ++unsolved;
      out.unsolved.push_back(
          fmt::format("{}: the value is not solved from these passes{}", r.rating,
                      tc ? ""
                      : s.trailer.type == TrailerType::fifth_wheel
                          ? "; weigh the rig hitched"
                          : "; weigh the rig hitched (bars slack, then tensioned as it travels)"));
      continue;
    }
    ComplianceRow c;
    c.rating = r.rating;
    c.label = r.label;
    c.limit = *r.limit;
    c.value = v->value;
    c.u = v->u;
    c.margin = *r.limit - v->value;
    c.status = decide(v->value, v->u, *r.limit);
    out.compliance.push_back(std::move(c));
  }
  return unsolved;
}

}  // namespace sp
