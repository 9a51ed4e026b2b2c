// `scaleproof pass correct ID --reason ... [--steer ...] ...`: record a correction that
// supersedes a pass and keeps its ticket number (the re-keyed ticket is the same paper
// ticket). The pass stays stored as first keyed in; `session show` lists both, and reconcile,
// reports and audits use the corrected values. Fields not given keep their current value
// (the pass's, or its latest correction's). A pass may be corrected again; a voided pass, a
// pass of a closed session or of another session (--session) cannot be.
// Exit: 0 stored (prints the correction id); 65 refused (pass and field named); 66 no such
// pass; 2 usage; 75 the store stayed busy.
#include <fmt/format.h>

#include <iostream>

#include "cli/commands.h"
#include "cli/store_cli.h"
#include "core/error.h"
#include "format/iso8601.h"

namespace sp::cli {

namespace {

struct CorrectOpts {
  long long id = 0;
  std::optional<long long> session;
  std::string reason, by;
  std::optional<std::string> kind, setting, weighed_at, ticket_scale;
  std::optional<double> steer, drive, trailer, gross;
  bool no_gross = false, no_trailer = false, no_setting = false;
};

// The current view of the pass with the options applied.
Pass corrected_pass(const Pass& current, const CorrectOpts& o) {
  Pass p = current;
  const std::string what = fmt::format("pass {} (ticket {})", o.id, current.ticket);
  if (o.kind) {
    p.kind = *parse_pass_kind(*o.kind);
    // A pass that stops being tensioned loses its bar setting, and one that becomes unhitched
    // its trailer reading, unless they are given again (they are then refused by the checks).
    if (p.kind != PassKind::tensioned && !o.setting) p.setting.reset();
    if (p.kind == PassKind::unhitched && !o.trailer) p.trailer.reset();
  }
  if (o.setting) p.setting = *o.setting;
  if (o.no_setting) p.setting.reset();
  if (o.weighed_at) {
    if (auto why = format::check_iso_date_time(*o.weighed_at); !why.empty()) {
      throw data_error(
          fmt::format("{}: --weighed-at: expected an ISO 8601 date-time with "
                      "offset, got '{}' ({})",
                      what, *o.weighed_at, why));
    }
    p.weighed_at = *o.weighed_at;
  }
  if (o.steer) p.steer = *o.steer;
  if (o.drive) p.drive = *o.drive;
  if (o.trailer) p.trailer = *o.trailer;
  if (o.no_trailer) p.trailer.reset();
  if (o.ticket_scale) {
    if (o.ticket_scale->empty()) {
      p.scale_id.reset();
    } else {
      p.scale_id = *o.ticket_scale;
    }
  }
  if (o.gross) p.gross = *o.gross;
  if (o.no_gross) p.gross.reset();
  // The printed gross is what the paper ticket shows; it is never recomputed here. When the
  // readings change and the old gross no longer adds up, ask for it.
  const bool readings_changed =
      p.steer != current.steer || p.drive != current.drive || p.trailer != current.trailer;
  if (readings_changed && current.gross && !o.gross && !o.no_gross) {
    double sum = p.steer + p.drive + p.trailer.value_or(0);
    if (*current.gross != sum) {
      throw usage_error(
          fmt::format("pass correct: {}: the stored gross {} is no longer the sum "
                      "of the platforms ({}); give --gross as printed on the "
                      "ticket, or --no-gross",
                      what, num(*current.gross), num(sum)));
    }
  }
  return p;
}

}  // namespace

void register_pass_correct(CLI::App* pass, Context& ctx) {
  auto o = std::make_shared<CorrectOpts>();
  auto* sub = pass->add_subcommand(
      "correct",
      "Correct a pass (a new row; the ticket keeps its number, the old values stay "
      "on record)");
  sub->footer(
      "Examples:\n  scaleproof pass correct 8 --drive 4980 --gross 15520 \\\n      --reason "
      "\"drive keyed 4960; the ticket shows 4980\"\n  scaleproof pass correct 9 --session 1 "
      "--setting 5 --reason \"bar setting was 5, not 4\"");
  sub->add_option("ID", o->id, "Pass id (see session show)")->required();
  sub->add_option("--reason", o->reason, "Why the pass is corrected")->required();
  sub->add_option("--session", o->session, "Refuse unless the pass is in this session");
  sub->add_option("--kind", o->kind, "unhitched, hitched or tensioned")
      ->check(CLI::IsMember({"unhitched", "hitched", "tensioned"}));
  sub->add_option("--setting", o->setting, "Bar tension setting (tensioned passes)");
  sub->add_flag("--no-setting", o->no_setting, "The pass has no bar setting");
  sub->add_option("--weighed-at", o->weighed_at, "Time on the ticket, ISO 8601 with offset");
  sub->add_option("--steer", o->steer, "Steer-platform reading, in the scale's unit");
  sub->add_option("--drive", o->drive, "Drive-platform reading");
  sub->add_option("--trailer", o->trailer, "Trailer-platform reading");
  sub->add_flag("--no-trailer", o->no_trailer, "The pass has no trailer reading");
  sub->add_option("--gross", o->gross, "Printed gross, as on the ticket");
  sub->add_flag("--no-gross", o->no_gross, "The ticket shows no gross");
  sub->add_option("--ticket-scale", o->ticket_scale,
                  "Scale id on the ticket, if not the session's (empty: the session's)");
  sub->add_option("--by", o->by, "Who corrects it (default $SCALEPROOF_OPERATOR, $USER)");
  sub->callback([&ctx, o] {
    if ((o->gross && o->no_gross) || (o->trailer && o->no_trailer) ||
        (o->setting && o->no_setting)) {
      throw usage_error("pass correct: a value and its --no-... flag exclude each other");
    }
    auto store = open_store(ctx);
    store::Txn txn(*store, store::Txn::write);
    // The pass as it reads now: from its session's corrected view.
    auto session_id = store->pass_session(o->id);
    if (!session_id)
      throw Error(ExitCode::no_input, fmt::format("pass {}: not in the store", o->id));
    std::optional<Pass> current;
    for (const Pass& p : store->load_session(*session_id).passes) {
      if (p.id == o->id) current = p;
    }
    if (!current)
      throw Error(ExitCode::internal, fmt::format("pass {}: not in its session", o->id));
    // A voided pass goes to the store as it is, which refuses it in its own words.
    Pass p = current->voided ? *current : corrected_pass(*current, *o);
    long long id = store->correct_pass(o->id, o->session, p, o->reason, who(o->by), "");
    txn.commit();
    if (ctx.quiet) {
      std::cout << id << "\n";
    } else {
      std::cout << fmt::format("pass {} corrected (ticket {}; correction {})\n", o->id,
                               current->ticket, id);
    }
  });
}

}  // namespace sp::cli
