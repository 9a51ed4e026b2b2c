// The Auditor: per-item rules, plus ticket-reuse across every item added.
//
//   ticket-reuse  error  the same ticket number at the same scale in two sessions (or two
//                        claims). A scale numbers its tickets once, so a second weighing cannot
//                        carry the same number. Exception: within one claim, a report and a
//                        session file may describe the same weighing; when the pass is
//                        identical (time and readings) and neither copy comes from the store,
//                        the two are one weighing documented twice, not a reuse. Across claims
//                        an identical pass is exactly the reuse the rule is for.
// "Same scale": the pass's scale id (its own, else the session's); when both sessions name
// their station and the stations differ, the scales are different ones.
#include <fmt/format.h>

#include <algorithm>
#include <map>
#include <unordered_map>
#include <unordered_set>

#include "audit/rules_internal.h"
#include "core/error.h"

namespace sp::audit {

namespace {

struct Occurrence {
  std::uint32_t item = 0;   // ItemAudit::index of the item it was seen in
  std::uint32_t claim = 0;  // index into State::claims
  ItemKind kind = ItemKind::session;
  std::optional<std::string> station;
  std::string weighed_at;
  std::optional<std::int64_t> utc;
  double steer = 0, drive = 0, trailer = 0;
};

int rank(std::optional<Severity> s) {
  return s ? static_cast<int>(*s) : 3;
}

void sort_findings(ItemAudit& ia) {
  std::stable_sort(ia.findings.begin(), ia.findings.end(), [](const Finding& a, const Finding& b) {
    return static_cast<int>(a.severity) < static_cast<int>(b.severity);
  });
}

}  // namespace

struct Auditor::State {
  AuditOptions options;
  std::vector<ItemAudit> items;  // the items kept until finish(), in index order
  std::uint32_t added = 0;       // items added so far (kept or handed over)
  std::vector<std::string> claims;
  std::unordered_map<std::string, std::uint32_t> claim_index;
  std::unordered_map<std::string, Occurrence> tickets;  // "<scale>\x1f<ticket>" -> first seen
  std::optional<std::unordered_set<std::string>> reuse_candidates;  // limit_reuse_to
  std::function<void(ItemAudit&&)> sink;                            // on_final
  int errors = 0, warnings = 0, notes = 0, clean = 0;               // of items handed over

