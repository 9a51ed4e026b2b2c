// The audit's entry point for one item and the helpers the rule families share.
#include <fmt/format.h>

#include <cmath>

#include "audit/rules_internal.h"

namespace sp::audit {

std::string_view to_string(ItemKind k) {
  switch (k) {
    case ItemKind::report: return "report";
    case ItemKind::session: return "session";
    case ItemKind::store: return "store";
  }
  return "session";
}

int ItemAudit::count(Severity s) const {
  int n = 0;
  for (const auto& f : findings) n += f.severity == s ? 1 : 0;
  return n;
}

std::optional<Severity> ItemAudit::worst() const {
  std::optional<Severity> w;
  for (const auto& f : findings) {
    if (!w || static_cast<int>(f.severity) < static_cast<int>(*w)) w = f.severity;
  }
  return w;
}

std::string item_label(const AuditItem& item) {
  const Session& s = item.session;
  std::string label = s.session_id ? fmt::format("session {}, ", *s.session_id) : "";
  label += s.scale.id.empty() ? "scale not named" : fmt::format("scale {}", s.scale.id);
  if (s.station) label += fmt::format(" at {}", *s.station);
  for (const auto& p : s.passes) {
    if (auto t = parse_date_time(p.weighed_at)) {
      label += ", " + format_date(t->local_day);
      break;
    }
  }
  return label;
}

std::vector<Finding> audit_item(const AuditItem& item, const AuditOptions& options) {
  std::vector<Finding> out;
  const auto live = detail::live_passes(item.session);
  detail::record_rules(item, options, out);
  detail::anchor_rules(item, out);
  detail::ticket_rules(item, options, live, out);
  detail::scale_rules(item, options, live, out);
  detail::physics_rules(item, options, live, out);
  detail::timing_rules(item, options, live, out);
  return out;
}

namespace detail {

std::string number_text(double v, int decimals) {
  std::string s = fmt::format("{:.{}f}", v, decimals);
  if (s.find('.') != std::string::npos) {
    while (s.back() == '0') s.pop_back();
    if (s.back() == '.') s.pop_back();
  }
  if (s == "-0") s = "0";
  return s;
}

std::string weight_text(double v, WeightUnit u) {
  return number_text(v, 1) + " " + std::string(to_string(u));
}

EvidenceValue weight_value(const std::string& name, double v, WeightUnit u) {
  return EvidenceValue{name, weight_text(v, u), v, std::string(to_string(u))};
}

EvidenceValue number_value(const std::string& name, double v, const std::string& unit,
                           int decimals) {
  std::string text = number_text(v, decimals);
  if (!unit.empty()) text += " " + unit;
  return EvidenceValue{name, text, v, unit};
}

EvidenceValue text_value(const std::string& name, const std::string& text) {
  return EvidenceValue{name, text, std::nullopt, ""};
}

Finding make_finding(std::string code, Severity s, std::string message, std::string rule) {
  Finding f;
  f.code = std::move(code);
  f.severity = s;
  f.message = std::move(message);
  f.rule = std::move(rule);
  return f;
}

std::vector<TimedPass> live_passes(const Session& s) {
  std::vector<TimedPass> out;
  out.reserve(s.passes.size());
  for (const auto& p : s.passes) {
    if (p.voided) continue;
    out.push_back(TimedPass{&p, parse_date_time(p.weighed_at)});
  }
  return out;
}

const std::string& pass_scale(const Session& s, const Pass& p) {
  return p.scale_id && !p.scale_id->empty() ? *p.scale_id : s.scale.id;
}

}  // namespace detail
}  // namespace sp::audit
