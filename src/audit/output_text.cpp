// The audit's readable findings table and its JSON document (output.h).
#include <fmt/format.h>

#include <set>

#include "audit/calendar.h"
#include "audit/output.h"
#include "report/report_text.h"

namespace sp::audit {
namespace {

constexpr std::size_t kWidth = 100;  // DEVELOPERS.md: 100 columns

// Greedy word wrap of `text` into lines of at most `width` characters (bytes; our messages are
// ASCII apart from the odd ± or §, which only makes a line a little shorter on screen).
std::vector<std::string> wrap(const std::string& text, std::size_t width) {
  // Words are runs of non-whitespace (as `istream >> word` reads them), joined by one space.
  std::vector<std::string> lines;
  std::string line;
  const auto is_space = [](char c) {
    return c == ' ' || c == '\t' || c == '\n' || c == '\r' || c == '\v' || c == '\f';
  };
  std::size_t i = 0;
  const std::size_t n = text.size();
  while (i < n) {
    while (i < n && is_space(text[i])) ++i;
    if (i == n) break;
    std::size_t j = i;
    while (j < n && !is_space(text[j])) ++j;
    const std::size_t len = j - i;
    if (!line.empty() && line.size() + 1 + len > width) {
      lines.push_back(std::move(line));
      line.clear();
    }
    if (!line.empty()) line += ' ';
    line.append(text, i, len);
    i = j;
  }
  if (!line.empty()) lines.push_back(std::move(line));
  return lines;
}

std::string severity_word(Severity s, bool colour) {
  std::string w = s == Severity::error ? "ERROR" : s == Severity::warning ? "WARNING" : "note";
  std::string padded = fmt::format("{:<8}", w);
  if (!colour) return padded;
  const char* code = s == Severity::error ? "\033[1;31m" : s == Severity::warning ? "\033[33m" : "";
  return std::string(code) + padded + "\033[0m";
}

std::size_t claim_count(const AuditResult& r) {
  std::set<std::string> claims;
  for (const auto& i : r.items) claims.insert(i.claim);
  return claims.size();
}

std::string plural(std::size_t n, const char* one, const char* many) {
  return fmt::format("{} {}", n, n == 1 ? one : many);
}

}  // namespace

std::vector<std::string> audit_cautions() {
  std::vector<std::string> out = {
      "This audit checks the documents: their signatures, their tickets and what the readings "
      "show by calculation. It does not inspect the rig, and it does not replace the vehicle "
      "and hitch makers' instructions, the law where the rig is towed, or an inspection by a "
      "qualified person."};
  report::ReportText rt = report::load_report_text();
  const auto& list = rt.cautions.at("cautions");
  if (!list.empty()) out.push_back(list.at(0).get<std::string>());
  return out;
}

std::string audit_text_head(const AuditReport& rep, std::size_t items, std::size_t claims) {
  const AuditResult& r = rep.result;
  const AuditOptions& o = rep.options;
  std::string out;
  out += fmt::format("Claim-file audit: {} in {}; {}, {}, {}; {} without findings\n",
                     plural(items, "item", "items"), plural(claims, "claim", "claims"),
                     plural(static_cast<std::size_t>(r.errors), "error", "errors"),
                     plural(static_cast<std::size_t>(r.warnings), "warning", "warnings"),
                     plural(static_cast<std::size_t>(r.notes), "note", "notes"), r.clean_items);
  const std::string limits = fmt::format(
      "Audited at {}; claim date {}. Limits: passes within {} min, inspection within {} months "
      "before the weighing, weighing at most {} days before the claim date.",
      format_utc(o.now), o.claim_date.value_or("not given"), o.max_span_minutes,
      o.inspection_months, o.stale_days);
  for (const auto& l : wrap(limits, kWidth)) out += l + "\n";
  if (rep.trusted_keys.empty()) {
    out += "Trusted station keys: none given (--trust); report origins are not checked.\n";
  } else {
    out += "Trusted station keys:\n";
    for (const auto& k : rep.trusted_keys) out += "  " + k + "\n";
  }
  if (!rep.unreadable.empty()) {
    out += fmt::format("\nCould not read {}:\n", plural(rep.unreadable.size(), "input", "inputs"));
    for (const auto& u : rep.unreadable) out += "  " + u.message + "\n";
  }
  return out;
}

std::string audit_text_item(const ItemAudit& ia, bool colour) {
  std::string out = fmt::format("\n== {} ({})\n", ia.source, to_string(ia.kind));
  const std::string counts = fmt::format(
      "{}: {}, {}, {}", ia.label,
      plural(static_cast<std::size_t>(ia.count(Severity::error)), "error", "errors"),
      plural(static_cast<std::size_t>(ia.count(Severity::warning)), "warning", "warnings"),
      plural(static_cast<std::size_t>(ia.count(Severity::note)), "note", "notes"));
  for (const auto& l : wrap(counts, kWidth - 3)) out += "   " + l + "\n";
  for (const auto& l : wrap(
           "verdict: " + std::string(to_string(ia.verdict)) + ". " + ia.verdict_reason, kWidth - 3))
    out += "   " + l + "\n";
  out +=
      fmt::format("   {:<8} {:<22} {:<10} {}\n", "severity", "finding", "ticket", "what it means");
  const std::string indent(3 + 9 + 23 + 11, ' ');
  for (const auto& f : ia.findings) {
    auto lines = wrap(f.message, kWidth - indent.size());
    out += fmt::format("   {} {:<22} {:<10} {}\n", severity_word(f.severity, colour), f.code,
                       f.ticket.value_or("-"), lines.empty() ? "" : lines[0]);
    for (std::size_t i = 1; i < lines.size(); ++i) out += indent + lines[i] + "\n";
    if (!f.values.empty()) {
      std::string ev;
      for (const auto& v : f.values) ev += (ev.empty() ? "" : "; ") + v.name + " " + v.text;
      for (const auto& l : wrap("evidence: " + ev, kWidth - indent.size())) {
        out += indent + l + "\n";
      }
    }
    for (const auto& l : wrap("rule: " + f.rule, kWidth - indent.size())) {
      out += indent + l + "\n";
    }
  }
  return out;
}

std::string audit_text_clean_line(const ItemAudit& ia) {
  const auto lines = wrap(fmt::format("{} ({}): {}; verdict {}", ia.source, to_string(ia.kind),
                                      ia.label, to_string(ia.verdict)),
                          kWidth - 4);
  std::string out;
  for (std::size_t i = 0; i < lines.size(); ++i) out += (i == 0 ? "  " : "    ") + lines[i] + "\n";
  return out;
}

std::string audit_text_tail(std::size_t clean, const std::vector<std::string>& clean_lines,
                            std::size_t max_clean_lines) {
  std::string out;
  if (clean > 0) {
    out += fmt::format("\nNo findings ({}):\n", clean);
    if (clean <= max_clean_lines) {
      for (const auto& l : clean_lines) out += l;
    } else {
      out +=
          fmt::format("  {} items, not listed one by one (use --json for the full list)\n", clean);
    }
  }
  out += "\nCautions:\n";
  for (const auto& c : audit_cautions()) {
    auto lines = wrap(c, kWidth - 4);
    for (std::size_t i = 0; i < lines.size(); ++i) {
      out += (i == 0 ? "  - " : "    ") + lines[i] + "\n";
    }
  }
  return out;
}

std::string audit_text(const AuditReport& rep, bool colour, std::size_t max_clean_lines) {
  const AuditResult& r = rep.result;
  std::string out = audit_text_head(rep, r.items.size(), claim_count(r));
  std::vector<std::string> clean;
  for (const auto& ia : r.items) {
    if (ia.findings.empty()) {
      if (clean.size() <= max_clean_lines) clean.push_back(audit_text_clean_line(ia));
      continue;
    }
    out += audit_text_item(ia, colour);
  }
  std::size_t n_clean = 0;
  for (const auto& ia : r.items) n_clean += ia.findings.empty() ? 1 : 0;
  return out + audit_text_tail(n_clean, clean, max_clean_lines);
}

nlohmann::ordered_json audit_json_item(const ItemAudit& ia) {
  using J = nlohmann::ordered_json;
  J item;
  item["source"] = ia.source;
  item["claim"] = ia.claim;
  item["kind"] = std::string(to_string(ia.kind));
  item["label"] = ia.label;
  item["verdict"] = std::string(to_string(ia.verdict));
  item["verdict_reason"] = ia.verdict_reason;
  auto w = ia.worst();
  item["worst"] = w ? J(std::string(to_string(*w))) : J(nullptr);
  J findings = J::array();
  for (const auto& f : ia.findings) {
    J jf;
    jf["code"] = f.code;
    jf["severity"] = std::string(to_string(f.severity));
    jf["message"] = f.message;
    jf["ticket"] = f.ticket ? J(*f.ticket) : J(nullptr);
    jf["platform"] = f.platform ? J(*f.platform) : J(nullptr);
    jf["rule"] = f.rule;
    J ev = J::array();
    for (const auto& v : f.values) {
      ev.push_back({{"name", v.name},
                    {"text", v.text},
                    {"value", v.number ? J(*v.number) : J(nullptr)},
                    {"unit", v.unit}});
    }
    jf["evidence"] = std::move(ev);
    findings.push_back(std::move(jf));
  }
  item["findings"] = std::move(findings);
  return item;
}

nlohmann::ordered_json audit_json(const AuditReport& rep) {
  using J = nlohmann::ordered_json;
  const AuditResult& r = rep.result;
  const AuditOptions& o = rep.options;
  J doc;
  doc["format"] = "scaleproof-audit/1";
  doc["audited_at"] = format_utc(o.now);
  doc["claim_date"] = o.claim_date ? J(*o.claim_date) : J(nullptr);
  doc["limits"] = {{"max_span_minutes", o.max_span_minutes},
                   {"inspection_months", o.inspection_months},
                   {"stale_days", o.stale_days},
                   {"future_slack_minutes", o.future_slack_minutes}};
  doc["trusted_keys"] = rep.trusted_keys;
  doc["summary"] = {{"items", r.items.size()}, {"errors", r.errors},
                    {"warnings", r.warnings},  {"notes", r.notes},
                    {"clean", r.clean_items},  {"unreadable", rep.unreadable.size()}};
  J items = J::array();
  for (const auto& ia : r.items) items.push_back(audit_json_item(ia));
  doc["items"] = std::move(items);
  J unread = J::array();
  for (const auto& u : rep.unreadable)
    unread.push_back({{"source", u.source}, {"message", u.message}});
  doc["unreadable"] = std::move(unread);
  doc["cautions"] = audit_cautions();
  return doc;
}

}  // namespace sp::audit