  // A kept item by its index (items are kept in index order).
  ItemAudit& kept(std::uint32_t index) {
    auto it = std::lower_bound(items.begin(), items.end(), index,
                               [](const ItemAudit& ia, std::uint32_t i) { return ia.index < i; });
    // An item with an indexed ticket is always kept (Auditor::add); anything else is a bug.
    if (it == items.end() || it->index != index) {
      throw Error(ExitCode::internal, "audit: ticket index names an item that was not kept");
    }
    return *it;
  }
};

void Auditor::limit_reuse_to(std::vector<std::string> tickets) {
  state_->reuse_candidates.emplace(std::make_move_iterator(tickets.begin()),
                                   std::make_move_iterator(tickets.end()));
}

void Auditor::on_final(std::function<void(ItemAudit&&)> sink) {
  state_->sink = std::move(sink);
}

Auditor::Auditor(AuditOptions options) : state_(std::make_unique<State>()) {
  state_->options = std::move(options);
}
Auditor::~Auditor() = default;

void Auditor::add(const AuditItem& item) {
  State& st = *state_;
  const std::uint32_t index = st.added++;
  ItemAudit ia;
  ia.index = index;
  ia.source = item.source;
  ia.claim = item.claim;
  ia.kind = item.kind;
  ia.label = item_label(item);
  if (item.result) {
    ia.verdict = item.result->verdict;
    ia.verdict_reason = item.result->verdict_reason;
  } else {
    ia.verdict = Verdict::not_proven;
    ia.verdict_reason =
        item.reconcile_error
            ? "The weighing could not be reconciled: " + *item.reconcile_error +
                  (!item.reconcile_error->empty() && item.reconcile_error->back() == '.' ? "" : ".")
            : "The weighing was not reconciled.";
  }
  ia.weight_unit = item.session.units.weight;
  ia.findings = audit_item(item, st.options);

  auto [cit, fresh_claim] =
      st.claim_index.emplace(item.claim, static_cast<std::uint32_t>(st.claims.size()));
  if (fresh_claim) st.claims.push_back(item.claim);
  const std::uint32_t claim = cit->second;

  // Reused tickets, grouped by the earlier item they collide with: one finding per pair.
  struct Reuse {
    std::vector<std::string> tickets, scales;
    bool identical = true;
  };
  std::map<std::uint32_t, Reuse> reuse;
  const Session& s = item.session;
  bool may_be_reused = !st.reuse_candidates;  // may a later item still reuse one of its tickets
  for (const Pass& p : s.passes) {
    if (p.voided) continue;
    if (st.reuse_candidates) {
      if (st.reuse_candidates->count(p.ticket) == 0) continue;  // no other session holds it
      may_be_reused = true;
    }
    const std::string& scale = detail::pass_scale(s, p);
    Occurrence occ;
    occ.item = index;
    occ.claim = claim;
    occ.kind = item.kind;
    occ.station = s.station;
    occ.weighed_at = p.weighed_at;
    if (auto t = parse_date_time(p.weighed_at)) occ.utc = t->utc_seconds;
    occ.steer = p.steer;
    occ.drive = p.drive;
    occ.trailer = p.trailer.value_or(0);
    std::string key = scale;
    key += '\x1f';
    key += p.ticket;
    auto [it, fresh] = st.tickets.emplace(std::move(key), occ);
    if (fresh) continue;
    const Occurrence& first = it->second;
    if (first.item == index) continue;  // twice in one session: duplicate-pass's business
    if (first.station && occ.station && *first.station != *occ.station) continue;
    const bool identical = first.utc == occ.utc && first.weighed_at == occ.weighed_at &&
                           first.steer == occ.steer && first.drive == occ.drive &&
                           first.trailer == occ.trailer;
    if (identical && first.claim == claim && first.kind != ItemKind::store &&
        occ.kind != ItemKind::store) {
      continue;  // one weighing documented twice in one claim (report + its session file)
    }
    Reuse& r = reuse[first.item];
    r.tickets.push_back(p.ticket);
    if (std::find(r.scales.begin(), r.scales.end(), scale) == r.scales.end()) {
      r.scales.push_back(scale);
    }
    r.identical = r.identical && identical;
  }
  for (const auto& [other_index, r] : reuse) {
    ItemAudit& other = st.kept(other_index);
    const bool cross_claim = other.claim != item.claim;
    const std::string tickets = fmt::format("{}", fmt::join(r.tickets, ", "));
    const std::string scales = fmt::format("{}", fmt::join(r.scales, ", "));
    auto make = [&](const std::string& elsewhere, const std::string& elsewhere_claim) {
      Finding f = detail::make_finding(
          "ticket-reuse", Severity::error,
          fmt::format(
              "{} {} of scale {} also {} in {}{}, {}. A scale numbers each ticket once, "
              "so the two cannot both be the weighing they claim to be.",
              r.tickets.size() == 1 ? "Ticket" : "Tickets", tickets, scales,
              r.tickets.size() == 1 ? "appears" : "appear", elsewhere,
              cross_claim ? " (claim " + elsewhere_claim + ")" : std::string(),
              r.identical ? "with the same times and readings" : "with other times or readings"),
          "one ticket number per weighing at one scale (common practice)");
      f.ticket = r.tickets.front();
      f.values = {detail::text_value("tickets", tickets), detail::text_value("scale", scales),
                  detail::text_value("also in", elsewhere)};
      return f;
    };
    ia.findings.push_back(make(other.source, other.claim));
    other.findings.push_back(make(item.source, item.claim));
  }
  if (may_be_reused || !st.sink) {
    st.items.push_back(std::move(ia));
    return;
  }
  // Final: no later item can add a ticket-reuse finding to it.
  sort_findings(ia);
  st.errors += ia.count(Severity::error);
  st.warnings += ia.count(Severity::warning);
  st.notes += ia.count(Severity::note);
  st.clean += ia.findings.empty() ? 1 : 0;
  st.sink(std::move(ia));
}

AuditResult Auditor::finish() {
  AuditResult r;
  r.items = std::move(state_->items);
  r.errors = state_->errors;
  r.warnings = state_->warnings;
  r.notes = state_->notes;
  r.clean_items = state_->clean;
  r.total_items = state_->added;
  r.claims = state_->claims.size();
  for (auto& ia : r.items) {
    sort_findings(ia);
    r.errors += ia.count(Severity::error);
    r.warnings += ia.count(Severity::warning);
    r.notes += ia.count(Severity::note);
    r.clean_items += ia.findings.empty() ? 1 : 0;
  }
  std::stable_sort(r.items.begin(), r.items.end(), [](const ItemAudit& a, const ItemAudit& b) {
    return rank(a.worst()) < rank(b.worst());
  });
  AuditOptions keep = std::move(state_->options);
  auto sink = std::move(state_->sink);
  state_ = std::make_unique<State>();
  state_->options = std::move(keep);
  state_->sink = std::move(sink);
  return r;
}

AuditResult run_audit(const std::vector<AuditItem>& items, const AuditOptions& options) {
  Auditor a(options);
  for (const auto& i : items) a.add(i);
  return a.finish();
}

}  // namespace sp::audit
