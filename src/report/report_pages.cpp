// The weigh-report's text sections, drawn with Flow (layout.h). Charts live in charts.cpp.
#include <cmath>

#include "core/error.h"
#include "report/charts.h"
#include "report/layout.h"
#include "report/pages.h"
#include "report/pdf_doc.h"
#include "report/record.h"
#include "report/report_pdf.h"
#include "report/signer.h"

namespace sp::report {
namespace {

std::string opt(const std::optional<std::string>& s, const std::string& none) {
  return s && !s->empty() ? *s : none;
}

float muted(const Ctx& c) {
  return static_cast<float>(c.t.number("greys.muted"));
}

bool fit_failed(const ReconcileResult& r) {
  return r.fit && !r.fit->passed;
}

void header(Ctx& c) {
  PdfDocument& doc = c.flow.doc();
  float title = static_cast<float>(c.t.number("sizes.title"));
  float sub = static_cast<float>(c.t.number("sizes.subtitle"));
  const auto subtitle = c.flow.wrap(c.t.get("subtitle"), c.flow.width(), sub, Font::regular);
  float top = c.flow.reserve(title * 2.6f + static_cast<float>(subtitle.size() - 1) * sub * 1.3f);
  doc.text(c.flow.left(), top - title, c.t.get("title"), title, Font::bold);
  std::string id = c.report.at("id").get<std::string>();
  float idw = doc.text_width(id, title * 0.75f, Font::mono);
  doc.text(c.flow.left() + c.flow.width() - idw, top - title, id, title * 0.75f, Font::mono);
  float y = top - title - sub * 2;
  for (const std::string& line : subtitle) {
    doc.text(c.flow.left(), y, line, sub, Font::regular,
             static_cast<float>(c.t.number("greys.muted")));
    y -= sub * 1.3f;
  }
  verdict_box(c);
  c.flow.heading(c.t.get("sections.header"));
  const std::string none = c.t.get("header.not_stated");
  const ScaleInfo& sc = c.s.scale;
  std::string scale = sc.id + (sc.name ? " (" + *sc.name + ")" : "") + ", " + c.t.get("header.division") +
                      " " + fmt_number(sc.division, sc.division >= 1 ? 0 : 1) + " " + c.wu + ", " +
                      c.t.get("header.class") + " " + sc.accuracy_class + ", " +
                      c.t.get("header.inspected") + " " + opt(sc.last_inspected, none);
  if (sc.location) scale += ", " + *sc.location;
  std::string issued = c.report.at("issued_at").is_string() ? c.report.at("issued_at").get<std::string>() : none;
  std::vector<std::pair<std::string, std::string>> rows = {
      {c.t.get("header.report_id"), id},
      {c.t.get("header.issued"), issued},
      {c.t.get("header.station"), opt(c.s.station, none)},
      {c.t.get("header.scale"), scale},
      {c.t.get("header.operator"), opt(c.s.operator_name, none)},
      {c.t.get("header.owner"), opt(c.s.owner, none)},
      {c.t.get("header.tow_vehicle"), c.s.tow_vehicle.label + ", " + c.t.get("header.wheelbase") + " " +
                                          fmt_number(c.s.tow_vehicle.wheelbase, 1) + " " + c.lu},
      {c.t.get("header.trailer"), c.s.trailer.label + " (" + std::string(to_string(c.s.trailer.type)) + ")"},
  };
  if (c.s.session_id) rows.push_back({c.t.get("header.session"), std::to_string(*c.s.session_id)});
  if (c.s.notes) rows.push_back({c.t.get("header.notes"), *c.s.notes});
  c.flow.fields(rows);
}

void tickets(Ctx& c) {
  c.flow.heading(c.t.get("sections.tickets"));
  if (c.s.passes.empty()) {
    c.flow.paragraph(c.t.get("tickets.none"));
    return;
  }
  auto cols = c.t.list("tickets.columns");
  Row head{cols, true, false};
  std::vector<Row> rows;
  for (const Pass& p : c.s.passes) {
    double trailer = p.trailer.value_or(0);
    Row row;
    row.cells = {p.ticket,
                 c.t.get("kinds." + std::string(to_string(p.kind))),
                 p.setting.value_or(""),
                 p.weighed_at,
                 fmt_number(p.steer, c.wd),
                 fmt_number(p.drive, c.wd),
                 p.trailer ? fmt_number(trailer, c.wd) : "",
                 fmt_number(p.steer + p.drive + trailer, c.wd),
                 p.gross ? fmt_number(*p.gross, c.wd) : ""};
    row.struck = p.voided;
    rows.push_back(row);
    if (p.voided) {
      rows.push_back(Row{{"", c.t.get("tickets.void") + ": " + p.void_reason.value_or("")}, false, false});
    }
  }
  c.flow.table({{1.1f}, {1.5f}, {0.8f}, {2.1f}, {0.9f, true}, {0.9f, true}, {0.9f, true}, {0.9f, true},
                {1.0f, true}},
               head, rows);
  c.flow.paragraph(fill(c.t.get("tickets.unit_note"), {{"unit", c.wu}}), Font::regular,
                   static_cast<float>(c.t.number("greys.muted")));
}

void results(Ctx& c) {
  // On a failed fit the heading says at once that these numbers carry the bad value.
  c.flow.heading(c.t.get("sections.results") +
                 (fit_failed(c.r) ? c.t.get("results.not_proven_mark") : ""));
  if (fit_failed(c.r)) c.flow.paragraph(c.t.get("results.not_proven"), Font::bold);
  results_table(c, false);
  const std::string none = c.t.get("results.none");
  if (!c.r.tensioned.empty()) {
    std::vector<Row> per;
    for (const auto& tr : c.r.tensioned) {
      per.push_back({{tr.ticket, tr.setting.value_or(""), value_pm(tr.bar_moment, 0) + " " + c.r.moment_unit,
                      tr.ball_load ? value_pm(*tr.ball_load, c.wd) + " " + c.wu : none,
                      tr.falr ? value_pm(*tr.falr, 1) + " %" : none}});
    }
    c.flow.table({{1.0f}, {0.8f}, {1.6f, true}, {1.6f, true}, {1.2f, true}},
                 Row{c.t.list("results.per_setting"), true, false}, per);
    // Negative moments or FALR, explained in the engine's words.
    for (const auto& tr : c.r.tensioned) {
      if (tr.note) c.flow.bullet(*tr.note);
    }
  }
  c.flow.paragraph(c.t.get("results.uncertainty_note"), Font::regular, muted(c));

  c.flow.heading(c.t.get("sections.geometry"));
  std::vector<Row> geo;
  geo.push_back({{c.t.get("geometry.wheelbase"), fmt_number(c.s.tow_vehicle.wheelbase, 1),
                  fmt_number(c.r.wheelbase, 1), "", c.lu}});
  std::vector<const Flag*> disagreeing;
  auto len = [&](const std::string& key, const std::optional<LengthEstimate>& e, double entered) {
    // A length its flag says does not fit is not back-solved: the fit kept it near the tape.
    if (const Flag* f = length_flag(c.r, key)) {
      disagreeing.push_back(f);
      geo.push_back({{c.t.get("geometry." + key), fmt_number(entered, 1),
                      disagreeing_length(c.t, *f, ""), none, c.lu},
                     true,
                     false});
      return;
    }
    geo.push_back({{c.t.get("geometry." + key), fmt_number(entered, 1),
                    e ? fmt_number(e->value, 1) : c.t.get("results.unsolved"), e ? fmt_expanded(e->u, 1) : none,
                    c.lu}});
  };
  len("rear_axle_to_ball", c.r.rear_axle_to_ball, c.s.tow_vehicle.rear_axle_to_ball);
  len("ball_to_axle", c.r.ball_to_axle, c.s.trailer.ball_to_axle);
  c.flow.table({{2.6f}, {1.0f, true}, {1.6f, true}, {0.8f, true}, {0.5f}},
               Row{c.t.list("geometry.columns"), true, false}, geo);
  for (const Flag* f : disagreeing) c.flow.bullet(f->message);
}

void checks(Ctx& c) {
  c.flow.heading(c.t.get("sections.checks"));
  c.flow.paragraph(fit_words(c.t, c.r));
  // Never beside a rating over: that raises a rating-over flag (engine/verdict.h).
  if (c.r.flags.empty()) c.flow.paragraph(c.t.get("checks.no_flags"));
  for (const Flag& f : c.r.flags) {
    c.flow.bullet(c.t.get("checks.severity." + std::string(to_string(f.severity))) + " (" + f.code +
                  "): " + f.message);
  }
  for (const std::string& u : c.r.unsolved) c.flow.bullet(c.t.get("results.unsolved") + ": " + u);
}

void compliance(Ctx& c) {
  c.flow.heading(c.t.get("sections.compliance"));
  if (c.r.compliance.empty()) {
    c.flow.paragraph(c.t.get("compliance.none"));
    return;
  }
  ratings_table(c);
  if (fit_failed(c.r)) c.flow.paragraph(c.t.get("compliance.not_proven"), Font::bold);
}

void recommendation(Ctx& c) {
  c.flow.need(120);  // keep the recommendation on one page
  const bool provisional = c.r.target && c.r.target->bar_moment && c.r.target->provisional;
  c.flow.heading(c.t.get("sections.recommendation") +
                 (provisional ? c.t.get("recommendation.provisional_mark") : ""));
  if (provisional) c.flow.paragraph(c.t.get("recommendation.provisional"), Font::bold);
  if (!c.r.target || !c.r.target->bar_moment) {
    c.flow.paragraph(c.t.get("recommendation.none"));
    if (c.r.target && c.r.target->note) c.flow.paragraph(*c.r.target->note);
    return;
  }
  const TargetResult& tg = *c.r.target;
  c.flow.paragraph(fill(c.t.get(tg.falr_from_rig ? "recommendation.target_from_rig" : "recommendation.target_default"),
                        {{"falr", fmt_number(tg.falr, 0)}}));
  std::vector<std::pair<std::string, std::string>> rows;
  // Each figure of a provisional recommendation carries the mark, not only the heading.
  const std::string mark = provisional ? c.t.get("recommendation.provisional_mark") : "";
  rows.push_back({c.t.get("recommendation.moment") + mark,
                  value_pm(*tg.bar_moment, 0) + " " + c.r.moment_unit});
  if (tg.setting)
    rows.push_back({c.t.get("recommendation.setting") + mark, setting_words(c.t, tg)});
  std::string pred;
  auto add = [&](const std::string& key, const std::optional<Estimate>& e) {
    if (!e) return;
    if (!pred.empty()) pred += "; ";
    pred += c.t.get("charts." + key) + " " + value_pm(*e, c.wd) + " " + c.wu;
  };
  add("steer_axle", tg.steer);
  add("drive_axle", tg.drive);
  add("trailer_axle", tg.trailer);
  add("ball", tg.ball_load);
  if (!pred.empty()) rows.push_back({c.t.get("recommendation.predicted") + mark, pred});
  c.flow.fields(rows);
  if (tg.note) c.flow.paragraph(*tg.note);
}

void cautions(Ctx& c) {
  c.flow.heading(c.t.get("sections.cautions") + ": " + c.t.cautions.at("heading").get<std::string>());
  for (const auto& line : c.t.cautions.at("cautions")) c.flow.bullet(line.get<std::string>());
}

void signature(Ctx& c, const std::string& record_text, const std::string& pdf_name) {
  c.flow.need(130);
  c.flow.heading(c.t.get("sections.signature"));
  const std::string none = c.t.get("unsigned");
  auto str = [&](const char* k) {
    return c.report.at(k).is_string() ? c.report.at(k).get<std::string>() : none;
  };
  c.flow.fields({{c.t.get("signature.signed_by"), str("signed_by")},
                 {c.t.get("signature.issued"), str("issued_at")},
                 {c.t.get("signature.fingerprint"), str("key_fingerprint")},
                 {c.t.get("signature.record"), "SHA-256 " + to_hex(sha256(record_text))}});
  const std::vector<std::pair<std::string, std::string>> names = {{"pdf", pdf_name},
                                                                  {"sig", pdf_name + ".sig"}};
  c.flow.paragraph(fill(c.t.get("signature.record_text"), names));
  c.flow.paragraph(fill(c.t.get("signature.how"), names));
}

// Hex in groups of 8 so a 64-digit head wraps and reads aloud (check-store ignores the spaces).
std::string grouped(const std::string& hex) {
  std::string out;
  for (size_t i = 0; i < hex.size(); i += 8) {
    if (!out.empty()) out += ' ';
    out += hex.substr(i, 8);
  }
  return out;
}

// The record's ledger anchor and latest checkpoint (record.h), under the signature block.
void ledger_anchor(Ctx& c, const nlohmann::json& record) {
  const std::optional<LedgerAnchor> a = record_ledger(record);
  if (!a) {
    c.flow.fields({{c.t.get("ledger.anchor"), c.t.get("ledger.no_anchor")}});
    return;
  }
  std::vector<std::pair<std::string, std::string>> rows = {
      {c.t.get("ledger.anchor"), fill(c.t.get("ledger.anchor_value"),
                                      {{"rows", std::to_string(a->rows)}, {"head", grouped(a->head)}})}};
  if (a->checkpoint) {
    rows.push_back({c.t.get("ledger.checkpoint"),
                    fill(c.t.get("ledger.checkpoint_value"),
                         {{"rows", std::to_string(a->checkpoint->rows)},
                          {"head", grouped(a->checkpoint->head)},
                          {"at", a->checkpoint->signed_at},
                          {"key", a->checkpoint->key_fingerprint}})});
  } else {
    rows.push_back({c.t.get("ledger.checkpoint"), c.t.get("ledger.no_checkpoint")});
  }
  c.flow.fields(rows);
  c.flow.paragraph(fill(c.t.get("ledger.how"), {{"rows", std::to_string(a->rows)},
                                                {"head_plain", a->head}}));
}

}  // namespace

std::string value_pm(const Estimate& e, int decimals) {
  return fmt_number(e.value, decimals) + " \u00b1 " + fmt_expanded(e.u, decimals);
}

std::string fit_words(const ReportText& t, const ReconcileResult& r) {
  if (!r.fit || r.fit->dof <= 0) return t.get("checks.fit_none");
  const FitResult& f = *r.fit;
  return fill(
      t.get(f.passed ? "checks.fit_passed" : "checks.fit_failed"),
      {{"chi", fmt_number(f.chi_square, 2)},
       {"dof", std::to_string(f.dof)},
       {"freedom", t.get(f.dof == 1 ? "checks.freedom_one" : "checks.freedom_many")},
       {"crit", fmt_number(f.critical, 2)},
       {"alpha", fmt_number(f.alpha * 100, 0)},
       {"p", f.p_value < 0.001 ? t.get("checks.p_below") : "= " + fmt_number(f.p_value, 3)}});
}

void results_table(Ctx& c, bool lengths) {
  const std::string none = c.t.get("results.none");
  std::vector<Row> rows;
  auto add = [&](const std::string& label, const std::optional<Estimate>& e, int dec,
                 const std::string& unit) {
    rows.push_back({{label, e ? fmt_number(e->value, dec) : c.t.get("results.unsolved"),
                     e ? fmt_expanded(e->u, dec) : none, unit}});
  };
  add(c.t.get("results.tongue_load"), c.r.tongue_load, c.wd, c.wu);
  add(c.t.get("results.trailer_weight"), c.r.trailer_weight, c.wd, c.wu);
  add(c.t.get("results.tongue_percent"), c.r.tongue_percent, 1, "%");
  add(c.t.get("results.tow_steer"), c.r.tow_steer, c.wd, c.wu);
  add(c.t.get("results.tow_drive"), c.r.tow_drive, c.wd, c.wu);
  if (lengths) {
    auto len = [&](const std::string& key, const std::optional<LengthEstimate>& e) {
      std::optional<Estimate> v;
      if (e) v = Estimate{e->value, e->u};
      add(fill(c.t.get("results.back_solved"), {{"name", c.t.get("geometry." + key)},
                                                {"entered", e ? fmt_number(e->entered, 1) : none}}),
          v, 1, c.lu);
    };
    len("rear_axle_to_ball", c.r.rear_axle_to_ball);
    len("ball_to_axle", c.r.ball_to_axle);
  }
  c.flow.table({{3.0f}, {1.0f, true}, {1.0f, true}, {0.8f}},
               Row{c.t.list("results.columns"), true, false}, rows);
}

void ratings_table(Ctx& c) {
  std::vector<Row> rows;
  for (const ComplianceRow& cr : c.r.compliance) {
    Row row{{cr.label, fmt_number(cr.limit, c.wd), fmt_number(cr.value, c.wd),
             fmt_expanded(cr.u, c.wd), fmt_number(cr.margin, c.wd),
             c.t.get("compliance.status." + std::string(to_string(cr.status)))},
            cr.status == ComplianceStatus::over,
            false};
    rows.push_back(row);
  }
  c.flow.table({{3.0f}, {1.0f, true}, {1.0f, true}, {0.9f, true}, {1.0f, true}, {1.0f}},
               Row{c.t.list("compliance.columns"), true, false}, rows);
  std::string note = fill(c.t.get("compliance.unit_note"), {{"unit", c.wu}}) + " ";
  if (!c.r.travel_pass.empty())
    note += fill(c.t.get("compliance.judged_on"), {{"ticket", c.r.travel_pass}});
  c.flow.paragraph(note, Font::regular, static_cast<float>(c.t.number("greys.muted")));
}

int weight_decimals(const Session& s) { return s.scale.division >= 1 ? 0 : 1; }

std::string render_report_pdf(const RenderInput& in) {
  if (!in.session || !in.result || !in.record) throw Error(ExitCode::internal, "render_report_pdf: missing input");
  ReportText t = load_report_text(std::string(to_string(in.session->trailer.type)));
  const nlohmann::json& papers = t.layout.at("papers");
  if (!papers.contains(in.paper)) throw usage_error("--paper: expected a4 or letter, got '" + in.paper + "'");
  auto w = papers.at(in.paper).at("width").get<float>();
  auto h = papers.at(in.paper).at("height").get<float>();
  const nlohmann::json& report = in.record->at("report");
  std::string id = report.at("id").get<std::string>();

  auto doc = make_pdf_document(in.font_dir);
  Flow flow(*doc, t, w, h, id);
  Ctx c{flow, t, *in.session, *in.result, report, weight_decimals(*in.session),
        std::string(to_string(in.session->units.weight)), std::string(to_string(in.session->units.length))};
  header(c);
  tickets(c);
  results(c);
  checks(c);
  compliance(c);
  if_excluded_section(c);
  // A fifth wheel has no bars, so there is no bar moment to chart loads against.
  if (in.session->trailer.type == TrailerType::conventional)
    draw_charts(flow, *in.session, *in.result, c.wd);
  draw_rig_sketch(flow, *in.session, *in.result, c.wd);
  recommendation(c);
  cautions(c);
  signature(c, in.record_text, in.pdf_name);
  ledger_anchor(c, *in.record);

  DocInfo info;
  info.title = t.get("title") + " " + id;
  info.author = report.at("signed_by").is_string() ? report.at("signed_by").get<std::string>() : "";
  info.subject = t.get("subtitle");
  info.creator = report.at("software").get<std::string>();
  info.keywords = id;
  // Only an explicit --issued-at puts a date in the bytes.
  if (report.at("issued_at").is_string()) info.created = report.at("issued_at").get<std::string>();
  doc->set_info(info);
  doc->attach(kRecordAttachment, in.record_text);
  doc->attach(kRecordSigAttachment, in.record_signature);
  if (in.reserve_signature) doc->reserve_signature(info.created);
  return doc->finish();
}

}  // namespace sp::report
