#include "report/report_text.h"

#include <fmt/format.h>

#include <cmath>

#include "core/embedded.h"
#include "core/error.h"

namespace sp::report {
namespace {

const nlohmann::json& walk(const nlohmann::json& root, const std::string& dotted) {
  const nlohmann::json* at = &root;
  std::size_t start = 0;
  while (start <= dotted.size()) {
    std::size_t dot = dotted.find('.', start);
    std::string key = dotted.substr(start, dot == std::string::npos ? std::string::npos : dot - start);
    if (!at->is_object() || !at->contains(key)) {
      throw Error(ExitCode::internal, "reports/: missing key '" + dotted + "'");
    }
    at = &(*at)[key];
    if (dot == std::string::npos) break;
    start = dot + 1;
  }
  return *at;
}

nlohmann::json parse_embedded(const std::string& name) {
  for (const auto& f : embedded::report_files()) {
    if (f.name == name) {
      try {
        return nlohmann::json::parse(f.contents);
      } catch (const nlohmann::json::exception& e) {
        throw Error(ExitCode::internal, "reports/" + name + ": " + e.what());
      }
    }
  }
  throw Error(ExitCode::internal, "reports/" + name + ": not compiled in (re-run cmake)");
}

}  // namespace

std::string ReportText::get(const std::string& dotted) const {
  const nlohmann::json& v = walk(wording, dotted);
  if (!v.is_string()) throw Error(ExitCode::internal, "reports/wording.json: '" + dotted + "' is not a string");
  return v.get<std::string>();
}

std::vector<std::string> ReportText::list(const std::string& dotted) const {
  const nlohmann::json& v = walk(wording, dotted);
  std::vector<std::string> out;
  for (const auto& s : v) out.push_back(s.get<std::string>());
  return out;
}

double ReportText::number(const std::string& dotted) const {
  const nlohmann::json& v = walk(layout, dotted);
  if (!v.is_number()) throw Error(ExitCode::internal, "reports/layout.json: '" + dotted + "' is not a number");
  return v.get<double>();
}

ReportText load_report_text(const std::string& coupling) {
  ReportText t{parse_embedded("wording.json"), parse_embedded("cautions.json"),
               parse_embedded("layout.json")};
  const nlohmann::json& couplings = walk(t.wording, "couplings");
  if (couplings.contains(coupling)) t.wording.merge_patch(couplings.at(coupling));
  return t;
}

std::string fill(std::string pattern, const std::vector<std::pair<std::string, std::string>>& values) {
  for (const auto& [name, value] : values) {
    std::string key = "{" + name + "}";
    for (std::size_t pos = pattern.find(key); pos != std::string::npos;
         pos = pattern.find(key, pos + value.size())) {
      pattern.replace(pos, key.size(), value);
    }
  }
  return pattern;
}

std::string fmt_number(double v, int decimals) {
  if (!std::isfinite(v)) return "—";
  double scale = std::pow(10.0, decimals);
  double rounded = std::round(v * scale) / scale;
  if (rounded == 0) rounded = 0;  // no "−0"
  std::string digits = fmt::format("{:.{}f}", std::fabs(rounded), decimals);
  std::size_t point = digits.find('.');
  std::size_t int_len = point == std::string::npos ? digits.size() : point;
  std::string grouped;
  for (std::size_t i = 0; i < int_len; ++i) {
    // Thin space between groups of three (SI Brochure, 9th ed., §5.4.4); four-digit numbers
    // stay ungrouped, as the Brochure allows, so "8420 lb" reads and searches as one word.
    if (int_len > 4 && i > 0 && (int_len - i) % 3 == 0) grouped += "\u2009";
    grouped += digits[i];
  }
  grouped += digits.substr(int_len);
  return (rounded < 0 ? "\u2212" : "") + grouped;
}

std::string fmt_expanded(double u, int decimals) { return fmt_number(2.0 * u, decimals); }

}  // namespace sp::report
