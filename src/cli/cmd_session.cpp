// `scaleproof session open|close|list|show`: weigh sessions (a rig on a scale, one sitting).
// Exit: 0 done; 65 refused (named); 66 no such session, rig or scale; 2 usage.
#include <iostream>
#include <vector>

#include <fmt/format.h>
#include <fmt/ranges.h>

#include "cli/commands.h"
#include "cli/store_cli.h"
#include "core/error.h"

namespace sp::cli {

namespace {

// "drive 4760 -> 4780, gross 15500 -> 15520": the values a correction changed.
std::string changes(const Pass& a, const Pass& b) {
  std::vector<std::string> out;
  auto text = [](const std::optional<std::string>& v) { return v.value_or("-"); };
  if (a.kind != b.kind) out.push_back(fmt::format("kind {} -> {}", to_string(a.kind), to_string(b.kind)));
  if (a.setting != b.setting) out.push_back(fmt::format("setting {} -> {}", text(a.setting), text(b.setting)));
  if (a.weighed_at != b.weighed_at) out.push_back(fmt::format("weighed at {} -> {}", a.weighed_at, b.weighed_at));
  if (a.steer != b.steer) out.push_back(fmt::format("steer {} -> {}", num(a.steer), num(b.steer)));
  if (a.drive != b.drive) out.push_back(fmt::format("drive {} -> {}", num(a.drive), num(b.drive)));
  if (a.trailer != b.trailer) out.push_back(fmt::format("trailer {} -> {}", num(a.trailer), num(b.trailer)));
  if (a.gross != b.gross) out.push_back(fmt::format("gross {} -> {}", num(a.gross), num(b.gross)));
  if (a.scale_id != b.scale_id) out.push_back(fmt::format("ticket scale {} -> {}", text(a.scale_id), text(b.scale_id)));
  return fmt::format("{}", fmt::join(out, ", "));
}

void show_session(const store::SessionHistory& h) {
  const Session& s = h.session;
  auto wu = to_string(s.units.weight);
  std::cout << fmt::format("session {}{}\n", *s.session_id, h.ref ? " (" + *h.ref + ")" : "");
  std::cout << fmt::format("  rig       {}: {} + {}\n", h.rig_name, s.tow_vehicle.label,
                           s.trailer.label);
  std::cout << fmt::format("  scale     {} (d = {} {}, class {}, last inspected {})\n",
                           s.scale.id, num(s.scale.division), wu, s.scale.accuracy_class,
                           s.scale.last_inspected.value_or("never"));
  if (s.operator_name) std::cout << "  operator  " << *s.operator_name << "\n";
  if (s.station) std::cout << "  station   " << *s.station << "\n";
  if (s.owner) std::cout << "  owner     " << *s.owner << "\n";
  std::cout << "  opened    " << h.opened_at << (h.opened_by ? " by " + *h.opened_by : "") << "\n";
  std::cout << "  closed    " << (h.closed_at ? *h.closed_at + (h.closed_by ? " by " + *h.closed_by : "") : "no (open)") << "\n";
  std::cout << fmt::format("  passes ({}):\n", wu);
  std::cout << fmt::format("    {:>6}  {:<10} {:<8} {:<10} {:>8} {:>8} {:>8} {:>8}  {}\n", "id",
                           "kind", "setting", "ticket", "steer", "drive", "trailer", "gross",
                           "weighed at");
  // The passes as they read now (the latest correction of each), then what was corrected.
  auto corrected = [&h](long long id) {
    for (const auto& c : h.pass_corrections) {
      if (c.pass_id == id) return true;
    }
    return false;
  };
  for (const Pass& p : s.passes) {
    std::cout << fmt::format("    {:>6}  {:<10} {:<8} {:<10} {:>8} {:>8} {:>8} {:>8}  {}{}{}\n",
                             p.id.value_or(0), to_string(p.kind), p.setting.value_or("-"),
                             p.ticket, num(p.steer), num(p.drive), num(p.trailer), num(p.gross),
                             p.weighed_at, p.voided ? "  VOIDED" : "",
                             corrected(*p.id) ? "  CORRECTED" : "");
  }
  if (!h.corrections.empty() || !h.pass_corrections.empty()) {
    std::cout << "  corrections:\n";
    for (const auto& c : h.pass_corrections) {
      std::cout << fmt::format("    correct pass {} (ticket {}): {}: {} - by {} at {}\n",
                               c.pass_id, c.ticket, changes(c.was, c.now), c.reason,
                               c.made_by.value_or("-"), c.made_at);
    }
    for (const auto& c : h.corrections) {
      std::cout << fmt::format("    {} pass {} (ticket {}): {} - by {} at {}\n", c.action,
                               c.pass_id, c.ticket, c.reason, c.made_by.value_or("-"), c.made_at);
    }
  }
  if (!h.inspections.empty()) {
    std::cout << "  scale inspections:\n";
    for (const auto& i : h.inspections) {
      std::cout << fmt::format("    {}  seal/certificate {}\n", i.inspected_on, i.seal.value_or("-"));
    }
  }
  for (const auto& r : h.reports) {
    std::cout << fmt::format("  report {} issued {} (PDF SHA-256 {}, key {})\n", r.report_id,
                             r.issued_at, r.pdf_sha256, r.key_fingerprint);
  }
}

}  // namespace

void register_session(CLI::App& app, Context& ctx) {
  auto* session = app.add_subcommand("session", "Weigh sessions: open, close, list, show");
  session->footer("Examples:\n  scaleproof session open --rig RA-1 --scale QX-1 --operator \"Marit Oyelaran\"\n  scaleproof session show 1");
  session->require_subcommand(1);

  struct OpenOpts {
    std::string rig, scale, ref, op, station, owner, notes, by;
    std::optional<double> length_u;
  };
  auto o = std::make_shared<OpenOpts>();
  auto* open = session->add_subcommand("open", "Open a session: a rig on a scale");
  open->footer("Examples:\n  scaleproof session open --rig RA-1 --scale QX-1 --operator \"Marit Oyelaran\" \\\n      --owner \"Rosalind Achterberg\"");
  open->add_option("--rig", o->rig, "Rig name or id")->required();
  open->add_option("--scale", o->scale, "Scale id")->required();
  open->add_option("--ref", o->ref, "Your own key for the session (unique; CSV `session`)");
  open->add_option("--operator", o->op, "Who runs the scale");
  open->add_option("--station", o->station, "Weigh station");
  open->add_option("--owner", o->owner, "Owner of the rig");
  open->add_option("--notes", o->notes, "Notes");
  open->add_option("--length-uncertainty", o->length_u,
                   "Standard uncertainty of the tape lengths, in the rig's length unit");
  open->add_option("--by", o->by, "Who opens it (default $SCALEPROOF_OPERATOR, $USER)");
  open->callback([&ctx, o] {
    auto store = open_store(ctx);
    store::Txn txn(*store, store::Txn::write);
    auto rig = store->find_rig(o->rig);
    if (!rig) throw Error(ExitCode::no_input, "rig " + o->rig + ": not in the store");
    auto scale = store->find_scale(o->scale);
    if (!scale) throw Error(ExitCode::no_input, "scale " + o->scale + ": not in the store");
    store::NewSession ns;
    ns.rig_id = rig->id;
    ns.scale_id = scale->id;
    auto opt = [](const std::string& v) { return v.empty() ? std::nullopt : std::optional<std::string>(v); };
    ns.ref = opt(o->ref);
    ns.operator_name = opt(o->op);
    ns.station = opt(o->station);
    ns.owner = opt(o->owner);
    ns.notes = opt(o->notes);
    ns.length_uncertainty = o->length_u;
    ns.opened_by = who(o->by);
    long long id = store->open_session(ns);
    txn.commit();
    if (ctx.quiet) {
      std::cout << id << "\n";
    } else {
      std::cout << "session " << id << " opened\n";
    }
  });

  struct CloseOpts {
    long long id = 0;
    std::string by;
  };
  auto c = std::make_shared<CloseOpts>();
  auto* close = session->add_subcommand("close", "Close a session: no more passes");
  close->footer("Example:\n  scaleproof session close 1");
  close->add_option("ID", c->id, "Session id")->required();
  close->add_option("--by", c->by, "Who closes it (default $SCALEPROOF_OPERATOR, $USER)");
  close->callback([&ctx, c] {
    auto store = open_store(ctx);
    store::Txn txn(*store, store::Txn::write);
    store->close_session(c->id, who(c->by), "");
    txn.commit();
    if (!ctx.quiet) std::cout << "session " << c->id << " closed\n";
  });

  auto* list = session->add_subcommand("list", "List the sessions");
  list->footer("Example:\n  scaleproof session list");
  list->callback([&ctx] {
    auto store = open_store(ctx);
    store::Txn txn(*store, store::Txn::read);
    std::cout << fmt::format("{:>6}  {:<14} {:<16} {:<8} {:>6} {:>6}  {:<20} {}\n", "id", "ref",
                             "rig", "scale", "passes", "voided", "opened", "closed");
    for (const auto& s : store->list_sessions()) {
      std::cout << fmt::format("{:>6}  {:<14} {:<16} {:<8} {:>6} {:>6}  {:<20} {}\n", s.id,
                               s.ref.value_or("-"), s.rig_name, s.scale_code, s.passes, s.voided,
                               s.opened_at, s.closed_at.value_or("open"));
    }
    txn.commit();
  });

  auto show_id = std::make_shared<long long>(0);
  auto* show = session->add_subcommand("show", "Show a session: passes, corrections, reports");
  show->footer("Example:\n  scaleproof session show 1");
  show->add_option("ID", *show_id, "Session id")->required();
  show->callback([&ctx, show_id] {
    auto store = open_store(ctx);
    store::Txn txn(*store, store::Txn::read);
    show_session(store->session_history(*show_id));
    txn.commit();
  });
}

}  // namespace sp::cli
