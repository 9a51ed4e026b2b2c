// The verdict box on page 1 and the "if the named value is the error" section of the
// weigh-report (pages.h).
#include <algorithm>

#include "report/pages.h"
#include "report/pdf_doc.h"

namespace sp::report {
namespace {

// Over and not proven must stop a reader: a black band with white words and a heavy rule;
// compliant and undecided get a light band. Black and white only (pdf_doc.h), told apart by
// fill and rule, never by colour alone.
bool alarming(Verdict v) {
  return v == Verdict::over || v == Verdict::not_proven;
}

std::string key(Verdict v) {
  return std::string(to_string(v));
}

struct Excluded {
  std::string kind, short_name, words;  // "reading", "QX-4390 drive", "the drive reading of ..."
};

Excluded excluded_words(const Ctx& c, const ExcludedMeasurement& e) {
  if (e.field) {
    const std::string name = c.t.get("geometry." + *e.field);
    return {c.t.get("if_excluded.length_kind"), name,
            fill(c.t.get("if_excluded.length"),
                 {{"name", name}, {"value", fmt_number(e.entered, 1) + " " + c.lu}})};
  }
  const std::string ticket = e.ticket.value_or(""), platform = e.platform.value_or("");
  return {
      c.t.get("if_excluded.reading_kind"), ticket + " " + platform,
      fill(c.t.get("if_excluded.reading"), {{"ticket", ticket},
                                            {"platform", platform},
                                            {"value", fmt_number(e.entered, c.wd) + " " + c.wu}})};
}

}  // namespace

// The verdict's own word (engine/verdict.h to_string), not a wording of the report's: the one
// word the terminal, the JSON and the browser print ("not-proven", not "not proven").
std::string verdict_words(const ReportText&, Verdict v) {
  return key(v);
}

std::string setting_words(const ReportText& t, const TargetResult& tg) {
  if (!tg.setting) return "";
  if (!tg.whole_step) return value_pm(*tg.setting, 1);
  // The steps and the one to try are the engine's (engine/target.cpp); only the words are here.
  const WholeStepSetting& w = *tg.whole_step;
  if (w.lower == w.upper)
    return fill(t.get("recommendation.whole_on"), {{"step", fmt_number(w.lower, 0)}});
  return fill(t.get("recommendation.whole_between"), {{"lower", fmt_number(w.lower, 0)},
                                                      {"upper", fmt_number(w.upper, 0)},
                                                      {"try", fmt_number(w.try_first, 0)}});
}

const Flag* length_flag(const ReconcileResult& r, const std::string& field) {
  for (const Flag& f : r.flags) {
    if (f.code == "geometry-mismatch" && f.field == field) return &f;
  }
  return nullptr;
}

std::string disagreeing_length(const ReportText& t, const Flag& f, const std::string& unit) {
  if (!f.needed) return t.get("geometry.disagrees");
  std::string needed = fmt_number(*f.needed, 1);
  if (!unit.empty()) needed += " " + unit;
  return fill(t.get("geometry.disagrees_needed"), {{"needed", needed}});
}

void verdict_box(Ctx& c) {
  PdfDocument& doc = c.flow.doc();
  const ReportText& t = c.t;
  const Verdict v = c.r.verdict;
  const bool alarm = alarming(v);
  const auto body = static_cast<float>(t.number("sizes.body"));
  const auto big = static_cast<float>(t.number("sizes.verdict"));
  const auto small = static_cast<float>(t.number("sizes.small"));
  const float lead = body * static_cast<float>(t.number("leading")), small_lead = small * 1.35f;
  const float pad = 8, inner = c.flow.width() - 2 * pad, x = c.flow.left() + pad;

  const std::string head = fill(t.get("verdict.heading"), {{"verdict", verdict_words(t, v)}});
  const auto reason = c.flow.wrap(c.r.verdict_reason, inner, body, Font::bold);
  const auto meaning = c.flow.wrap(t.get("verdict.meaning." + key(v)), inner, body, Font::regular);
  const auto k2 = c.flow.wrap(t.get("verdict.k2"), inner, small, Font::regular);
  const float band = big * 2.0f;
  const float h = band + pad * 1.5f + lead * static_cast<float>(reason.size() + meaning.size()) +
                  small_lead * static_cast<float>(k2.size()) + pad * 0.5f;
  c.flow.gap(2);
  const float top = c.flow.reserve(h);
  doc.rect(c.flow.left(), top - band, c.flow.width(), band, 0,
           alarm ? 0.0f : static_cast<float>(t.number("greys.band")));
  doc.rect(c.flow.left(), top - h, c.flow.width(), h, alarm ? 2.0f : 1.0f);
  doc.text(x, top - band / 2 - big * 0.35f, head, big, Font::bold, alarm ? 1.0f : 0.0f);
  float y = top - band - pad * 1.5f;
  for (const auto& l : reason) {
    doc.text(x, y - body, l, body, Font::bold);
    y -= lead;
  }
  for (const auto& l : meaning) {
    doc.text(x, y - body, l, body);
    y -= lead;
  }
  const auto muted = static_cast<float>(t.number("greys.muted"));
  for (const auto& l : k2) {
    doc.text(x, y - small, l, small, Font::regular, muted);
    y -= small_lead;
  }
  c.flow.gap(4);
}

void if_excluded_section(Ctx& c) {
  if (!c.r.if_excluded || !c.r.if_excluded->result) return;
  const ReconcileResult& x = *c.r.if_excluded->result;
  const ReportText& t = c.t;
  const Excluded what = excluded_words(c, c.r.if_excluded->excluded);
  c.flow.heading(
      fill(t.get("if_excluded.heading"), {{"kind", what.kind}, {"short", what.short_name}}));
  c.flow.paragraph(fill(t.get("if_excluded.intro"), {{"what", what.words}}));
  c.flow.paragraph(fill(t.get("if_excluded.verdict"),
                        {{"verdict", verdict_words(t, x.verdict)}, {"reason", x.verdict_reason}}),
                   Font::bold);
  c.flow.paragraph(fit_words(t, x));
  Ctx cx{c.flow, c.t, c.s, x, c.report, c.wd, c.wu, c.lu};
  results_table(cx, true);
  if (!x.compliance.empty()) ratings_table(cx);
  if (x.target && x.target->bar_moment) {
    std::vector<std::pair<std::string, std::string>> rows;
    rows.push_back(
        {t.get("if_excluded.moment"), value_pm(*x.target->bar_moment, 0) + " " + x.moment_unit});
    if (x.target->setting)
      rows.push_back({t.get("if_excluded.setting"), setting_words(t, *x.target)});
    c.flow.fields(rows);
  }
  c.flow.paragraph(t.get("if_excluded.stays"), Font::bold);
}

}  // namespace sp::report
