// Verdict rules: the fit test decides whether the numbers can be relied on at all (global
// chi-square test, Narasimhan & Jordache 2000, ch. 7); only then do the ratings, each decided
// at k = 2 (JCGM 100:2008 §6.3), make the verdict. "When in doubt say not proven" (RULES.md):
// a fit with no redundancy (dof 0) cross-checks nothing, so it is not-proven too.
#include "engine/verdict.h"

#include <fmt/format.h>

#include <algorithm>

namespace sp {
namespace {

std::string weight(double v, const Units& u) {
  return fmt::format("{:.0f} {}", v, to_string(u.weight));
}

// "Drive axle vs rear GAWR (6260 ± 46 lb against 6200 lb)"
std::string row_text(const ComplianceRow& c, const Units& u) {
  return fmt::format("{} ({:.0f} ± {:.0f} {} against {})", c.label.empty() ? c.rating : c.label,
                     c.value, 2 * c.u, to_string(u.weight), weight(c.limit, u));
}

std::string join(const std::vector<std::string>& parts) {
  std::string s;
  for (size_t i = 0; i < parts.size(); ++i) {
    if (i) s += i + 1 == parts.size() ? " and " : ", ";
    s += parts[i];
  }
  return s;
}

const Flag* fit_flag(const ReconcileResult& r) {
  for (const Flag& f : r.flags)
    if (f.code == "inconsistent-reading" || f.code == "geometry-mismatch") return &f;
  return nullptr;
}

std::optional<double> measured(const ReconcileResult& r, const Flag& f) {
  for (const MeasurementFit& m : r.measurements) {
    if (f.field && m.field == f.field) return m.measured;
    if (f.ticket && m.ticket == f.ticket && m.platform == f.platform) return m.measured;
  }
  return std::nullopt;
}

std::string failed_reason(const ReconcileResult& r) {
  const Flag* f = fit_flag(r);
  if (f && f->ticket && f->platform) {
    const auto v = measured(r, *f);
    return fmt::format(
        "The fit failed: the {} reading of ticket {}{} does not fit the other readings{}, so no "
        "number of this weighing can be relied on; check the ticket or re-weigh.",
        *f->platform, *f->ticket, v ? " (" + weight(*v, r.units) + ")" : "",
        f->needed ? " (about " + weight(*f->needed, r.units) + " would)" : "");
  }
  if (f && f->field) {
    const auto v = measured(r, *f);
    const std::string lu(to_string(r.units.length));
    return fmt::format(
        "The fit failed: the tape length {}{} does not fit the readings{}, so no number of this "
        "weighing can be relied on; re-measure it.",
        *f->field, v ? fmt::format(" ({:g} {})", *v, lu) : "",
        f->needed ? fmt::format(", which suggest about {:.1f} {}", *f->needed, lu) : "");
  }
  return "The fit failed: the readings do not fit together and no single reading or tape "
         "length stands out, so no number of this weighing can be relied on; re-weigh the rig.";
}

}  // namespace

VerdictDecision decide_verdict(const ReconcileResult& r, int ratings_unsolved) {
  if (!r.fit || r.fit->dof <= 0) {
    return {Verdict::not_proven,
            "The fit test could not run: these passes give no more readings than unknowns, so "
            "no reading is cross-checked; weigh the rig unhitched, then hitched as it travels."};
  }
  if (!r.fit->passed) return {Verdict::not_proven, failed_reason(r)};

  std::vector<std::string> over, undecided;
  for (const ComplianceRow& c : r.compliance) {
    if (c.status == ComplianceStatus::over) over.push_back(row_text(c, r.units));
    if (c.status == ComplianceStatus::undecided) undecided.push_back(row_text(c, r.units));
  }
  const std::string at =
      r.travel_pass.empty() ? "" : " (travel configuration: ticket " + r.travel_pass + ")";
  if (!over.empty()) {
    return {Verdict::over,
            fmt::format("{} {} over {} rating{} beyond the measurement uncertainty (k = 2){}.",
                        join(over), over.size() == 1 ? "is" : "are",
                        over.size() == 1 ? "its" : "their", over.size() == 1 ? "" : "s", at)};
  }
  if (!undecided.empty()) {
    return {Verdict::undecided,
            fmt::format("{}: the rating lies inside the measurement uncertainty (k = 2){}, so "
                        "the weighing cannot show the rig is within it.",
                        join(undecided), at)};
  }
  if (ratings_unsolved > 0) {
    return {Verdict::undecided,
            fmt::format("{} rating{} the session gives could not be checked from these passes "
                        "(see Not solved), so the weighing cannot show the rig is within {}.",
                        ratings_unsolved, ratings_unsolved == 1 ? "" : "s",
                        ratings_unsolved == 1 ? "it" : "them")};
  }
  if (r.compliance.empty()) {
    return {Verdict::undecided,
            "No rating was checked: the session gives none, so the weighing cannot show the rig "
            "is within its ratings."};
  }
  // Compliant: name the rating with the least margin beyond its uncertainty.
  const ComplianceRow* closest = &r.compliance.front();
  for (const ComplianceRow& c : r.compliance)
    if (c.margin - 2 * c.u < closest->margin - 2 * closest->u) closest = &c;
  return {Verdict::compliant,
          fmt::format("The fit passed and all {} rating{} checked {} within at k = 2{}; the "
                      "closest is {}.",
                      r.compliance.size(), r.compliance.size() == 1 ? "" : "s",
                      r.compliance.size() == 1 ? "is" : "are", at, row_text(*closest, r.units))};
}

void add_rating_over_flags(ReconcileResult& r) {
  for (const ComplianceRow& c : r.compliance) {
    if (c.status != ComplianceStatus::over) continue;
    Flag f;
    f.code = kRatingOverFlag;
    f.severity = Severity::error;
    f.message = fmt::format(
        "{}: {:.0f} ± {:.0f} {} is over the rating {} by {}, beyond the measurement uncertainty "
        "(k = 2){}",
        c.label.empty() ? c.rating : c.label, c.value, 2 * c.u, to_string(r.units.weight),
        weight(c.limit, r.units), weight(-c.margin, r.units),
        r.fit && !r.fit->passed ? "; the fit failed, so this is not proven either way"
                                : "; lighten or redistribute the load before towing");
    if (!r.travel_pass.empty()) f.ticket = r.travel_pass;
    f.rating = c.rating;
    r.flags.push_back(std::move(f));
  }
}

}  // namespace sp
