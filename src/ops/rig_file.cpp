#include "ops/rig_file.h"

#include <fmt/format.h>
#include <toml++/toml.h>

#include <algorithm>
#include <nlohmann/json.hpp>
#include <sstream>

#include "core/error.h"
#include "format/json_strict.h"
#include "format/validate.h"

namespace sp::ops {

namespace {

using json = nlohmann::json;

// Types and shapes of a rig file; ranges and text are validate::rig's. `names` turns a model
// field ("tow_vehicle.gvwr") into the file's name for it ("rig.toml: tow_vehicle.gvwr").
struct RigFileReader {
  const validate::FieldNames& names;

  void only_keys(const json& obj, const std::string& where,
                 const std::vector<std::string>& keys) const {
    if (!obj.is_object()) {
      validate::fail(names, where, "expected a table of keys, got " + format::describe_json(obj));
    }
    for (auto it = obj.begin(); it != obj.end(); ++it) {
      if (std::find(keys.begin(), keys.end(), it.key()) != keys.end()) continue;
      std::string msg = "unknown key " + validate::quoted(it.key());
      if (auto near = format::closest_name(it.key(), keys); !near.empty()) {
        msg += "; did you mean '" + near + "'?";
      }
      validate::fail(names, (where.empty() ? "" : where + ".") + it.key(), msg);
    }
  }
  const json& required(const json& obj, const std::string& where, const char* key) const {
    if (!obj.contains(key)) {
      validate::fail(names, where.empty() ? std::string("$") : where,
                     std::string("missing required field '") + key + "'");
    }
    return obj.at(key);
  }
  double number(const json& obj, const std::string& where, const char* key) const {
    const json& v = required(obj, where, key);
    if (!v.is_number()) {
      validate::fail(names, where + "." + key,
                     "expected a number, got " + format::describe_json(v));
    }
    return v.get<double>();
  }
  std::optional<double> opt_number(const json& obj, const std::string& where,
                                   const char* key) const {
    if (!obj.contains(key)) return std::nullopt;
    return number(obj, where, key);
  }
  std::string text(const json& obj, const std::string& where, const char* key) const {
    const json& v = required(obj, where, key);
    if (!v.is_string()) {
      validate::fail(names, (where.empty() ? "" : where + ".") + key,
                     "expected a string, got " + format::describe_json(v));
    }
    return v.get<std::string>();
  }
};

}  // namespace

store::RigRecord rig_from_text(const std::string& body, const std::string& path, bool is_json) {
  json j;
  if (is_json) {
    try {
      j = json::parse(body);
    } catch (const json::exception& e) {
      throw data_error(path + ": not valid JSON: " + e.what());
    }
  } else {
    try {
      toml::table t = toml::parse(body, path);
      std::stringstream js;
      js << toml::json_formatter{t};
      j = json::parse(js.str());
    } catch (const toml::parse_error& e) {
      throw data_error(fmt::format("{}:{}: {}", path, e.source().begin.line, e.description()));
    }
  }
  // TOML keys are named as written ("rig.toml: tow_vehicle.gvwr"), JSON ones as paths.
  const validate::PrefixNames names(path + (is_json ? ": $." : ": "));
  const RigFileReader in{names};
  store::RigRecord r;
  in.only_keys(j, "", {"name", "units", "tow_vehicle", "trailer"});
  r.name = in.text(j, "", "name");
  if (j.contains("units")) {
    const json& u = j.at("units");
    in.only_keys(u, "units", {"weight", "length"});
    if (u.contains("weight")) {
      const std::string w = in.text(u, "units", "weight");
      auto pw = parse_weight_unit(w);
      if (!pw) {
        validate::fail(names, "units.weight",
                       "unknown weight unit " + validate::quoted(w) + "; expected one of: lb, kg");
      }
      r.units.weight = *pw;
    }
    if (u.contains("length")) {
      const std::string l = in.text(u, "units", "length");
      auto pl = parse_length_unit(l);
      if (!pl) {
        validate::fail(
            names, "units.length",
            "unknown length unit " + validate::quoted(l) + "; expected one of: in, ft, mm, cm, m");
      }
      r.units.length = *pl;
    }
  }
  const json& v = in.required(j, "", "tow_vehicle");
  const std::string vw = "tow_vehicle";
  in.only_keys(v, vw,
               {"label", "wheelbase", "rear_axle_to_ball", "gvwr", "front_gawr", "rear_gawr",
                "gcwr", "hitch_tongue_rating", "hitch_trailer_rating", "falr_target"});
  r.vehicle.label = in.text(v, vw, "label");
  r.vehicle.wheelbase = in.number(v, vw, "wheelbase");
  r.vehicle.rear_axle_to_ball = in.number(v, vw, "rear_axle_to_ball");
  r.vehicle.gvwr = in.opt_number(v, vw, "gvwr");
  r.vehicle.front_gawr = in.opt_number(v, vw, "front_gawr");
  r.vehicle.rear_gawr = in.opt_number(v, vw, "rear_gawr");
  r.vehicle.gcwr = in.opt_number(v, vw, "gcwr");
  r.vehicle.hitch_tongue_rating = in.opt_number(v, vw, "hitch_tongue_rating");
  r.vehicle.hitch_trailer_rating = in.opt_number(v, vw, "hitch_trailer_rating");
  r.vehicle.falr_target = in.opt_number(v, vw, "falr_target");
  const json& t = in.required(j, "", "trailer");
  const std::string tw = "trailer";
  in.only_keys(t, tw, {"label", "type", "ball_to_axle", "gvwr", "axle_gawr"});
  r.trailer.label = in.text(t, tw, "label");
  if (t.contains("type")) {
    const std::string type = in.text(t, tw, "type");
    auto ty = parse_trailer_type(type);
    if (!ty) {
      validate::fail(names, "trailer.type",
                     "unknown trailer type " + validate::quoted(type) +
                         "; expected one of: conventional, fifth-wheel");
    }
    r.trailer.type = *ty;
  }
  r.trailer.ball_to_axle = in.number(t, tw, "ball_to_axle");
  r.trailer.gvwr = in.opt_number(t, tw, "gvwr");
  r.trailer.axle_gawr = in.opt_number(t, tw, "axle_gawr");
  validate::text(r.name, validate::Text::label, "name", names, false);
  validate::rig(r.units, r.vehicle, r.trailer, names);
  return r;
}

bool is_json_name(const std::string& path) {
  return path.size() >= 5 && path.compare(path.size() - 5, 5, ".json") == 0;
}

}  // namespace sp::ops
