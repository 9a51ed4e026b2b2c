// Internal to the weigh-report renderer (report_pages.cpp, verdict_pages.cpp): the drawing
// context every section shares and the formatting the sections have in common. Not an
// interface of the library.
#pragma once
#include <nlohmann/json.hpp>
#include <string>

#include "core/model.h"
#include "engine/result.h"
#include "report/layout.h"

namespace sp::report {

struct Ctx {
  Flow& flow;
  const ReportText& t;
  const Session& s;
  const ReconcileResult& r;
  const nlohmann::json& report;  // record["report"]
  int wd;                        // weight decimals
  std::string wu, lu;            // unit names
};

// "812 ± 23": value ± 2u (k = 2).
std::string value_pm(const Estimate& e, int decimals);

// The fit test of `r` in words (wording "checks.fit_*").
std::string fit_words(const ReportText& t, const ReconcileResult& r);

// The flag saying the tape length `field` ("rear_axle_to_ball" | "ball_to_axle") does not fit
// the readings, or null: its back-solved value is then not a measurement of the length.
const Flag* length_flag(const ReconcileResult& r, const std::string& field);

// The back-solved cell of a length whose flag says it does not fit, in the flag's words
// ("does not fit: about 224.1 in"; `unit` empty where a column gives it).
std::string disagreeing_length(const ReportText& t, const Flag& f, const std::string& unit);

// The results table of c.r (loads, tongue share, tow vehicle alone; with `lengths`, the
// back-solved lengths too), and its ratings table. Shared by the report's own sections and
// the re-solve's, so both read alike.
void results_table(Ctx& c, bool lengths);
void ratings_table(Ctx& c);

// The verdict as the report words it: the same words as the terminal and the JSON.
std::string verdict_words(const ReportText& t, Verdict v);

// The setting that reaches the target: the fractional fit, or on a whole-step hitch the whole
// settings either side and the one to try ("between 4 and 5: try 4, re-weigh").
std::string setting_words(const ReportText& t, const TargetResult& tg);

// The verdict, first thing under the title: in words, with its reason and what it means, in
// a ruled box that a glance cannot miss.
void verdict_box(Ctx& c);

// "If the named value is the error": the re-solve without the value the fit names, in its own
// section, with its own fit test, verdict, results, ratings and (provisional) recommendation.
// Draws nothing when the result has no re-solve.
void if_excluded_section(Ctx& c);

}  // namespace sp::report
