// The report's wording, cautions and layout data (reports/*.json, compiled into the binary),
// plus the number formatting every page uses.
//
// Lookups use JSON-pointer-like dotted keys ("sections.results"); a missing key is a bug in
// reports/ and throws sp::Error(internal) naming it.
#pragma once
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

namespace sp::report {

struct ReportText {
  nlohmann::json wording;  // reports/wording.json
  nlohmann::json cautions; // reports/cautions.json
  nlohmann::json layout;   // reports/layout.json

  std::string get(const std::string& dotted) const;            // a string value
  std::vector<std::string> list(const std::string& dotted) const;  // an array of strings
  double number(const std::string& dotted) const;              // from layout
};

// Loads the embedded reports/*.json (parsed once per call; cheap). `coupling` is the trailer
// type's name (core/model.h to_string(TrailerType)): the wording's "couplings.<coupling>"
// object, when there is one, is merged over the rest (RFC 7386 merge patch), so a fifth wheel
// reads "pin load" and "kingpin" wherever a ball hitch reads "tongue load" and "hitch ball".
ReportText load_report_text(const std::string& coupling = "conventional");

// Replaces "{name}" in `pattern` by the values given (pairs of name, value).
std::string fill(std::string pattern, const std::vector<std::pair<std::string, std::string>>& values);

// Fixed-point with `decimals` places, "−" for negatives (U+2212), thin grouping of thousands.
std::string fmt_number(double v, int decimals);
// Expanded uncertainty 2u (k = 2, JCGM 100:2008 §6.3) with the same decimals.
std::string fmt_expanded(double u, int decimals);

}  // namespace sp::report
