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
#include "format/session_json.h"

#include <cmath>
#include <map>

#include "core/error.h"
#include "format/iso8601.h"
#include "format/json_strict.h"
#include "format/result_json.h"

namespace sp {

namespace {

using format::ObjectReader;
using nlohmann::json;
using nlohmann::ordered_json;

// Absurd-value limits. They catch keying errors (an extra digit, a unit mix-up), not
// overloads: the ratings check judges overloads. 23 CFR 658.17 caps a US tandem axle at
// 34 000 lb and a whole vehicle at 80 000 lb; no platform of a vehicle scale sees a rig of
// this kind anywhere near 200 000 lb (90 000 kg, about the same), so a larger reading or
// rating is a mistake (common practice).
constexpr double kMaxPlatformLb = 200000, kMaxPlatformKg = 90000;
// Vehicle-scale divisions are 5-100 lb (NIST HB 44 §2.20 Table 3 sets d >= 5 lb for III L;
// 20 lb is typical: common practice); anything above 1000 lb (500 kg) is a keying error.
constexpr double kMaxDivisionLb = 1000, kMaxDivisionKg = 500;
// No wheelbase, hitch offset or trailer length of a towed rig comes near 100 ft (30.48 m).
constexpr double kMaxLengthFt = 100;
// A tape length known only to within more than a foot is not a measurement (common practice).
constexpr double kMaxLengthUncertaintyFt = 1;
constexpr std::size_t kLabelChars = 200, kTicketChars = 64, kNotesChars = 4000;
constexpr std::size_t kMaxPasses = 1000;

struct Limits {
  std::string wu, lu;
  double platform = 0, division = 0, length = 0, length_u = 0;
};

Limits limits_for(const Units& u) {
  Limits l;
  l.wu = std::string(to_string(u.weight));
  l.lu = std::string(to_string(u.length));
  const bool lb = u.weight == WeightUnit::lb;
  l.platform = lb ? kMaxPlatformLb : kMaxPlatformKg;
  l.division = lb ? kMaxDivisionLb : kMaxDivisionKg;
  const double per_ft = length_factor(LengthUnit::ft, u.length);
  // Round to 10 significant digits so messages read "30.48 m", not "30.480000000000004 m".
  l.length = std::stod(format::number_text(kMaxLengthFt * per_ft));
  l.length_u = std::stod(format::number_text(kMaxLengthUncertaintyFt * per_ft));
  return l;
}

void check_format(const ObjectReader& r) {
  const std::string f = r.string("format", kLabelChars, false);
  if (f == kSessionFormat) return;
  const std::string prefix = "scaleproof-session/";
  if (f.rfind(prefix, 0) == 0) {
    r.fail("format", "this file is session format version " + f.substr(prefix.size()) +
                         "; this scaleproof reads \"" + kSessionFormat +
                         "\" (a newer scaleproof may read it)");
  }
  r.fail("format", std::string("expected \"") + kSessionFormat + "\", got \"" + f + "\"");
}

Units read_units(const ObjectReader& top) {
  ObjectReader r(top.required("units"), top.path_of("units"), top.source());
  r.allow_only({"weight", "length"});
  Units u;
  const std::string w = r.string("weight", kLabelChars, false);
  if (auto pw = parse_weight_unit(w)) {
    u.weight = *pw;
  } else {
    r.fail("weight", "unknown weight unit \"" + w + "\"; expected one of: lb, kg");
  }
  const std::string l = r.string("length", kLabelChars, false);
  if (auto pl = parse_length_unit(l)) {
    u.length = *pl;
  } else {
    r.fail("length", "unknown length unit \"" + l + "\"; expected one of: in, ft, mm, cm, m");
  }
  return u;
}

std::optional<double> weight(const ObjectReader& r, const std::string& key, const Limits& l,
                             double scale = 1) {
  return r.optional_number(key, 0, l.platform * scale, false, "a weight", l.wu);
}

std::optional<double> rating(const ObjectReader& r, const std::string& key, const Limits& l) {
  return r.optional_number(key, 0, l.platform, true, "a rating", l.wu);
}

void check_date_time(const ObjectReader& r, const std::string& key, const std::string& s) {
  if (auto e = format::check_iso_date_time(s); !e.empty()) r.fail(key, e + ", got \"" + s + "\"");
}

ScaleInfo read_scale(const ObjectReader& top, const Limits& l) {
  ObjectReader r(top.required("scale"), top.path_of("scale"), top.source());
  r.allow_only({"id", "name", "location", "division", "capacity", "accuracy_class",
                "last_inspected", "reading_uncertainty"});
  ScaleInfo s;
  s.id = r.string("id", kLabelChars, false);
  s.name = r.optional_string("name", kLabelChars);
  s.location = r.optional_string("location", kLabelChars);
  s.division = r.number("division", 0, l.division, true, "a scale division", l.wu);
  s.capacity = r.optional_number("capacity", 0, 3 * l.platform, true, "a capacity", l.wu);
  if (auto c = r.optional_string("accuracy_class", kLabelChars)) {
    // NIST HB 44 §2.20 classes for vehicle scales: III and III L (OIML R 76 class III
    // reads as "III").
    if (*c != "III" && *c != "IIIL") {
      r.fail("accuracy_class", "unknown accuracy class \"" + *c + "\"; expected one of: III, IIIL");
    }
    s.accuracy_class = *c;
  }
  if (auto d = r.optional_string("last_inspected", kLabelChars)) {
    if (auto e = format::check_iso_date(*d); !e.empty()) {
      r.fail("last_inspected", e + ", got \"" + *d + "\"");
    }
    s.last_inspected = d;
  }
  s.reading_uncertainty = r.optional_number("reading_uncertainty", 0, l.platform / 20, true,
                                            "a standard uncertainty", l.wu);
  return s;
}

TowVehicle read_tow(const ObjectReader& top, const Limits& l) {
  ObjectReader r(top.required("tow_vehicle"), top.path_of("tow_vehicle"), top.source());
  r.allow_only({"label", "wheelbase", "rear_axle_to_ball", "gvwr", "front_gawr", "rear_gawr",
                "gcwr", "hitch_tongue_rating", "hitch_trailer_rating", "falr_target"});
  TowVehicle t;
  t.label = r.optional_string("label", kLabelChars).value_or("");
  t.wheelbase = r.number("wheelbase", 0, l.length, true, "a length", l.lu);
  t.rear_axle_to_ball =
      r.number("rear_axle_to_ball", -l.length, l.length, false, "a length", l.lu);
  t.gvwr = rating(r, "gvwr", l);
  t.front_gawr = rating(r, "front_gawr", l);
  t.rear_gawr = rating(r, "rear_gawr", l);
  t.gcwr = rating(r, "gcwr", l);
  t.hitch_tongue_rating = rating(r, "hitch_tongue_rating", l);
  t.hitch_trailer_rating = rating(r, "hitch_trailer_rating", l);
  t.falr_target = r.optional_number("falr_target", 0, 100, false, "a percentage", "%");
  return t;
}

Trailer read_trailer(const ObjectReader& top, const Limits& l) {
  ObjectReader r(top.required("trailer"), top.path_of("trailer"), top.source());
  r.allow_only({"label", "type", "ball_to_axle", "gvwr", "axle_gawr"});
  Trailer t;
  t.label = r.optional_string("label", kLabelChars).value_or("");
  const std::string type = r.string("type", kLabelChars, false);
  if (auto pt = parse_trailer_type(type)) {
    t.type = *pt;
  } else {
    r.fail("type", "unknown trailer type \"" + type + "\"; expected one of: conventional, fifth-wheel");
  }
  t.ball_to_axle = r.number("ball_to_axle", 0, l.length, true, "a length", l.lu);
  t.gvwr = rating(r, "gvwr", l);
  t.axle_gawr = rating(r, "axle_gawr", l);
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
  return r.string("setting", kTicketChars, false);
}

Pass read_pass(const json& value, const std::string& path, const std::string& source,
               const Limits& l) {
  ObjectReader r(value, path, source);
  r.allow_only({"kind", "ticket", "setting", "weighed_at", "steer", "drive", "trailer", "gross",
                "scale_id", "id", "voided", "void_reason", "entered_by", "entered_at"});
  Pass p;
  const std::string kind = r.string("kind", kLabelChars, false);
  if (auto k = parse_pass_kind(kind)) {
    p.kind = *k;
  } else {
    r.fail("kind", "unknown pass kind \"" + kind + "\"; expected one of: unhitched, hitched, tensioned");
  }
  p.ticket = r.string("ticket", kTicketChars, false);
  p.setting = read_setting(r);
  if (p.setting && p.kind != PassKind::tensioned) {
    r.fail("setting", "a bar setting belongs only on a tensioned pass; this pass is " + kind);
  }
  p.weighed_at = r.string("weighed_at", kLabelChars, false);
  check_date_time(r, "weighed_at", p.weighed_at);
  p.steer = r.number("steer", 0, l.platform, false, "a weight", l.wu);
  p.drive = r.number("drive", 0, l.platform, false, "a weight", l.wu);
  p.trailer = weight(r, "trailer", l);
  if (p.kind == PassKind::unhitched) {
    if (p.trailer && *p.trailer != 0) {
      r.fail("trailer", "expected no trailer reading (or 0) on an unhitched pass, got " +
                            format::number_text(*p.trailer) + " " + l.wu);
    }
  } else if (!p.trailer) {
    r.fail("trailer", "missing required field 'trailer': a " + kind +
                          " pass needs the trailer-axle platform reading");
  }
  p.gross = weight(r, "gross", l, 3);
  p.scale_id = r.optional_string("scale_id", kLabelChars);
  p.id = r.optional_integer("id", 1);
  p.voided = r.optional_bool("voided").value_or(false);
  p.void_reason = r.optional_string("void_reason", kLabelChars);
  if (p.void_reason && !p.voided) {
    r.fail("void_reason", "a void reason belongs only on a pass with \"voided\": true");
  }
  p.entered_by = r.optional_string("entered_by", kLabelChars);
  p.entered_at = r.optional_string("entered_at", kLabelChars);
  if (p.entered_at) check_date_time(r, "entered_at", *p.entered_at);
  return p;
}

std::vector<Pass> read_passes(const ObjectReader& top, const Limits& l, TrailerType type) {
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
  std::map<std::string, std::size_t> seen;
  for (std::size_t i = 0; i < arr.size(); ++i) {
    const std::string p_path = path + "[" + std::to_string(i) + "]";
    Pass p = read_pass(arr[i], p_path, top.source(), l);
    if (auto [it, fresh] = seen.emplace(p.ticket, i); !fresh) {
      format::fail_at(top.source(), p_path + ".ticket",
                      "ticket \"" + p.ticket + "\" is already used by " + path + "[" +
                          std::to_string(it->second) + "]; each pass needs its own ticket");
    }
    if (type == TrailerType::fifth_wheel && p.kind == PassKind::tensioned) {
      format::fail_at(top.source(), p_path + ".kind",
                      "a fifth-wheel trailer takes no weight-distributing bars; expected "
                      "unhitched or hitched, got \"tensioned\"");
    }
    passes.push_back(std::move(p));
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
  s.station = top.optional_string("station", kLabelChars);
  s.operator_name = top.optional_string("operator", kLabelChars);
  s.owner = top.optional_string("owner", kLabelChars);
  s.units = read_units(top);
  const Limits l = limits_for(s.units);
  s.scale = read_scale(top, l);
  s.tow_vehicle = read_tow(top, l);
  s.trailer = read_trailer(top, l);
  const double o = s.tow_vehicle.rear_axle_to_ball;
  const std::string o_path = "$.tow_vehicle.rear_axle_to_ball";
  if (s.trailer.type == TrailerType::conventional && o <= 0) {
    format::fail_at(source, o_path,
                    "expected a positive length for a conventional trailer (the ball sits behind "
                    "the drive axle), got " + format::number_text(o) + " " + l.lu);
  }
  if (s.trailer.type == TrailerType::fifth_wheel && o > 0) {
    format::fail_at(source, o_path,
                    "expected zero or a negative length for a fifth-wheel trailer (the coupling "
                    "sits over or ahead of the drive axle), got " + format::number_text(o) + " " + l.lu);
  }
  if (o <= -s.tow_vehicle.wheelbase) {
    format::fail_at(source, o_path, "expected a coupling behind the steer axle (more than -" +
                                        format::number_text(s.tow_vehicle.wheelbase) + " " + l.lu +
                                        "), got " + format::number_text(o) + " " + l.lu);
  }
  s.length_uncertainty = top.optional_number("length_uncertainty", 0, l.length_u, true,
                                             "a standard uncertainty", l.lu);
  s.passes = read_passes(top, l, s.trailer.type);
  s.notes = top.optional_string("notes", kNotesChars);
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
