// Session file "scaleproof-session/1": strict reader and deterministic writer.
//
// Document (keys in the order the writer emits them; [] marks optional keys):
//   format                 "scaleproof-session/1"
//   [session_id]           store id, whole number >= 1
//   [station] [operator] [owner]   descriptive text, <= 200 characters
//   units                  {"weight": "lb"|"kg", "length": "in"|"ft"|"mm"|"cm"|"m"}
//   scale                  {id, [name], [location], division, [capacity], [accuracy_class],
//                           [last_inspected] (YYYY-MM-DD), [reading_uncertainty]}
//   tow_vehicle            {[label], wheelbase, rear_axle_to_ball, [gvwr], [front_gawr],
//                           [rear_gawr], [gcwr], [hitch_tongue_rating], [hitch_trailer_rating],
//                           [falr_target] (%)}
//   trailer                {[label], type "conventional"|"fifth-wheel", ball_to_axle, [gvwr],
//                           [axle_gawr]}
//   [length_uncertainty]   standard uncertainty of the tape lengths, length unit
//   passes                 [{kind, ticket, [setting], weighed_at, steer, drive, [trailer],
//                            [gross], [scale_id], [id], [voided], [void_reason], [entered_by],
//                            [entered_at]}, ...]   (any order, at least one)
//   [notes]                free text, <= 4000 characters
// Numbers may be integers or decimals. `setting` may be a string or a number; it is kept as
// text. The writer prints integral values as integers, others in the shortest form that reads
// back to the same double, so parse(write(s)) == s.
// Ranges, text rules and the coupling rules are format/validate.h's (validate::session).
#include "format/session_json.h"

#include <cmath>
#include <map>

#include "core/error.h"
#include "format/json_strict.h"
#include "format/result_json.h"
#include "format/validate.h"

