#include "engine/result.h"

namespace sp {

std::string_view to_string(Severity s) {
  switch (s) {
    case Severity::error:
      return "error";
    case Severity::warning:
      return "warning";
    case Severity::note:
      return "note";
  }
  return "note";
}

std::string_view to_string(ComplianceStatus s) {
  switch (s) {
    case ComplianceStatus::within:
      return "within";
    case ComplianceStatus::over:
      return "over";
    case ComplianceStatus::undecided:
      return "undecided";
  }
  return "undecided";
}

std::string_view to_string(Verdict v) {
  switch (v) {
    case Verdict::compliant:
      return "compliant";
    case Verdict::over:
      return "over";
    case Verdict::undecided:
      return "undecided";
    case Verdict::not_proven:
      return "not-proven";
  }
  return "not-proven";
}

}  // namespace sp
