// `scaleproof reconcile --json`: one object per session. Key order is fixed (ordered_json);
// numbers are rounded per format/rounding.h (one decimal more than the text summary), so the
// output is deterministic and free of float noise. Unsolved quantities are null.
//
//   verdict ("compliant" | "over" | "undecided" | "not-proven"), verdict_reason (one sentence),
//   units {weight, length}, moment_unit, uncertainty (what u and ± mean, in words),
//   tow_steer, tow_drive (tow vehicle alone)              {value, u} | null
//   tongue_load, trailer_weight, tongue_percent          {value, u} | null
//   rear_axle_to_ball, ball_to_axle                      {value, u, entered} | null
//   tensioned [{ticket, setting, bar_moment, ball_load, falr, steer, drive, trailer, [note]}]
//   target {falr, falr_from_rig, bar_moment, setting, steer, drive, trailer, ball_load, note,
//           provisional, whole_step {lower, upper, try_first} | null} | null
//   fit {chi_square, dof, p_value, critical, passed} | null
//   flags [{code, severity, message, [ticket], [platform], [field], [needed], [rating]}]
//   compliance [{rating, label, limit, value, u, margin, status}]
//   travel_pass, unsolved [text],
//   if_excluded {excluded {ticket, platform, entered} | {field, entered}, result {...}} | null
//     (result: the same shape, solved without the excluded value; its if_excluded is null)
// Every u is standard (k = 1); text, report and messages show ± 2u (k = 2), as `uncertainty` says.
//
// append_result_json writes the same document straight into a string (no JSON tree): the bulk
// path (`reconcile --all --json`) prints one per session. It must stay byte-identical to
// result_to_json(r).dump(): numbers go through nlohmann's own float printer, strings take a
// fast path only when nlohmann would copy them unchanged, and everything else is handed to
// nlohmann. format_result_test.cpp compares the two on every shape of result.
#include "format/result_json.h"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <limits>

#include "format/rounding.h"

