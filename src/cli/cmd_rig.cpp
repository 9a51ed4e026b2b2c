// `scaleproof rig add|list`: tow vehicle + trailer, from flags or a TOML/JSON file.
// Rig file keys (both formats; unknown keys refused):
//   name = "heron-wren"
//   [units]      weight = "lb", length = "in"
//   [tow_vehicle] label, wheelbase, rear_axle_to_ball, gvwr, front_gawr, rear_gawr, gcwr,
//                 hitch_tongue_rating, hitch_trailer_rating, falr_target
//   [trailer]    label, type ("conventional" | "fifth-wheel"), ball_to_axle, gvwr, axle_gawr
// Exit: 0 done; 65 a value is refused (named); 66 the file does not exist; 2 usage.
#include <fmt/format.h>

#include <algorithm>
#include <fstream>
#include <iostream>
#include <nlohmann/json.hpp>
#include <sstream>

#include "cli/commands.h"
#include "cli/flag_values.h"
#include "cli/store_cli.h"
#include "core/error.h"
#include "format/validate.h"
#include "ops/rig_file.h"

namespace sp::cli {

namespace {

std::string read_rig_file(const std::string& path) {
  std::ifstream f(path, std::ios::binary);
  if (!f) throw Error(ExitCode::no_input, path + ": cannot open the rig file");
  std::stringstream ss;
  ss << f.rdbuf();
  return ss.str();
}

store::RigRecord rig_from_file(const std::string& path) {
  return ops::rig_from_text(read_rig_file(path), path, ops::is_json_name(path));
}

}  // namespace

void register_rig(CLI::App& app, Context& ctx) {
  auto* rig = app.add_subcommand("rig", "Rigs (tow vehicle + trailer): add, list");
  rig->footer("Examples:\n  scaleproof rig add --file data-demo/rigs/RA-1.toml\n  scaleproof rig list");
  rig->require_subcommand(1);

  struct AddOpts {
    std::string file, name, vehicle, trailer, type = "conventional", wu = "lb", lu = "in", by;
    // Numbers as typed (cli/flag_values.h reads them, so "7250 lb" is bad data, exit 65).
    std::optional<std::string> wheelbase, o, l, gvwr, fgawr, rgawr, gcwr, tongue, hitch_trailer,
        falr, tgvwr, tgawr;
  };
  auto a = std::make_shared<AddOpts>();
  auto* add = rig->add_subcommand("add", "Add a rig from flags or from --file rig.toml|rig.json");
  add->footer("Examples:\n  scaleproof rig add --file data-demo/rigs/RA-1.toml\n  scaleproof rig add --name RA-1 --wheelbase 145 --rear-axle-to-ball 50 --ball-to-axle 204 \\\n      --gvwr 7250 --front-gawr 3900 --rear-gawr 4250 --falr-target 50");
  add->add_option("--file", a->file, "Rig file (TOML, or JSON when it ends in .json)");
  add->add_option("--name", a->name, "Rig name (unique), used by session open and CSV imports");
  add->add_option("--vehicle", a->vehicle, "Tow vehicle label");
  add->add_option("--wheelbase", a->wheelbase, "Steer axle to drive axle, in --length-unit")
      ->type_name("NUMBER");
  add->add_option("--rear-axle-to-ball", a->o,
                  "Drive axle to hitch ball, positive behind the axle, in --length-unit")
      ->type_name("NUMBER");
  add->add_option("--trailer", a->trailer, "Trailer label");
  add->add_option("--trailer-type", a->type, "conventional or fifth-wheel")
      ->check(CLI::IsMember({"conventional", "fifth-wheel"}));
  add->add_option("--ball-to-axle", a->l, "Hitch ball to trailer axle (tandem mid-point)")
      ->type_name("NUMBER");
  add->add_option("--weight-unit", a->wu, "Unit of the ratings")->check(CLI::IsMember({"lb", "kg"}));
  add->add_option("--length-unit", a->lu, "Unit of the lengths")
      ->check(CLI::IsMember({"in", "ft", "mm", "cm", "m"}));
  add->add_option("--gvwr", a->gvwr, "Tow vehicle GVWR")->type_name("NUMBER");
  add->add_option("--front-gawr", a->fgawr, "Front (steer) axle GAWR")->type_name("NUMBER");
  add->add_option("--rear-gawr", a->rgawr, "Rear (drive) axle GAWR")->type_name("NUMBER");
  add->add_option("--gcwr", a->gcwr, "GCWR")->type_name("NUMBER");
  add->add_option("--hitch-tongue-rating", a->tongue, "Hitch tongue-weight rating (with WD)")
      ->type_name("NUMBER");
  add->add_option("--hitch-trailer-rating", a->hitch_trailer, "Hitch trailer-weight rating")
      ->type_name("NUMBER");
  add->add_option("--falr-target", a->falr, "Vehicle maker's FALR target, percent")
      ->type_name("NUMBER");
  add->add_option("--trailer-gvwr", a->tgvwr, "Trailer GVWR")->type_name("NUMBER");
  add->add_option("--trailer-axle-gawr", a->tgawr, "GAWR of all trailer axles together")
      ->type_name("NUMBER");
  add->add_option("--by", a->by, "Who records it (default $SCALEPROOF_OPERATOR, $USER)");
  add->callback([&ctx, a] {
    store::RigRecord r;
    if (!a->file.empty()) {
      r = rig_from_file(a->file);
      if (!a->name.empty()) r.name = a->name;
    } else {
      for (auto [flag, missing] :
           {std::pair{"--name", a->name.empty()}, std::pair{"--vehicle", a->vehicle.empty()},
            std::pair{"--wheelbase", !a->wheelbase}, std::pair{"--trailer", a->trailer.empty()},
            std::pair{"--ball-to-axle", !a->l}}) {
        if (missing) throw usage_error(std::string("rig add: missing ") + flag + " (or give --file)");
      }
      r.name = a->name;
      r.units = Units{*parse_weight_unit(a->wu), *parse_length_unit(a->lu)};
      r.vehicle.label = a->vehicle;
      const auto& names = rig_flag_names();
      auto n = [&](const std::optional<std::string>& text, const char* field) {
        return number_flag(text, field, names);
      };
      r.vehicle.wheelbase = *n(a->wheelbase, "tow_vehicle.wheelbase");
      r.vehicle.rear_axle_to_ball = n(a->o, "tow_vehicle.rear_axle_to_ball").value_or(0);
      r.vehicle.gvwr = n(a->gvwr, "tow_vehicle.gvwr");
      r.vehicle.front_gawr = n(a->fgawr, "tow_vehicle.front_gawr");
      r.vehicle.rear_gawr = n(a->rgawr, "tow_vehicle.rear_gawr");
      r.vehicle.gcwr = n(a->gcwr, "tow_vehicle.gcwr");
      r.vehicle.hitch_tongue_rating = n(a->tongue, "tow_vehicle.hitch_tongue_rating");
      r.vehicle.hitch_trailer_rating = n(a->hitch_trailer, "tow_vehicle.hitch_trailer_rating");
      r.vehicle.falr_target = n(a->falr, "tow_vehicle.falr_target");
      r.trailer.label = a->trailer;
      r.trailer.type = *parse_trailer_type(a->type);
      r.trailer.ball_to_axle = *n(a->l, "trailer.ball_to_axle");
      r.trailer.gvwr = n(a->tgvwr, "trailer.gvwr");
      r.trailer.axle_gawr = n(a->tgawr, "trailer.axle_gawr");
      validate::text(r.name, validate::Text::label, "name", names, false);
      validate::rig(r.units, r.vehicle, r.trailer, names);
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
