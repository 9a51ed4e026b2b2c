// `scaleproof pass add|void`: log one pass as the rig rolls off the scale, or void one.
// `pass add` takes every field as a flag. A missing field is asked for when stdin is a
// terminal (each answer checked at once: division multiple, plausible range, gross = sum);
// otherwise it is a usage error naming the flag.
// Exit: 0 stored (prints the pass id); 65 refused (ticket and platform named); 66 no such
// session / pass; 2 usage; 75 the store stayed busy.
#include <fmt/format.h>

#include <iostream>

#include "cli/commands.h"
#include "cli/flag_values.h"
#include "cli/store_cli.h"
#include "core/error.h"
#include "format/iso8601.h"
#include "store/pass_rules.h"

namespace sp::cli {

namespace {

struct AddOpts {
  long long session = 0;
  std::string kind, setting, ticket, weighed_at, ticket_scale, by;
  std::optional<double> steer, drive, trailer, gross;
  // The numeric flags as typed (cli/flag_values.h reads them, so "4460 lb" is bad data).
  std::optional<std::string> steer_text, drive_text, trailer_text, gross_text;
};

// Asks on stderr until `accept` takes the answer; EOF ends with a usage error.
std::string ask(const std::string& prompt, const std::function<void(const std::string&)>& accept) {
  for (;;) {
    std::cerr << prompt << ": " << std::flush;
    std::string line;
    if (!std::getline(std::cin, line)) throw usage_error("pass add: input ended before " + prompt);
    try {
      accept(line);
      return line;
    } catch (const Error& e) {
      std::cerr << "  " << e.what() << "\n";
    }
  }
}

double parse_weight(const std::string& s, const std::string& what) {
  size_t used = 0;
  double v = 0;
  try {
    v = std::stod(s, &used);
  } catch (const std::exception&) {
    used = 0;
  }
  if (used == 0 || used != s.size()) {
    throw data_error(fmt::format("{}: expected a number, got '{}'", what, s));
  }
  return v;
}

void fill_missing(AddOpts& a, const ScaleInfo& scale, WeightUnit unit, bool tty) {
  auto missing = [&](const char* flag) {
    if (!tty) {
      throw usage_error(fmt::format("pass add: missing {} (stdin is not a terminal, so "
                                    "scaleproof cannot ask for it)", flag));
    }
  };
  if (a.kind.empty()) {
    missing("--kind");
    a.kind = ask("kind (unhitched, hitched, tensioned)", [](const std::string& s) {
      if (!parse_pass_kind(s)) throw data_error("expected unhitched, hitched or tensioned");
    });
  }
  PassKind kind = *parse_pass_kind(a.kind);
  if (kind == PassKind::tensioned && a.setting.empty()) {
    missing("--setting");
    a.setting = ask("bar setting", [](const std::string& s) {
      if (s.empty()) throw data_error("expected the bar tension setting");
    });
  }
  if (a.ticket.empty()) {
    missing("--ticket");
    a.ticket = ask("ticket number", [](const std::string& s) {
      if (s.empty()) throw data_error("expected the ticket number");
    });
  }
  if (a.weighed_at.empty()) {
    missing("--weighed-at");
    a.weighed_at = ask("weighed at (e.g. 2026-11-03T09:14:00-06:00)", [](const std::string& s) {
      if (auto why = format::check_iso_date_time(s); !why.empty()) throw data_error(why);
    });
  }
  auto reading = [&](std::optional<double>& v, const char* flag, const char* platform) {
    if (v) return;
    missing(flag);
    std::string prompt = fmt::format("{} platform ({})", platform, to_string(unit));
    v = parse_weight(ask(prompt, [&](const std::string& s) {
                       store::check_reading(platform, parse_weight(s, platform), scale, unit);
                     }), platform);
  };
  reading(a.steer, "--steer", "steer");
  reading(a.drive, "--drive", "drive");
  if (kind != PassKind::unhitched) reading(a.trailer, "--trailer", "trailer");
  if (!a.gross && tty) {
    std::string g = ask(fmt::format("printed gross ({}, empty if not printed)", to_string(unit)),
                        [&](const std::string& s) {
                          if (s.empty()) return;
                          Pass p;
                          p.steer = *a.steer;
                          p.drive = *a.drive;
                          p.trailer = a.trailer;
                          p.gross = parse_weight(s, "gross");
                          store::check_gross(p, unit);
                        });
    if (!g.empty()) a.gross = parse_weight(g, "gross");
  }
}

}  // namespace

void register_pass(CLI::App& app, Context& ctx) {
  auto* pass = app.add_subcommand("pass", "Passes over the scale: add, void, correct");
  pass->footer("Examples:\n  scaleproof pass add --session 1 --kind unhitched --ticket QX-4101 \\\n      --weighed-at 2026-10-14T09:12:00-06:00 --steer 3480 --drive 2700\n  scaleproof pass void 3 --reason \"drive reading keyed wrong; re-weighed as QX-4392\"");
  pass->require_subcommand(1);

  auto a = std::make_shared<AddOpts>();
  auto* add = pass->add_subcommand("add", "Log one pass (asks for missing fields on a terminal)");
  add->footer("Examples:\n  scaleproof pass add --session 1 --kind tensioned --setting 4 --ticket QX-4104 \\\n      --weighed-at 2026-10-14T09:36:00-06:00 --steer 3300 --drive 3720 --trailer 6560 --gross 13580");
  add->add_option("--session", a->session, "Session id")->required();
  add->add_option("--kind", a->kind, "unhitched, hitched or tensioned")
      ->check(CLI::IsMember({"unhitched", "hitched", "tensioned"}));
  add->add_option("--setting", a->setting, "Bar tension setting (tensioned passes)");
  add->add_option("--ticket", a->ticket, "Scale ticket number");
  add->add_option("--weighed-at", a->weighed_at, "Time on the ticket, ISO 8601 with offset");
  add->add_option("--steer", a->steer_text, "Steer-platform reading, in the scale's unit")
      ->type_name("NUMBER");
  add->add_option("--drive", a->drive_text, "Drive-platform reading")->type_name("NUMBER");
  add->add_option("--trailer", a->trailer_text, "Trailer-platform reading (hitched, tensioned)")
      ->type_name("NUMBER");
  add->add_option("--gross", a->gross_text, "Printed gross, when the ticket shows one")
      ->type_name("NUMBER");
  add->add_option("--ticket-scale", a->ticket_scale, "Scale id on the ticket, if not the session's");
  add->add_option("--by", a->by, "Who keys it in (default $SCALEPROOF_OPERATOR, $USER)");
  add->callback([&ctx, a] {
    const auto& names = pass_flag_names();
    a->steer = number_flag(a->steer_text, "steer", names);
    a->drive = number_flag(a->drive_text, "drive", names);
    a->trailer = number_flag(a->trailer_text, "trailer", names);
    a->gross = number_flag(a->gross_text, "gross", names);
    auto store = open_store(ctx);
    ScaleInfo scale;
    WeightUnit unit = WeightUnit::lb;
    {
      // Read what the checks need without holding the write lock while a person types.
      store::Txn txn(*store, store::Txn::read);
      Session s = store->load_session(a->session);
      scale = s.scale;
      unit = s.units.weight;
      txn.commit();
    }
    fill_missing(*a, scale, unit, stdin_is_terminal());
    Pass p;
    p.kind = *parse_pass_kind(a->kind);
    if (!a->setting.empty()) p.setting = a->setting;
    p.ticket = a->ticket;
    p.weighed_at = a->weighed_at;
    p.steer = *a->steer;
    p.drive = *a->drive;
    p.trailer = a->trailer;
    p.gross = a->gross;
    if (!a->ticket_scale.empty()) p.scale_id = a->ticket_scale;
    p.entered_by = who(a->by);
    // The flags as the user typed them (the store checks again, naming the ticket).
    validate::pass(p, unit, names);
    validate::pass_on_scale(p, scale, unit, names);
    store::Txn txn(*store, store::Txn::write);
    long long id = store->add_pass(a->session, p);
    txn.commit();
    if (ctx.quiet) {
      std::cout << id << "\n";
    } else {
      std::cout << "pass " << id << " stored (ticket " << p.ticket << ", " << to_string(p.kind)
                << ")\n";
    }
  });

  struct VoidOpts {
    long long id = 0;
    std::string reason, by;
  };
  auto v = std::make_shared<VoidOpts>();
  auto* vd = pass->add_subcommand("void", "Void a pass (kept on record, left out of the solution)");
  vd->footer("Example:\n  scaleproof pass void 3 --reason \"drive reading keyed wrong; re-weighed as QX-4392\"");
  vd->add_option("ID", v->id, "Pass id (see session show)")->required();
  vd->add_option("--reason", v->reason, "Why it is void")->required();
  vd->add_option("--by", v->by, "Who voids it (default $SCALEPROOF_OPERATOR, $USER)");
  vd->callback([&ctx, v] {
    auto store = open_store(ctx);
    store::Txn txn(*store, store::Txn::write);
    store->void_pass(v->id, v->reason, who(v->by), "");
    txn.commit();
    if (!ctx.quiet) std::cout << "pass " << v->id << " voided\n";
  });

  register_pass_correct(pass, ctx);  // cmd_pass_correct.cpp
}

}  // namespace sp::cli
