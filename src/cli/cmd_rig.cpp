// `scaleproof rig add|list`: tow vehicle + trailer, from flags or a TOML/JSON file.
// Rig file keys (both formats; unknown keys refused):
//   name = "heron-wren"
//   [units]      weight = "lb", length = "in"
//   [tow_vehicle] label, wheelbase, rear_axle_to_ball, gvwr, front_gawr, rear_gawr, gcwr,
//                 hitch_tongue_rating, hitch_trailer_rating, falr_target
//   [trailer]    label, type ("conventional" | "fifth-wheel"), ball_to_axle, gvwr, axle_gawr
// Exit: 0 done; 65 a value is refused (named); 66 the file does not exist; 2 usage.
#include <fstream>
#include <iostream>
#include <sstream>

#include <fmt/format.h>
#include <nlohmann/json.hpp>
#include <toml++/toml.h>

#include "cli/commands.h"
#include "cli/store_cli.h"
#include "core/error.h"

namespace sp::cli {

namespace {

using json = nlohmann::json;

void only_keys(const json& obj, const std::string& where, std::initializer_list<const char*> keys) {
  if (!obj.is_object()) throw data_error(where + ": expected a table of keys");
  for (auto it = obj.begin(); it != obj.end(); ++it) {
    bool known = false;
    for (const char* k : keys) known = known || it.key() == k;
    if (!known) throw data_error(where + "." + it.key() + ": unknown key");
  }
}

double number(const json& obj, const std::string& where, const char* key) {
  if (!obj.contains(key)) throw data_error(where + "." + key + ": expected a number, missing");
  const json& v = obj.at(key);
  if (!v.is_number()) throw data_error(where + "." + key + ": expected a number, got " + v.dump());
  return v.get<double>();
}
std::optional<double> opt_number(const json& obj, const std::string& where, const char* key) {
  if (!obj.contains(key)) return std::nullopt;
  return number(obj, where, key);
}
std::string text(const json& obj, const std::string& where, const char* key) {
  if (!obj.contains(key) || !obj.at(key).is_string()) {
    throw data_error(where + "." + key + ": expected text");
  }
  return obj.at(key).get<std::string>();
}

store::RigRecord rig_from_file(const std::string& path) {
  std::ifstream f(path, std::ios::binary);
  if (!f) throw Error(ExitCode::no_input, path + ": cannot open the rig file");
  std::stringstream ss;
  ss << f.rdbuf();
  std::string body = ss.str();
  json j;
  bool is_json = path.size() >= 5 && path.compare(path.size() - 5, 5, ".json") == 0;
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
  store::RigRecord r;
  only_keys(j, path + ": $", {"name", "units", "tow_vehicle", "trailer"});
  r.name = text(j, path + ": $", "name");
  if (j.contains("units")) {
    const json& u = j.at("units");
    only_keys(u, path + ": $.units", {"weight", "length"});
    if (u.contains("weight")) {
      auto w = parse_weight_unit(text(u, path + ": $.units", "weight"));
      if (!w) throw data_error(path + ": $.units.weight: expected lb or kg");
      r.units.weight = *w;
    }
    if (u.contains("length")) {
      auto l = parse_length_unit(text(u, path + ": $.units", "length"));
      if (!l) throw data_error(path + ": $.units.length: expected in, ft, mm, cm or m");
      r.units.length = *l;
    }
  }
  std::string vw = path + ": $.tow_vehicle";
  if (!j.contains("tow_vehicle")) throw data_error(vw + ": missing");
  const json& v = j.at("tow_vehicle");
  only_keys(v, vw, {"label", "wheelbase", "rear_axle_to_ball", "gvwr", "front_gawr", "rear_gawr",
                    "gcwr", "hitch_tongue_rating", "hitch_trailer_rating", "falr_target"});
  r.vehicle.label = text(v, vw, "label");
  r.vehicle.wheelbase = number(v, vw, "wheelbase");
  r.vehicle.rear_axle_to_ball = number(v, vw, "rear_axle_to_ball");
  r.vehicle.gvwr = opt_number(v, vw, "gvwr");
  r.vehicle.front_gawr = opt_number(v, vw, "front_gawr");
  r.vehicle.rear_gawr = opt_number(v, vw, "rear_gawr");
  r.vehicle.gcwr = opt_number(v, vw, "gcwr");
  r.vehicle.hitch_tongue_rating = opt_number(v, vw, "hitch_tongue_rating");
  r.vehicle.hitch_trailer_rating = opt_number(v, vw, "hitch_trailer_rating");
  r.vehicle.falr_target = opt_number(v, vw, "falr_target");
  std::string tw = path + ": $.trailer";
  if (!j.contains("trailer")) throw data_error(tw + ": missing");
  const json& t = j.at("trailer");
  only_keys(t, tw, {"label", "type", "ball_to_axle", "gvwr", "axle_gawr"});
  r.trailer.label = text(t, tw, "label");
  if (t.contains("type")) {
    auto ty = parse_trailer_type(text(t, tw, "type"));
    if (!ty) throw data_error(tw + ".type: expected conventional or fifth-wheel");
    r.trailer.type = *ty;
  }
  r.trailer.ball_to_axle = number(t, tw, "ball_to_axle");
  r.trailer.gvwr = opt_number(t, tw, "gvwr");
  r.trailer.axle_gawr = opt_number(t, tw, "axle_gawr");
  return r;
}

}  // namespace

void register_rig(CLI::App& app, Context& ctx) {
  auto* rig = app.add_subcommand("rig", "Rigs (tow vehicle + trailer): add, list");
  rig->footer("Examples:\n  scaleproof rig add --file data-demo/rigs/RA-1.toml\n  scaleproof rig list");
  rig->require_subcommand(1);

  struct AddOpts {
    std::string file, name, vehicle, trailer, type = "conventional", wu = "lb", lu = "in", by;
    double wheelbase = 0, o = 0, l = 0;
    std::optional<double> gvwr, fgawr, rgawr, gcwr, tongue, hitch_trailer, falr, tgvwr, tgawr;
  };
  auto a = std::make_shared<AddOpts>();
  auto* add = rig->add_subcommand("add", "Add a rig from flags or from --file rig.toml|rig.json");
  add->footer("Examples:\n  scaleproof rig add --file data-demo/rigs/RA-1.toml\n  scaleproof rig add --name RA-1 --wheelbase 145 --rear-axle-to-ball 50 --ball-to-axle 204 \\\n      --gvwr 7250 --front-gawr 3900 --rear-gawr 4250 --falr-target 50");
  add->add_option("--file", a->file, "Rig file (TOML, or JSON when it ends in .json)");
  add->add_option("--name", a->name, "Rig name (unique), used by session open and CSV imports");
  add->add_option("--vehicle", a->vehicle, "Tow vehicle label");
  add->add_option("--wheelbase", a->wheelbase, "Steer axle to drive axle, in --length-unit");
  add->add_option("--rear-axle-to-ball", a->o,
                  "Drive axle to hitch ball, positive behind the axle, in --length-unit");
  add->add_option("--trailer", a->trailer, "Trailer label");
  add->add_option("--trailer-type", a->type, "conventional or fifth-wheel")
      ->check(CLI::IsMember({"conventional", "fifth-wheel"}));
  add->add_option("--ball-to-axle", a->l, "Hitch ball to trailer axle (tandem mid-point)");
  add->add_option("--weight-unit", a->wu, "Unit of the ratings")->check(CLI::IsMember({"lb", "kg"}));
  add->add_option("--length-unit", a->lu, "Unit of the lengths")
      ->check(CLI::IsMember({"in", "ft", "mm", "cm", "m"}));
  add->add_option("--gvwr", a->gvwr, "Tow vehicle GVWR");
  add->add_option("--front-gawr", a->fgawr, "Front (steer) axle GAWR");
  add->add_option("--rear-gawr", a->rgawr, "Rear (drive) axle GAWR");
  add->add_option("--gcwr", a->gcwr, "GCWR");
  add->add_option("--hitch-tongue-rating", a->tongue, "Hitch tongue-weight rating (with WD)");
  add->add_option("--hitch-trailer-rating", a->hitch_trailer, "Hitch trailer-weight rating");
  add->add_option("--falr-target", a->falr, "Vehicle maker's FALR target, percent");
  add->add_option("--trailer-gvwr", a->tgvwr, "Trailer GVWR");
  add->add_option("--trailer-axle-gawr", a->tgawr, "GAWR of all trailer axles together");
  add->add_option("--by", a->by, "Who records it (default $SCALEPROOF_OPERATOR, $USER)");
  add->callback([&ctx, a] {
    store::RigRecord r;
    if (!a->file.empty()) {
      r = rig_from_file(a->file);
      if (!a->name.empty()) r.name = a->name;
    } else {
      for (auto [flag, missing] : {std::pair{"--name", a->name.empty()},
                                   std::pair{"--vehicle", a->vehicle.empty()},
                                   std::pair{"--wheelbase", a->wheelbase == 0},
                                   std::pair{"--trailer", a->trailer.empty()},
                                   std::pair{"--ball-to-axle", a->l == 0}}) {
        if (missing) throw usage_error(std::string("rig add: missing ") + flag + " (or give --file)");
      }
      r.name = a->name;
      r.units = Units{*parse_weight_unit(a->wu), *parse_length_unit(a->lu)};
      r.vehicle.label = a->vehicle;
      r.vehicle.wheelbase = a->wheelbase;
      r.vehicle.rear_axle_to_ball = a->o;
      r.vehicle.gvwr = a->gvwr;
      r.vehicle.front_gawr = a->fgawr;
      r.vehicle.rear_gawr = a->rgawr;
      r.vehicle.gcwr = a->gcwr;
      r.vehicle.hitch_tongue_rating = a->tongue;
      r.vehicle.hitch_trailer_rating = a->hitch_trailer;
      r.vehicle.falr_target = a->falr;
      r.trailer.label = a->trailer;
      r.trailer.type = *parse_trailer_type(a->type);
      r.trailer.ball_to_axle = a->l;
      r.trailer.gvwr = a->tgvwr;
      r.trailer.axle_gawr = a->tgawr;
    }
    r.entered_by = who(a->by);
    auto store = open_store(ctx);
    store::Txn txn(*store, store::Txn::write);
    long long id = store->add_rig(r);
    txn.commit();
    if (!ctx.quiet) std::cout << "rig " << r.name << " added (id " << id << ")\n";
  });

  auto* list = rig->add_subcommand("list", "List the rigs");
  list->footer("Example:\n  scaleproof rig list");
  list->callback([&ctx] {
    auto store = open_store(ctx);
    store::Txn txn(*store, store::Txn::read);
    for (const auto& r : store->list_rigs()) {
      auto lu = to_string(r.units.length);
      std::cout << fmt::format("{:>4}  {}  {} (WB {} {}, ball {} {}) + {} ({}, ball to axle {} {})\n",
                               r.id, r.name, r.vehicle.label, num(r.vehicle.wheelbase), lu,
                               num(r.vehicle.rear_axle_to_ball), lu, r.trailer.label,
                               to_string(r.trailer.type), num(r.trailer.ball_to_axle), lu);
    }
    txn.commit();
  });
}

}  // namespace sp::cli