namespace sp {

namespace {

// Inside every result document, so a reader of the JSON alone knows which figures are which.
constexpr const char* kUncertaintyNote =
    "every u is a standard uncertainty (k = 1); the text summary, the report and the messages "
    "print value ± 2u (expanded, k = 2, about 95 %)";

using nlohmann::ordered_json;
using format::kJsonExtraDecimals;
using format::round_to;

struct Places {
  int weight, length, moment, percent;
};

Places places_for(const Units& u) {
  return {format::weight_decimals(u.weight) + kJsonExtraDecimals,
          format::length_decimals(u.length) + kJsonExtraDecimals,
          format::kMomentDecimals + kJsonExtraDecimals,
          format::kPercentDecimals + kJsonExtraDecimals};
}

ordered_json est(const Estimate& e, int places) {
  return {{"value", round_to(e.value, places)}, {"u", round_to(e.u, places)}};
}

ordered_json est(const std::optional<Estimate>& e, int places) {
  return e ? est(*e, places) : ordered_json(nullptr);
}

ordered_json length(const std::optional<LengthEstimate>& e, int places) {
  if (!e) return nullptr;
  return {{"value", round_to(e->value, places)},
          {"u", round_to(e->u, places)},
          {"entered", round_to(e->entered, places)}};
}

// p-values span many decades; keep four significant digits instead of fixed decimals.
double significant(double v, int digits) {
  if (v == 0 || !std::isfinite(v)) return 0;
  const int exp10 = static_cast<int>(std::floor(std::log10(std::fabs(v))));
  return round_to(v, digits - 1 - exp10);
}

ordered_json target_json(const TargetResult& t, const Places& p) {
  ordered_json j;
  j["falr"] = round_to(t.falr, p.percent);
  j["falr_from_rig"] = t.falr_from_rig;
  j["bar_moment"] = est(t.bar_moment, p.moment);
  // Settings are the owner's own scale (links, turns): two decimals are plenty.
  j["setting"] = est(t.setting, 2);
  j["steer"] = est(t.steer, p.weight);
  j["drive"] = est(t.drive, p.weight);
  j["trailer"] = est(t.trailer, p.weight);
  j["ball_load"] = est(t.ball_load, p.weight);
  j["note"] = t.note ? ordered_json(*t.note) : ordered_json(nullptr);
  j["provisional"] = t.provisional;
  if (t.whole_step) {
    j["whole_step"] = {{"lower", round_to(t.whole_step->lower, 2)},
                       {"upper", round_to(t.whole_step->upper, 2)},
                       {"try_first", round_to(t.whole_step->try_first, 2)}};
  } else {
    j["whole_step"] = nullptr;
  }
  return j;
}

ordered_json flag_json(const Flag& f, const Places& p) {
  ordered_json j;
  j["code"] = f.code;
  j["severity"] = to_string(f.severity);
  j["message"] = f.message;
  if (f.ticket) j["ticket"] = *f.ticket;
  if (f.platform) j["platform"] = *f.platform;
  if (f.field) j["field"] = *f.field;
  if (f.needed) j["needed"] = round_to(*f.needed, f.field ? p.length : p.weight);
  if (f.rating) j["rating"] = *f.rating;
  return j;
}

ordered_json excluded_json(const ExcludedMeasurement& e, const Places& p) {
  ordered_json j;
  if (e.ticket) j["ticket"] = *e.ticket;
  if (e.platform) j["platform"] = *e.platform;
  if (e.field) j["field"] = *e.field;
  j["entered"] = round_to(e.entered, e.field ? p.length : p.weight);
  return j;
}

}  // namespace

ordered_json result_to_json(const ReconcileResult& r) {
  const Places p = places_for(r.units);
  ordered_json j;
  j["verdict"] = to_string(r.verdict);
  j["verdict_reason"] = r.verdict_reason;
  j["units"] = {{"weight", to_string(r.units.weight)}, {"length", to_string(r.units.length)}};
  j["moment_unit"] = r.moment_unit;
  j["uncertainty"] = kUncertaintyNote;
  j["tow_steer"] = est(r.tow_steer, p.weight);
  j["tow_drive"] = est(r.tow_drive, p.weight);
  j["tongue_load"] = est(r.tongue_load, p.weight);
  j["trailer_weight"] = est(r.trailer_weight, p.weight);
  j["tongue_percent"] = est(r.tongue_percent, p.percent);
  j["rear_axle_to_ball"] = length(r.rear_axle_to_ball, p.length);
  j["ball_to_axle"] = length(r.ball_to_axle, p.length);
  ordered_json tensioned = ordered_json::array();
  for (const TensionedResult& t : r.tensioned) {
    ordered_json tj;
    tj["ticket"] = t.ticket;
    tj["setting"] = t.setting ? ordered_json(*t.setting) : ordered_json(nullptr);
    tj["bar_moment"] = est(t.bar_moment, p.moment);
    tj["ball_load"] = est(t.ball_load, p.weight);
    tj["falr"] = est(t.falr, p.percent);
    tj["steer"] = est(t.steer, p.weight);
    tj["drive"] = est(t.drive, p.weight);
    tj["trailer"] = est(t.trailer, p.weight);
    if (t.note) tj["note"] = *t.note;
    tensioned.push_back(tj);
  }
  j["tensioned"] = tensioned;
  j["target"] = r.target ? target_json(*r.target, p) : ordered_json(nullptr);
  if (r.fit) {
    j["fit"] = {{"chi_square", round_to(r.fit->chi_square, 3)},
                {"dof", r.fit->dof},
                {"p_value", significant(r.fit->p_value, 4)},
                {"critical", round_to(r.fit->critical, 3)},
                {"passed", r.fit->passed}};
  } else {
    j["fit"] = nullptr;
  }
  ordered_json flags = ordered_json::array();
  for (const Flag& f : r.flags) flags.push_back(flag_json(f, p));
  j["flags"] = flags;
  ordered_json compliance = ordered_json::array();
  for (const ComplianceRow& c : r.compliance) {
    compliance.push_back({{"rating", c.rating},
                          {"label", c.label},
                          {"limit", round_to(c.limit, p.weight)},
                          {"value", round_to(c.value, p.weight)},
                          {"u", round_to(c.u, p.weight)},
                          {"margin", round_to(c.margin, p.weight)},
                          {"status", to_string(c.status)}});
  }
  j["compliance"] = compliance;
  j["travel_pass"] = r.travel_pass.empty() ? ordered_json(nullptr) : ordered_json(r.travel_pass);
  j["unsolved"] = r.unsolved;
  if (r.if_excluded && r.if_excluded->result) {
    j["if_excluded"] = {{"excluded", excluded_json(r.if_excluded->excluded, p)},
                        {"result", result_to_json(*r.if_excluded->result)}};
  } else {
    j["if_excluded"] = nullptr;
  }
  return j;
}

namespace {

// --- Direct writer ------------------------------------------------------------------------
// Mirrors nlohmann::basic_json::dump() without indentation: "," and ":" without spaces, floats
// by nlohmann::detail::to_chars (non-finite: null), integers in plain decimal.

// True when the bytes are well-formed UTF-8 (Unicode 15, Table 3-7: no overlong forms, no
// surrogates, nothing above U+10FFFF) with no byte below 0x20 and no '"' or '\\': exactly the
// strings nlohmann's serializer (ensure_ascii = false) copies through unchanged.
bool copies_verbatim(std::string_view s) {
  const auto* b = reinterpret_cast<const unsigned char*>(s.data());
  const size_t n = s.size();
  size_t i = 0;
  while (i < n) {
    const unsigned c = b[i];
    if (c < 0x80) {
      if (c < 0x20 || c == '"' || c == '\\') return false;
      ++i;
      continue;
    }
    auto cont = [&](size_t k, unsigned lo, unsigned hi) {
      return i + k < n && b[i + k] >= lo && b[i + k] <= hi;
    };
    if (c >= 0xC2 && c <= 0xDF) {
      if (!cont(1, 0x80, 0xBF)) return false;
      i += 2;
    } else if (c >= 0xE0 && c <= 0xEF) {
      const unsigned lo = c == 0xE0 ? 0xA0 : 0x80, hi = c == 0xED ? 0x9F : 0xBF;
      if (!cont(1, lo, hi) || !cont(2, 0x80, 0xBF)) return false;
      i += 3;
    } else if (c >= 0xF0 && c <= 0xF4) {
      const unsigned lo = c == 0xF0 ? 0x90 : 0x80, hi = c == 0xF4 ? 0x8F : 0xBF;
      if (!cont(1, lo, hi) || !cont(2, 0x80, 0xBF) || !cont(3, 0x80, 0xBF)) return false;
      i += 4;
    } else {
      return false;
    }
  }
  return true;
}

void put_string(std::string& o, std::string_view v) {
  if (copies_verbatim(v)) {
    o += '"';
    o.append(v.data(), v.size());
    o += '"';
  } else {
    o += nlohmann::ordered_json(std::string(v)).dump();  // escapes; throws on invalid UTF-8
  }
}

void put_string(std::string& o, const std::string& v) {
  put_string(o, std::string_view(v));
}

void put_string(std::string& o, const std::optional<std::string>& v) {
  if (v)
    put_string(o, *v);
  else
    o += "null";
}

// Appends v = round_to(x, d), 0 <= d <= 3, exactly as nlohmann::detail::to_chars prints it,
// without running Grisu2, when that is provably the same; returns false (nothing appended)
// otherwise. Why it is the same: v is the double nearest c = k / 10^d. Grisu2 (Loitsch 2010,
// as in nlohmann) prints the shortest decimal inside v's rounding interval (v - gap/2,
// v + gap/2) shrunk by a few units of its 64-bit intermediate (about 2^-9 gap), and among
// those the one closest to v. When |c - v| <= (1/2 - 1/64) gap, c lies inside that shrunk
// interval; for |v| < 1e12 the interval (< 2^-13 wide) holds no other multiple of 10^-d, and a
// decimal with fewer digits would be such a multiple, so Grisu2's digits are c's. Then only
// nlohmann's layout (format_buffer: exponent outside (-4, 15] goes to the fallback) remains.
// The error v 10^d - k is computed exactly in long double (64-bit significand; where long
// double is narrower the fast path is off). p is 10^d.
// format_result_test.cpp compares this with nlohmann on values of every magnitude.
bool put_rounded_fast(std::string& o, double v, int d, double p) {
  if constexpr (std::numeric_limits<long double>::digits < 64) {
    return false;  // the exactness argument below needs a 64-bit significand
  } else {
    if (!(std::fabs(v) < 1e12) || v == 0) return false;
    const double kd = std::round(v * p);
    // Exact: v (53 bits) times 10^d (at most 10 bits) fits a 64-bit significand.
    const long double err = static_cast<long double>(v) * p - kd;
    const double av = std::fabs(v);
    std::uint64_t bits;
    std::memcpy(&bits, &av, sizeof bits);
    double up, down;  // neighbours of |v| (|v| is normal here: 1e-3 <= |v| < 1e12)
    const std::uint64_t ub = bits + 1, db = bits - 1;
    std::memcpy(&up, &ub, sizeof up);
    std::memcpy(&down, &db, sizeof down);
    const double gap = std::min(up - av, av - down);
    if (!(std::fabs(err) <= (0.5L - 1.0L / 64) * gap * p)) return false;
    unsigned long long k = static_cast<unsigned long long>(std::fabs(kd));
    if (k == 0) return false;
    int e10 = -d;
    while (k % 10 == 0) {
      k /= 10;
      ++e10;
    }
    char digits[24];
    const auto res = std::to_chars(digits, digits + sizeof digits, k);
    const int s = static_cast<int>(res.ptr - digits);
    const int n = s + e10;  // position of the decimal point
    if (n > 15 || n <= -4) return false;
    if (std::signbit(v)) o += '-';
    if (s <= n) {  // digits[000].0
      o.append(digits, static_cast<size_t>(s));
      o.append(static_cast<size_t>(n - s), '0');
      o += ".0";
    } else if (n > 0) {  // dig.its
      o.append(digits, static_cast<size_t>(n));
      o += '.';
      o.append(digits + n, static_cast<size_t>(s - n));
    } else {  // 0.[000]digits
      o += "0.";
      o.append(static_cast<size_t>(-n), '0');
      o.append(digits, static_cast<size_t>(s));
    }
    return true;
  }
}

void put_number(std::string& o, double v) {
  if (!std::isfinite(v)) {
    o += "null";
    return;
  }
  char buf[64];
  const char* end = nlohmann::detail::to_chars(buf, buf + sizeof buf, v);
  o.append(buf, static_cast<size_t>(end - buf));
}

// round_to(v, places) as nlohmann prints it.
void put_rounded(std::string& o, double v, int places) {
  static constexpr double kPow10[] = {1, 10, 100, 1000};
  if (places < 0 || places > 3) {
    put_number(o, round_to(v, places));
    return;
  }
  // The same operations as format::round_to (std::pow(10, 0..3) is exact), without pow.
  const double p = kPow10[places];
  const double r0 = std::round(v * p) / p;
  const double r = r0 == 0 ? 0.0 : r0;
  if (!put_rounded_fast(o, r, places, p)) put_number(o, r);
}

void put_integer(std::string& o, long long v) {
  char buf[24];
  const auto res = std::to_chars(buf, buf + sizeof buf, v);
  o.append(buf, static_cast<size_t>(res.ptr - buf));
}

void put_bool(std::string& o, bool v) {
  o += v ? "true" : "false";
}

void put_est(std::string& o, const Estimate& e, int places) {
  o += "{\"value\":";
  put_rounded(o, e.value, places);
  o += ",\"u\":";
  put_rounded(o, e.u, places);
  o += '}';
}

void put_est(std::string& o, const std::optional<Estimate>& e, int places) {
  if (e)
    put_est(o, *e, places);
  else
    o += "null";
}

void put_length(std::string& o, const std::optional<LengthEstimate>& e, int places) {
  if (!e) {
    o += "null";
    return;
  }
  o += "{\"value\":";
  put_rounded(o, e->value, places);
  o += ",\"u\":";
  put_rounded(o, e->u, places);
  o += ",\"entered\":";
  put_rounded(o, e->entered, places);
  o += '}';
}

void put_target(std::string& o, const TargetResult& t, const Places& p) {
  o += "{\"falr\":";
  put_rounded(o, t.falr, p.percent);
  o += ",\"falr_from_rig\":";
  put_bool(o, t.falr_from_rig);
  o += ",\"bar_moment\":";
  put_est(o, t.bar_moment, p.moment);
  o += ",\"setting\":";
  put_est(o, t.setting, 2);  // as target_json
  o += ",\"steer\":";
  put_est(o, t.steer, p.weight);
  o += ",\"drive\":";
  put_est(o, t.drive, p.weight);
  o += ",\"trailer\":";
  put_est(o, t.trailer, p.weight);
  o += ",\"ball_load\":";
  put_est(o, t.ball_load, p.weight);
  o += ",\"note\":";
  put_string(o, t.note);
  o += ",\"provisional\":";
  put_bool(o, t.provisional);
  o += ",\"whole_step\":";
  if (t.whole_step) {
    o += "{\"lower\":";
    put_rounded(o, t.whole_step->lower, 2);
    o += ",\"upper\":";
    put_rounded(o, t.whole_step->upper, 2);
    o += ",\"try_first\":";
    put_rounded(o, t.whole_step->try_first, 2);
    o += '}';
  } else {
    o += "null";
  }
  o += '}';
}

void put_flag(std::string& o, const Flag& f, const Places& p) {
  o += "{\"code\":";
  put_string(o, f.code);
  o += ",\"severity\":";
  put_string(o, to_string(f.severity));
  o += ",\"message\":";
  put_string(o, f.message);
  if (f.ticket) {
    o += ",\"ticket\":";
    put_string(o, *f.ticket);
  }
  if (f.platform) {
    o += ",\"platform\":";
    put_string(o, *f.platform);
  }
  if (f.field) {
    o += ",\"field\":";
    put_string(o, *f.field);
  }
  if (f.needed) {
    o += ",\"needed\":";
    put_rounded(o, *f.needed, f.field ? p.length : p.weight);
  }
  if (f.rating) {
    o += ",\"rating\":";
    put_string(o, *f.rating);
  }
  o += '}';
}

void put_excluded(std::string& o, const ExcludedMeasurement& e, const Places& p) {
  char sep = '{';
  auto key = [&](const char* k) {
    o += sep;
    o += '"';
    o += k;
    o += "\":";
    sep = ',';
  };
  if (e.ticket) {
    key("ticket");
    put_string(o, *e.ticket);
  }
  if (e.platform) {
    key("platform");
    put_string(o, *e.platform);
  }
  if (e.field) {
    key("field");
    put_string(o, *e.field);
  }
  key("entered");
  put_rounded(o, e.entered, e.field ? p.length : p.weight);
  o += '}';
}

void put_tensioned(std::string& o, const TensionedResult& t, const Places& p) {
  o += "{\"ticket\":";
  put_string(o, t.ticket);
  o += ",\"setting\":";
  put_string(o, t.setting);
  o += ",\"bar_moment\":";
  put_est(o, t.bar_moment, p.moment);
  o += ",\"ball_load\":";
  put_est(o, t.ball_load, p.weight);
  o += ",\"falr\":";
  put_est(o, t.falr, p.percent);
  o += ",\"steer\":";
  put_est(o, t.steer, p.weight);
  o += ",\"drive\":";
  put_est(o, t.drive, p.weight);
  o += ",\"trailer\":";
  put_est(o, t.trailer, p.weight);
  if (t.note) {
    o += ",\"note\":";
    put_string(o, *t.note);
  }
  o += '}';
}

void put_compliance(std::string& o, const ComplianceRow& c, const Places& p) {
  o += "{\"rating\":";
  put_string(o, c.rating);
  o += ",\"label\":";
  put_string(o, c.label);
  o += ",\"limit\":";
  put_rounded(o, c.limit, p.weight);
  o += ",\"value\":";
  put_rounded(o, c.value, p.weight);
  o += ",\"u\":";
  put_rounded(o, c.u, p.weight);
  o += ",\"margin\":";
  put_rounded(o, c.margin, p.weight);
  o += ",\"status\":";
  put_string(o, to_string(c.status));
  o += '}';
}

template <typename T, typename Put>
void put_array(std::string& o, const std::vector<T>& items, Put put) {
  o += '[';
  for (size_t i = 0; i < items.size(); ++i) {
    if (i) o += ',';
    put(items[i]);
  }
  o += ']';
}

}  // namespace

void append_result_json(std::string& o, const ReconcileResult& r) {
  const Places p = places_for(r.units);
  o += "{\"verdict\":";
  put_string(o, to_string(r.verdict));
  o += ",\"verdict_reason\":";
  put_string(o, r.verdict_reason);
  o += ",\"units\":{\"weight\":";
  put_string(o, to_string(r.units.weight));
  o += ",\"length\":";
  put_string(o, to_string(r.units.length));
  o += "},\"moment_unit\":";
  put_string(o, r.moment_unit);
  o += ",\"uncertainty\":";
  put_string(o, std::string_view(kUncertaintyNote));
  o += ",\"tow_steer\":";
  put_est(o, r.tow_steer, p.weight);
  o += ",\"tow_drive\":";
  put_est(o, r.tow_drive, p.weight);
  o += ",\"tongue_load\":";
  put_est(o, r.tongue_load, p.weight);
  o += ",\"trailer_weight\":";
  put_est(o, r.trailer_weight, p.weight);
  o += ",\"tongue_percent\":";
  put_est(o, r.tongue_percent, p.percent);
  o += ",\"rear_axle_to_ball\":";
  put_length(o, r.rear_axle_to_ball, p.length);
  o += ",\"ball_to_axle\":";
  put_length(o, r.ball_to_axle, p.length);
  o += ",\"tensioned\":";
  put_array(o, r.tensioned, [&](const TensionedResult& t) { put_tensioned(o, t, p); });
  o += ",\"target\":";
  if (r.target)
    put_target(o, *r.target, p);
  else
    o += "null";
  o += ",\"fit\":";
  if (r.fit) {
    o += "{\"chi_square\":";
    put_rounded(o, r.fit->chi_square, 3);
    o += ",\"dof\":";
    put_integer(o, r.fit->dof);
    o += ",\"p_value\":";
    put_number(o, significant(r.fit->p_value, 4));
    o += ",\"critical\":";
    put_rounded(o, r.fit->critical, 3);
    o += ",\"passed\":";
    put_bool(o, r.fit->passed);
    o += '}';
  } else {
    o += "null";
  }
  o += ",\"flags\":";
  put_array(o, r.flags, [&](const Flag& f) { put_flag(o, f, p); });
  o += ",\"compliance\":";
  put_array(o, r.compliance, [&](const ComplianceRow& c) { put_compliance(o, c, p); });
  o += ",\"travel_pass\":";
  if (r.travel_pass.empty())
    o += "null";
  else
    put_string(o, r.travel_pass);
  o += ",\"unsolved\":";
  put_array(o, r.unsolved, [&](const std::string& u) { put_string(o, u); });
  o += ",\"if_excluded\":";
  if (r.if_excluded && r.if_excluded->result) {
    o += "{\"excluded\":";
    put_excluded(o, r.if_excluded->excluded, p);
    o += ",\"result\":";
    append_result_json(o, *r.if_excluded->result);
    o += '}';
  } else {
    o += "null";
  }
  o += '}';
}

}  // namespace sp