namespace sp {

namespace {

using format::ObjectReader;
using nlohmann::json;
using nlohmann::ordered_json;

// Limits live in format/validate.h (one validator for every input path); this reader checks
// types and shapes, then hands the whole session to validate::session.
constexpr std::size_t kMaxPasses = 1000;  // also the validator's; bounds the work before it

// A version number as written; anything else quoted (it may hold any bytes).
std::string version_text(const std::string& v) {
  const bool digits =
      !v.empty() && v.size() <= 9 && v.find_first_not_of("0123456789") == std::string::npos;
  return digits ? v : validate::quoted(v);
}

void check_format(const ObjectReader& r) {
  const std::string f = r.string("format");
  if (f == kSessionFormat) return;
  const std::string prefix = "scaleproof-session/";
  if (f.rfind(prefix, 0) == 0) {
    r.fail("format", "this file is session format version " +
                         version_text(f.substr(prefix.size())) + "; this scaleproof reads \"" +
                         kSessionFormat + "\" (a newer scaleproof may read it)");
  }
  r.fail("format", std::string("expected \"") + kSessionFormat + "\", got " + validate::quoted(f));
}

Units read_units(const ObjectReader& top) {
  ObjectReader r(top.required("units"), top.path_of("units"), top.source());
  r.allow_only({"weight", "length"});
  Units u;
  const std::string w = r.string("weight");
  if (auto pw = parse_weight_unit(w)) {
    u.weight = *pw;
  } else {
    r.fail("weight", "unknown weight unit " + validate::quoted(w) + "; expected one of: lb, kg");
  }
  const std::string l = r.string("length");
  if (auto pl = parse_length_unit(l)) {
    u.length = *pl;
  } else {
    r.fail("length",
           "unknown length unit " + validate::quoted(l) + "; expected one of: in, ft, mm, cm, m");
  }
  return u;
}

ScaleInfo read_scale(const ObjectReader& top) {
  ObjectReader r(top.required("scale"), top.path_of("scale"), top.source());
  r.allow_only({"id", "name", "location", "division", "capacity", "accuracy_class",
                "last_inspected", "reading_uncertainty"});
  ScaleInfo s;
  s.id = r.string("id");
  s.name = r.optional_string("name");
  s.location = r.optional_string("location");
  s.division = r.number("division");
  s.capacity = r.optional_number("capacity");
  if (auto c = r.optional_string("accuracy_class")) s.accuracy_class = *c;
  s.last_inspected = r.optional_string("last_inspected");
  s.reading_uncertainty = r.optional_number("reading_uncertainty");
  return s;
}

TowVehicle read_tow(const ObjectReader& top) {
  ObjectReader r(top.required("tow_vehicle"), top.path_of("tow_vehicle"), top.source());
  r.allow_only({"label", "wheelbase", "rear_axle_to_ball", "gvwr", "front_gawr", "rear_gawr",
                "gcwr", "hitch_tongue_rating", "hitch_trailer_rating", "falr_target"});
  TowVehicle t;
  t.label = r.optional_string("label").value_or("");
  t.wheelbase = r.number("wheelbase");
  t.rear_axle_to_ball = r.number("rear_axle_to_ball");
  t.gvwr = r.optional_number("gvwr");
  t.front_gawr = r.optional_number("front_gawr");
  t.rear_gawr = r.optional_number("rear_gawr");
  t.gcwr = r.optional_number("gcwr");
  t.hitch_tongue_rating = r.optional_number("hitch_tongue_rating");
  t.hitch_trailer_rating = r.optional_number("hitch_trailer_rating");
  t.falr_target = r.optional_number("falr_target");
  return t;
}

Trailer read_trailer(const ObjectReader& top) {
  ObjectReader r(top.required("trailer"), top.path_of("trailer"), top.source());
  r.allow_only({"label", "type", "ball_to_axle", "gvwr", "axle_gawr"});
  Trailer t;
  t.label = r.optional_string("label").value_or("");
  const std::string type = r.string("type");
  if (auto pt = parse_trailer_type(type)) {
    t.type = *pt;
  } else {
    r.fail("type", "unknown trailer type " + validate::quoted(type) +
                       "; expected one of: conventional, fifth-wheel");
  }
  t.ball_to_axle = r.number("ball_to_axle");
  t.gvwr = r.optional_number("gvwr");
  t.axle_gawr = r.optional_number("axle_gawr");
  return t;
}

std::optional<std::string> read_setting(const ObjectReader& r) {
  const json* v = r.optional("setting");
  if (v == nullptr) return std::nullopt;
  if (v->is_number()) {
    const double d = v->get<double>();
    if (!std::isfinite(d) || std::fabs(d) > 1e6) {
      r.fail("setting", "expected a setting label or a number of at most 1000000, got " +
                            format::describe_json(*v));
    }
    return v->dump();  // integers as written; decimals in their shortest exact form
  }
  if (!v->is_string()) {
    r.fail("setting", "expected a setting label (string or number), got " + format::describe_json(*v));
  }
  return r.string("setting");
}

Pass read_pass(const json& value, const std::string& path, const std::string& source) {
  ObjectReader r(value, path, source);
  r.allow_only({"kind", "ticket", "setting", "weighed_at", "steer", "drive", "trailer", "gross",
                "scale_id", "id", "voided", "void_reason", "entered_by", "entered_at"});
  Pass p;
  const std::string kind = r.string("kind");
  if (auto k = parse_pass_kind(kind)) {
    p.kind = *k;
  } else {
    r.fail("kind", "unknown pass kind " + validate::quoted(kind) +
                       "; expected one of: unhitched, hitched, tensioned");
  }
  p.ticket = r.string("ticket");
  p.setting = read_setting(r);
  p.weighed_at = r.string("weighed_at");
  p.steer = r.number("steer");
  p.drive = r.number("drive");
  p.trailer = r.optional_number("trailer");
  p.gross = r.optional_number("gross");
  p.scale_id = r.optional_string("scale_id");
  p.id = r.optional_integer("id", 1);
  p.voided = r.optional_bool("voided").value_or(false);
  p.void_reason = r.optional_string("void_reason");
  p.entered_by = r.optional_string("entered_by");
  p.entered_at = r.optional_string("entered_at");
  return p;
}

std::vector<Pass> read_passes(const ObjectReader& top) {
  const json& arr = top.required("passes");
  const std::string path = top.path_of("passes");
  if (!arr.is_array()) {
    format::fail_at(top.source(), path, "expected an array of passes, got " + format::describe_json(arr));
  }
  if (arr.empty() || arr.size() > kMaxPasses) {
    format::fail_at(top.source(), path, "expected 1 to " + std::to_string(kMaxPasses) +
                                            " passes, got " + std::to_string(arr.size()));
  }
  std::vector<Pass> passes;
  passes.reserve(arr.size());
  for (std::size_t i = 0; i < arr.size(); ++i) {
    passes.push_back(read_pass(arr[i], path + "[" + std::to_string(i) + "]", top.source()));
  }
  return passes;
}

}  // namespace

Session parse_session_json(std::string_view text, const std::string& source) {
  const json doc = format::parse_json_strict(text, source);
  const ObjectReader top(doc, "$", source);
  check_format(top);  // first: a future version's keys are not "unknown keys"
  top.allow_only({"format", "session_id", "station", "operator", "owner", "units", "scale",
                  "tow_vehicle", "trailer", "length_uncertainty", "passes", "notes"});
  Session s;
  s.session_id = top.optional_integer("session_id", 1);
  s.station = top.optional_string("station");
  s.operator_name = top.optional_string("operator");
  s.owner = top.optional_string("owner");
  s.units = read_units(top);
  s.scale = read_scale(top);
  s.tow_vehicle = read_tow(top);
  s.trailer = read_trailer(top);
  s.length_uncertainty = top.optional_number("length_uncertainty");
  s.passes = read_passes(top);
  s.notes = top.optional_string("notes");
  validate::session(s, validate::PrefixNames(source + ": $."));
  return s;
}

namespace {

// Integral values print as integers ("4180", not "4180.0"); others in nlohmann's shortest
// round-trip form.
ordered_json num(double v) {
  if (std::fabs(v) < 9.0e15 && v == std::floor(v)) return static_cast<long long>(v);
  return v;
}

template <typename T>
void put(ordered_json& j, const char* key, const std::optional<T>& v) {
  if (!v) return;
  if constexpr (std::is_same_v<T, double>) {
    j[key] = num(*v);
  } else {
    j[key] = *v;
  }
}

}  // namespace

ordered_json session_to_json(const Session& s) {
  ordered_json j;
  j["format"] = s.format;
  put(j, "session_id", s.session_id);
  put(j, "station", s.station);
  put(j, "operator", s.operator_name);
  put(j, "owner", s.owner);
  j["units"] = {{"weight", to_string(s.units.weight)}, {"length", to_string(s.units.length)}};
  ordered_json sc;
  sc["id"] = s.scale.id;
  put(sc, "name", s.scale.name);
  put(sc, "location", s.scale.location);
  sc["division"] = num(s.scale.division);
  put(sc, "capacity", s.scale.capacity);
  sc["accuracy_class"] = s.scale.accuracy_class;
  put(sc, "last_inspected", s.scale.last_inspected);
  put(sc, "reading_uncertainty", s.scale.reading_uncertainty);
  j["scale"] = sc;
  const TowVehicle& t = s.tow_vehicle;
  ordered_json tv;
  tv["label"] = t.label;
  tv["wheelbase"] = num(t.wheelbase);
  tv["rear_axle_to_ball"] = num(t.rear_axle_to_ball);
  put(tv, "gvwr", t.gvwr);
  put(tv, "front_gawr", t.front_gawr);
  put(tv, "rear_gawr", t.rear_gawr);
  put(tv, "gcwr", t.gcwr);
  put(tv, "hitch_tongue_rating", t.hitch_tongue_rating);
  put(tv, "hitch_trailer_rating", t.hitch_trailer_rating);
  put(tv, "falr_target", t.falr_target);
  j["tow_vehicle"] = tv;
  ordered_json tr;
  tr["label"] = s.trailer.label;
  tr["type"] = to_string(s.trailer.type);
  tr["ball_to_axle"] = num(s.trailer.ball_to_axle);
  put(tr, "gvwr", s.trailer.gvwr);
  put(tr, "axle_gawr", s.trailer.axle_gawr);
  j["trailer"] = tr;
  put(j, "length_uncertainty", s.length_uncertainty);
  ordered_json passes = ordered_json::array();
  for (const Pass& p : s.passes) {
    ordered_json pj;
    pj["kind"] = to_string(p.kind);
    pj["ticket"] = p.ticket;
    put(pj, "setting", p.setting);
    pj["weighed_at"] = p.weighed_at;
    pj["steer"] = num(p.steer);
    pj["drive"] = num(p.drive);
    put(pj, "trailer", p.trailer);
    put(pj, "gross", p.gross);
    put(pj, "scale_id", p.scale_id);
    put(pj, "id", p.id);
    if (p.voided) pj["voided"] = true;
    put(pj, "void_reason", p.void_reason);
    put(pj, "entered_by", p.entered_by);
    put(pj, "entered_at", p.entered_at);
    passes.push_back(pj);
  }
  j["passes"] = passes;
  put(j, "notes", s.notes);
  return j;
}

std::string write_session_json(const Session& session) {
  return session_to_json(session).dump(2) + "\n";
}

}  // namespace sp
