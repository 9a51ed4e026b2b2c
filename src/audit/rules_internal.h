// Shared helpers of the audit rule files (not part of the public interface).
#pragma once
#include <optional>
#include <string>
#include <vector>

#include "audit/audit.h"
#include "audit/calendar.h"

namespace sp::audit::detail {

// "4180 lb", "4180.5 lb": a weight with at most one decimal, trailing zeros dropped.
std::string weight_text(double v, WeightUnit u);
// Plain number with at most `decimals` decimals, trailing zeros dropped.
std::string number_text(double v, int decimals = 1);

EvidenceValue weight_value(const std::string& name, double v, WeightUnit u);
EvidenceValue number_value(const std::string& name, double v, const std::string& unit,
                           int decimals = 1);
EvidenceValue text_value(const std::string& name, const std::string& text);

Finding make_finding(std::string code, Severity s, std::string message, std::string rule);

// Non-voided passes with their parsed times (nullopt when weighed_at does not parse).
struct TimedPass {
  const Pass* pass = nullptr;
  std::optional<DateTime> time;
};
std::vector<TimedPass> live_passes(const Session& s);

// The scale a pass was weighed on: its own scale_id, else the session's.
const std::string& pass_scale(const Session& s, const Pass& p);

// Each rule family appends its findings.
void record_rules(const AuditItem& item, const AuditOptions& o, std::vector<Finding>& out);
void ticket_rules(const AuditItem& item, const AuditOptions& o, const std::vector<TimedPass>& live,
                  std::vector<Finding>& out);
void scale_rules(const AuditItem& item, const AuditOptions& o, const std::vector<TimedPass>& live,
                 std::vector<Finding>& out);
void physics_rules(const AuditItem& item, const AuditOptions& o,
                   const std::vector<TimedPass>& live, std::vector<Finding>& out);
void anchor_rules(const AuditItem& item, std::vector<Finding>& out);  // rules_anchor.cpp
void timing_rules(const AuditItem& item, const AuditOptions& o, const std::vector<TimedPass>& live,
                  std::vector<Finding>& out);

}  // namespace sp::audit::detail
