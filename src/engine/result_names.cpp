#include "engine/result.h"

namespace sp {

std::string_view to_string(Severity s) {
  switch (s) {
    case Severity::error: return "error";
    case Severity::warning: return "warning";
    case Severity::note: return "note";
  }
  return "note";
}

std::string_view to_string(ComplianceStatus s) {
  switch (s) {
    case ComplianceStatus::within: return "within";
    case ComplianceStatus::over: return "over";
    case ComplianceStatus::undecided: return "undecided";
  }
  return "undecided";
}

}  // namespace sp
