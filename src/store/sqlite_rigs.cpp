// Rigs: a tow vehicle row, a trailer row and the rig row that joins them under a name.
#include <fmt/format.h>

#include "format/validate.h"
#include "store/sqlite_store.h"

namespace sp::store {

namespace {

void check_rig(const RigRecord& r) {
  if (r.name.empty()) throw data_error("name: expected a rig name, got nothing");
  // The name goes into the context of every other message, so it is judged first, alone.
  validate::text(r.name, validate::Text::label, "name", validate::PrefixNames(""));
  try {
    validate::rig(r.units, r.vehicle, r.trailer, validate::PrefixNames(""));
  } catch (const Error& e) {
    throw e.within("rig " + r.name);
  }
}

}  // namespace

long long SqliteStore::add_rig(const RigRecord& rig) {
  check_rig(rig);
  if (find_rig(rig.name)) throw data_error("rig " + rig.name + ": a rig with this name is already in the store");
  std::string at = when(rig.entered_at);
  std::string wu(to_string(rig.units.weight)), lu(to_string(rig.units.length));
  const TowVehicle& v = rig.vehicle;
  long long vid = RowBuilder(*this, "vehicles")
                      .t(v.label).t(wu).t(lu).r(v.wheelbase).r(v.rear_axle_to_ball).r(v.gvwr)
                      .r(v.front_gawr).r(v.rear_gawr).r(v.gcwr).r(v.hitch_tongue_rating)
                      .r(v.hitch_trailer_rating).r(v.falr_target).t(rig.entered_by).t(at)
                      .append("adding the tow vehicle of rig " + rig.name);
  const Trailer& tr = rig.trailer;
  long long tid = RowBuilder(*this, "trailers")
                      .t(tr.label).t(wu).t(lu).t(to_string(tr.type)).r(tr.ball_to_axle)
                      .r(tr.gvwr).r(tr.axle_gawr).t(rig.entered_by).t(at)
                      .append("adding the trailer of rig " + rig.name);
  return RowBuilder(*this, "rigs").t(rig.name).i(vid).i(tid).t(rig.entered_by).t(at)
      .append("adding rig " + rig.name);
}

namespace {
constexpr const char* kRigSql =
    "SELECT r.id, r.name, r.entered_by, r.entered_at, v.label, v.weight_unit, v.length_unit, "
    "v.wheelbase, v.rear_axle_to_ball, v.gvwr, v.front_gawr, v.rear_gawr, v.gcwr, "
    "v.hitch_tongue_rating, v.hitch_trailer_rating, v.falr_target, t.label, t.type, "
    "t.ball_to_axle, t.gvwr, t.axle_gawr "
    "FROM rigs r JOIN vehicles v ON v.id = r.vehicle_id JOIN trailers t ON t.id = r.trailer_id ";

RigRecord read_rig(const Stmt& q) {
  RigRecord r;
  r.id = q.i64(0);
  r.name = q.text(1);
  r.entered_by = q.opt_text(2);
  r.entered_at = q.text(3);
  r.vehicle.label = q.text(4);
  r.units.weight = parse_weight_unit(q.text_view(5)).value_or(WeightUnit::lb);
  r.units.length = parse_length_unit(q.text_view(6)).value_or(LengthUnit::in);
  r.vehicle.wheelbase = q.f64(7);
  r.vehicle.rear_axle_to_ball = q.f64(8);
  r.vehicle.gvwr = q.opt_f64(9);
  r.vehicle.front_gawr = q.opt_f64(10);
  r.vehicle.rear_gawr = q.opt_f64(11);
  r.vehicle.gcwr = q.opt_f64(12);
  r.vehicle.hitch_tongue_rating = q.opt_f64(13);
  r.vehicle.hitch_trailer_rating = q.opt_f64(14);
  r.vehicle.falr_target = q.opt_f64(15);
  r.trailer.label = q.text(16);
  r.trailer.type = parse_trailer_type(q.text_view(17)).value_or(TrailerType::conventional);
  r.trailer.ball_to_axle = q.f64(18);
  r.trailer.gvwr = q.opt_f64(19);
  r.trailer.axle_gawr = q.opt_f64(20);
  return r;
}
}  // namespace

std::vector<RigRecord> SqliteStore::list_rigs() {
  std::vector<RigRecord> out;
  Stmt& q = stmt(std::string(kRigSql) + "ORDER BY r.id");
  while (q.step("listing rigs")) out.push_back(read_rig(q));
  q.reset();
  return out;
}

std::optional<RigRecord> SqliteStore::find_rig(std::string_view key) {
  Stmt& q = stmt(std::string(kRigSql) + "WHERE r.name = ?");
  q.bind(1, key);
  std::optional<RigRecord> r;
  if (q.step("finding a rig")) r = read_rig(q);
  q.reset();
  if (r || key.empty() || key.size() > 18) return r;
  for (char c : key) {
    if (c < '0' || c > '9') return r;
  }
  return rig_by_id(std::stoll(std::string(key)));
}

std::optional<RigRecord> SqliteStore::rig_by_id(long long id) {
  auto it = rig_cache_.find(id);
  if (it != rig_cache_.end()) return it->second;
  Stmt& q = stmt(std::string(kRigSql) + "WHERE r.id = ?");
  q.bind(1, id);
  std::optional<RigRecord> r;
  if (q.step("reading a rig")) r = read_rig(q);
  q.reset();
  if (r) {
    if (rig_cache_.size() > 4096) rig_cache_.clear();  // bounded memory
    rig_cache_[id] = *r;
  }
  return r;
}

}  // namespace sp::store
