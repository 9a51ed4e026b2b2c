// `scaleproof scale add|list|show|inspect`: the station's scales and their inspection history.
// Exit: 0 done; 65 a value is refused (named); 66 no such scale; 2 usage.
#include <fmt/format.h>

#include <iostream>

#include "cli/commands.h"
#include "cli/flag_values.h"
#include "cli/store_cli.h"
#include "core/error.h"

namespace sp::cli {

namespace {

void print_scale(const store::ScaleRecord& s) {
  std::cout << fmt::format("{}  d = {} {}  class {}  capacity {}  last inspected {}", s.info.id,
                           num(s.info.division), to_string(s.unit), s.info.accuracy_class,
                           s.info.capacity ? num(*s.info.capacity) + " " + std::string(to_string(s.unit)) : "-",
                           s.info.last_inspected.value_or("never"));
  if (s.info.name) std::cout << "  " << *s.info.name;
  if (s.info.location) std::cout << ", " << *s.info.location;
  std::cout << "\n";
}

}  // namespace

void register_scale(CLI::App& app, Context& ctx) {
  auto* scale = app.add_subcommand("scale", "The station's scales: add, list, show, inspect");
  scale->footer("Examples:\n  scaleproof scale add --id QX-1 --division 20 --unit lb --class IIIL --inspected 2026-03-18 --seal TC-26-0412\n  scaleproof scale list");
  scale->require_subcommand(1);

  struct AddOpts {
    ScaleInfo info;
    std::string unit = "lb", by, inspected, seal;
    // Numbers as typed (cli/flag_values.h reads them, so "20 lb" is bad data, exit 65).
    std::optional<std::string> division, capacity, reading_u;
  };
  auto a = std::make_shared<AddOpts>();
  auto* add = scale->add_subcommand("add", "Add a scale");
  add->footer("Examples:\n  scaleproof scale add --id QX-1 --division 20 --unit lb --class IIIL --capacity 120000 \\\n      --inspected 2026-03-18 --seal TC-26-0412");
  add->add_option("--id", a->info.id, "The station's scale id, e.g. ST-3")->required();
  add->add_option("--division", a->division, "Scale division d, in --unit")
      ->required()
      ->type_name("NUMBER");
  add->add_option("--unit", a->unit, "Weight unit of the scale")
      ->check(CLI::IsMember({"lb", "kg"}));
  add->add_option("--class", a->info.accuracy_class, "Accuracy class (III, IIIL)");
  add->add_option("--name", a->info.name, "Name of the scale");
  add->add_option("--location", a->info.location, "Where it is");
  add->add_option("--capacity", a->capacity, "Capacity of one platform, in --unit")
      ->type_name("NUMBER");
  add->add_option("--reading-uncertainty", a->reading_u,
                  "Standard uncertainty of a reading, in --unit (default: from the tolerance)")
      ->type_name("NUMBER");
  add->add_option("--inspected", a->inspected, "Date of the last inspection, YYYY-MM-DD");
  add->add_option("--seal", a->seal, "Seal or certificate number of that inspection");
  add->add_option("--by", a->by, "Who records it (default $SCALEPROOF_OPERATOR, $USER)");
  add->callback([&ctx, a] {
    const auto& names = scale_flag_names();
    ScaleInfo info = a->info;
    info.division = number_flag(a->division, "division", names).value_or(0);
    info.capacity = number_flag(a->capacity, "capacity", names);
    info.reading_uncertainty = number_flag(a->reading_u, "reading_uncertainty", names);
    if (!a->seal.empty() && a->inspected.empty()) {
      throw usage_error("scale add: --seal needs --inspected DATE");
    }
    auto unit = *parse_weight_unit(a->unit);
    {
      ScaleInfo checked = info;  // the inspection is stored on its own row below
      if (!a->inspected.empty()) checked.last_inspected = a->inspected;
      validate::scale(checked, unit, names);
    }
    auto store = open_store(ctx);
    store::Txn txn(*store, store::Txn::write);
    long long id = store->add_scale(info, unit, who(a->by), "");
    if (!a->inspected.empty()) {
      store::Inspection in;
      in.scale_id = id;
      in.inspected_on = a->inspected;
      if (!a->seal.empty()) in.seal = a->seal;
      in.entered_by = who(a->by);
      store->add_inspection(in);
    }
    txn.commit();
    if (!ctx.quiet) std::cout << "scale " << info.id << " added\n";
  });

  auto* list = scale->add_subcommand("list", "List the scales");
  list->footer("Example:\n  scaleproof scale list");
  list->callback([&ctx] {
    auto store = open_store(ctx);
    store::Txn txn(*store, store::Txn::read);
    for (const auto& s : store->list_scales()) print_scale(s);
    txn.commit();
  });

  auto show_id = std::make_shared<std::string>();
  auto* show = scale->add_subcommand("show", "Show a scale and its inspection history");
  show->footer("Example:\n  scaleproof scale show QX-1");
  show->add_option("ID", *show_id, "Scale id")->required();
  show->callback([&ctx, show_id] {
    auto store = open_store(ctx);
    store::Txn txn(*store, store::Txn::read);
    auto s = store->find_scale(*show_id);
    if (!s) throw Error(ExitCode::no_input, "scale " + *show_id + ": not in the store");
    print_scale(*s);
    for (const auto& i : store->inspections(s->id)) {
      std::cout << fmt::format("  inspected {}  seal/certificate {}  by {}{}\n", i.inspected_on,
                               i.seal.value_or("-"), i.inspector.value_or("-"),
                               i.notes ? "  (" + *i.notes + ")" : "");
    }
    txn.commit();
  });

  struct InspOpts {
    std::string id, date, seal, inspector, notes, by;
  };
  auto in = std::make_shared<InspOpts>();
  auto* insp = scale->add_subcommand("inspect", "Record an inspection (date, seal or certificate)");
  insp->footer("Examples:\n  scaleproof scale inspect QX-1 --date 2026-03-18 --seal TC-26-0412 \\\n      --inspector \"County weights and measures\"");
  insp->add_option("ID", in->id, "Scale id")->required();
  insp->add_option("--date", in->date, "Inspection date, YYYY-MM-DD")->required();
  insp->add_option("--seal", in->seal, "Seal or certificate number");
  insp->add_option("--inspector", in->inspector, "Who inspected it");
  insp->add_option("--notes", in->notes, "Notes");
  insp->add_option("--by", in->by, "Who records it (default $SCALEPROOF_OPERATOR, $USER)");
  insp->callback([&ctx, in] {
    auto store = open_store(ctx);
    store::Txn txn(*store, store::Txn::write);
    auto s = store->find_scale(in->id);
    if (!s) throw Error(ExitCode::no_input, "scale " + in->id + ": not in the store");
    store::Inspection i;
    i.scale_id = s->id;
    i.inspected_on = in->date;
    if (!in->seal.empty()) i.seal = in->seal;
    if (!in->inspector.empty()) i.inspector = in->inspector;
    if (!in->notes.empty()) i.notes = in->notes;
    i.entered_by = who(in->by);
    store->add_inspection(i);
    txn.commit();
    if (!ctx.quiet) std::cout << "scale " << in->id << ": inspection of " << in->date << " recorded\n";
  });
}

}  // namespace sp::cli
