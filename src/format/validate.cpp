// The one validator (see validate.h for the contract and the limits' sources).
// Implementation note: every check compares first and builds text only on failure, because
// the CSV import runs pass() and pass_on_scale() for each of its rows.
#include "format/validate.h"

#include <fmt/format.h>

#include <cmath>
#include <set>

#include "core/error.h"
#include "format/iso8601.h"
#include "format/json_strict.h"

namespace sp::validate {

std::string PrefixNames::name(std::string_view field) const {
  return prefix_ + std::string(field);
}

std::string TableNames::name(std::string_view field) const {
  for (const Entry& e : table_) {
    if (e.field == field) return std::string(e.name);
  }
  return fallback_ + std::string(field);
}

void fail(const FieldNames& names, std::string_view field, const std::string& message) {
  throw data_error(names.name(field) + ": " + message);
}

namespace {

// Limits: see validate.h for the reason and source of each.
constexpr double kMaxWeightLb = 200000, kMaxWeightKg = 90000;
constexpr double kMaxDivisionLb = 1000, kMaxDivisionKg = 500;
constexpr double kMaxLengthFt = 100;
constexpr double kMaxLengthUncertaintyFt = 1;
constexpr std::size_t kMaxPasses = 1000;

// A limit in feet expressed in `u`, rounded to 10 significant digits so messages read
// "30.48 m", not "30.480000000000004 m".
double feet_in(double ft, LengthUnit u) {
  return std::stod(format::number_text(ft * length_factor(LengthUnit::ft, u)));
}

// names() of "<outer prefix><field>" without building anything until a check fails.
class Nested final : public FieldNames {
 public:
  Nested(const FieldNames& outer, std::string_view prefix, long index = -1)
      : outer_(outer), prefix_(prefix), index_(index) {}
  std::string name(std::string_view field) const override {
    std::string f(prefix_);
    if (index_ >= 0) f += "[" + std::to_string(index_) + "].";
    f += field;
    return outer_.name(f);
  }

 private:
  const FieldNames& outer_;
  std::string_view prefix_;
  long index_;
};

}  // namespace

Range range(Quantity q, const Units& u) {
  const bool lb = u.weight == WeightUnit::lb;
  const double w = lb ? kMaxWeightLb : kMaxWeightKg;
  const std::string_view wu = to_string(u.weight), lu = to_string(u.length);
  switch (q) {
    case Quantity::reading:
      return {0, w, false, "a weight", wu};
    case Quantity::gross:
      return {0, 3 * w, false, "a weight", wu};
    case Quantity::rating:
      return {0, w, true, "a rating", wu};
    case Quantity::capacity:
      return {0, 3 * w, true, "a capacity", wu};
    case Quantity::division:
      return {0, lb ? kMaxDivisionLb : kMaxDivisionKg, true, "a scale division", wu};
    case Quantity::reading_uncertainty:
      return {0, w / 20, true, "a standard uncertainty", wu};
    case Quantity::wheelbase:
    case Quantity::ball_to_axle:
      return {0, feet_in(kMaxLengthFt, u.length), true, "a length", lu};
    case Quantity::rear_axle_to_ball: {
      const double l = feet_in(kMaxLengthFt, u.length);
      return {-l, l, false, "a length", lu};
    }
    case Quantity::length_uncertainty:
      return {0, feet_in(kMaxLengthUncertaintyFt, u.length), true, "a standard uncertainty", lu};
    case Quantity::falr_target:
      return {0, 100, true, "a percentage", "%"};
  }
  return {};
}

std::string describe(const Range& r) {
  using format::number_text;
  const std::string u = r.unit.empty() ? "" : " " + std::string(r.unit);
  if (r.lo_open) {
    return fmt::format("{} greater than {} and at most {}{}", r.what, number_text(r.lo),
                       number_text(r.hi), u);
  }
  return fmt::format("{} between {} and {}{}", r.what, number_text(r.lo), number_text(r.hi), u);
}

void number(double v, Quantity q, const Units& units, std::string_view field,
            const FieldNames& names) {
  const Range r = range(q, units);
  if (std::isfinite(v) && v <= r.hi && v >= r.lo && !(r.lo_open && v == r.lo)) return;
  fail(names, field, "expected " + describe(r) + ", got " + format::number_text(v));
}

bool parse_number(std::string_view s, double& out) {
  std::size_t i = 0;
  bool negative = false;
  if (i < s.size() && s[i] == '-') {
    negative = true;
    ++i;
  }
  // Digits with at most one '.', at least one digit; built exactly by strtod on a bounded copy.
  std::size_t digits = 0, dots = 0;
  for (std::size_t k = i; k < s.size(); ++k) {
    if (s[k] >= '0' && s[k] <= '9') {
      ++digits;
    } else if (s[k] == '.') {
      ++dots;
    } else {
      return false;
    }
  }
  if (digits == 0 || dots > 1 || s.size() > 400) return false;
  char buf[402];
  s.copy(buf, s.size());
  buf[s.size()] = '\0';
  char* end = nullptr;
  const double v = std::strtod(buf, &end);
  if (end != buf + s.size()) return false;
  out = negative && v == 0 ? 0.0 : v;  // "-0" is 0: no signed zeros in the ledger
  return true;
}

void not_a_number(std::string_view got, std::string_view field, const FieldNames& names) {
  fail(names, field, "expected a number, got " + validate::quoted(got));
}

std::string quoted(std::string_view text) {
  std::string s(text);
  // Cut at a character boundary after 37 code points.
  std::size_t points = 0, cut = std::string::npos;
  for (std::size_t i = 0; i < s.size(); ++i) {
    if ((static_cast<unsigned char>(s[i]) & 0xC0) != 0x80 && points++ == 37) cut = i;
  }
  if (points > 40 && cut != std::string::npos) s = s.substr(0, cut) + "...";
  return nlohmann::json(s).dump(-1, ' ', false, nlohmann::json::error_handler_t::replace);
}

// ---- text ------------------------------------------------------------------------------
namespace {

struct CodeRange {
  char32_t lo, hi;
};
// Unicode general category Cf (Unicode 15.0), and the separators Zl/Zp.
constexpr CodeRange kInvisible[] = {
    {0x00AD, 0x00AD},   {0x0600, 0x0605},   {0x061C, 0x061C},   {0x06DD, 0x06DD},
    {0x070F, 0x070F},   {0x0890, 0x0891},   {0x08E2, 0x08E2},   {0x180E, 0x180E},
    {0x200B, 0x200F},   {0x2028, 0x2029},   {0x202A, 0x202E},   {0x2060, 0x2064},
    {0x2066, 0x206F},   {0xFEFF, 0xFEFF},   {0xFFF9, 0xFFFB},   {0x110BD, 0x110BD},
    {0x110CD, 0x110CD}, {0x13430, 0x1343F}, {0x1BCA0, 0x1BCA3}, {0x1D173, 0x1D17A},
    {0xE0001, 0xE0001}, {0xE0020, 0xE007F},
};

bool invisible(char32_t c) {
  if (c < 0x00AD) return false;  // the common case: one compare
  for (const CodeRange& r : kInvisible) {
    if (c < r.lo) return false;
    if (c <= r.hi) return true;
  }
  return false;
}

const char* invisible_name(char32_t c) {
  switch (c) {
    case 0x00AD:
      return "soft hyphen";
    case 0x200B:
      return "zero width space";
    case 0x200C:
      return "zero width non-joiner";
    case 0x200D:
      return "zero width joiner";
    case 0x200E:
      return "left-to-right mark";
    case 0x200F:
      return "right-to-left mark";
    case 0x2028:
      return "line separator";
    case 0x2029:
      return "paragraph separator";
    case 0x202A:
      return "left-to-right embedding";
    case 0x202B:
      return "right-to-left embedding";
    case 0x202C:
      return "pop directional formatting";
    case 0x202D:
      return "left-to-right override";
    case 0x202E:
      return "right-to-left override";
    case 0x2060:
      return "word joiner";
    case 0x2066:
      return "left-to-right isolate";
    case 0x2067:
      return "right-to-left isolate";
    case 0x2068:
      return "first strong isolate";
    case 0x2069:
      return "pop directional isolate";
    case 0xFEFF:
      return "zero width no-break space (byte-order mark)";
    default:
      return "invisible format character";
  }
}

std::size_t max_chars(Text kind) {
  switch (kind) {
    case Text::label:
      return 200;
    case Text::ticket:
      return 64;
    case Text::notes:
      return 4000;
  }
  return 0;
}

}  // namespace

std::string text_fault(std::string_view s, Text kind) {
  const bool multiline = kind == Text::notes;
  // Fast path: printable ASCII (nearly every ticket, key and name) is one compare a byte.
  std::size_t i = 0;
  while (i < s.size() && static_cast<unsigned char>(s[i] - 0x20) < 0x5F) ++i;
  std::size_t chars = i;
  while (i < s.size()) {
    const auto b = static_cast<unsigned char>(s[i]);
    ++chars;
    if (b < 0x80) {
      if (b >= 0x20 && b != 0x7F) {
        ++i;
        continue;
      }
      if (multiline && (b == '\n' || b == '\t')) {
        ++i;
        continue;
      }
      if (b == '\n' || b == '\r') {
        return fmt::format("expected one line of text, got a line break (U+{:04X}) at character {}",
                           b, chars);
      }
      return fmt::format(
          "expected text without control characters, got control character "
          "U+{:04X} at character {}",
          b, chars);
    }
    // Well-formed UTF-8 (RFC 3629): no overlong forms, surrogates or values past U+10FFFF.
    const std::size_t n = (b & 0xE0) == 0xC0   ? 1
                          : (b & 0xF0) == 0xE0 ? 2
                          : (b & 0xF8) == 0xF0 ? 3
                                               : 0;
    bool ok = n != 0 && b != 0xC0 && b != 0xC1 && b <= 0xF4;
    char32_t cp = b & (0x3F >> n);
    for (std::size_t k = 1; ok && k <= n; ++k) {
      if (i + k >= s.size()) {
        ok = false;
        break;
      }
      const auto cc = static_cast<unsigned char>(s[i + k]);
      if ((cc & 0xC0) != 0x80) ok = false;
      cp = (cp << 6) | (cc & 0x3F);
    }
    if (ok && ((n == 2 && cp < 0x800) || (n == 3 && (cp < 0x10000 || cp > 0x10FFFF)) ||
               (cp >= 0xD800 && cp <= 0xDFFF))) {
      ok = false;
    }
    if (!ok) {
      return fmt::format(
          "expected UTF-8 text, got the byte 0x{:02X} at byte {}, which is not "
          "UTF-8",
          b, i + 1);
    }
    if (cp < 0xA0) {
      return fmt::format(
          "expected text without control characters, got control character "
          "U+{:04X} at character {}",
          static_cast<unsigned>(cp), chars);
    }
    if (invisible(cp)) {
      return fmt::format(
          "expected text without invisible or direction-changing characters, got "
          "U+{:04X} ({}) at character {}",
          static_cast<unsigned>(cp), invisible_name(cp), chars);
    }
    i += n + 1;
  }
  if (chars > max_chars(kind)) {
    return fmt::format("expected at most {} characters, got {}", max_chars(kind), chars);
  }
  return {};
}

void text(std::string_view s, Text kind, std::string_view field, const FieldNames& names,
          bool allow_empty) {
  if (s.empty() && !allow_empty) fail(names, field, "expected a non-empty text, got \"\"");
  if (std::string why = text_fault(s, kind); !why.empty()) fail(names, field, why);
}

// ---- model structs ---------------------------------------------------------------------
namespace {

void opt_text(const std::optional<std::string>& s, Text kind, std::string_view field,
              const FieldNames& names) {
  if (s) text(*s, kind, field, names);
}

void opt_number(const std::optional<double>& v, Quantity q, const Units& u, std::string_view field,
                const FieldNames& names) {
  if (v) number(*v, q, u, field, names);
}

void date_time(const std::string& s, std::string_view field, const FieldNames& names) {
  text(s, Text::label, field, names, false);
  if (std::string why = format::check_iso_date_time(s); !why.empty()) {
    fail(names, field, why + ", got " + validate::quoted(s));
  }
}

Units weight_only(WeightUnit w) {
  Units u;
  u.weight = w;
  return u;
}

}  // namespace

void scale(const ScaleInfo& s, WeightUnit unit, const FieldNames& names) {
  const Units u = weight_only(unit);
  text(s.id, Text::label, "id", names, false);
  opt_text(s.name, Text::label, "name", names);
  opt_text(s.location, Text::label, "location", names);
  number(s.division, Quantity::division, u, "division", names);
  opt_number(s.capacity, Quantity::capacity, u, "capacity", names);
  // NIST HB 44 §2.20 classes for vehicle scales: III and III L (OIML R 76 class III reads as
  // "III").
  if (s.accuracy_class != "III" && s.accuracy_class != "IIIL") {
    fail(names, "accuracy_class",
         "unknown accuracy class " + validate::quoted(s.accuracy_class) +
             "; expected one of: III, IIIL");
  }
  if (s.last_inspected) {
    text(*s.last_inspected, Text::label, "last_inspected", names);
    if (std::string why = format::check_iso_date(*s.last_inspected); !why.empty()) {
      fail(names, "last_inspected", why + ", got " + validate::quoted(*s.last_inspected));
    }
  }
  opt_number(s.reading_uncertainty, Quantity::reading_uncertainty, u, "reading_uncertainty", names);
}

void rig(const Units& u, const TowVehicle& v, const Trailer& t, const FieldNames& names) {
  text(v.label, Text::label, "tow_vehicle.label", names);
  number(v.wheelbase, Quantity::wheelbase, u, "tow_vehicle.wheelbase", names);
  number(v.rear_axle_to_ball, Quantity::rear_axle_to_ball, u, "tow_vehicle.rear_axle_to_ball",
         names);
  opt_number(v.gvwr, Quantity::rating, u, "tow_vehicle.gvwr", names);
  opt_number(v.front_gawr, Quantity::rating, u, "tow_vehicle.front_gawr", names);
  opt_number(v.rear_gawr, Quantity::rating, u, "tow_vehicle.rear_gawr", names);
  opt_number(v.gcwr, Quantity::rating, u, "tow_vehicle.gcwr", names);
  opt_number(v.hitch_tongue_rating, Quantity::rating, u, "tow_vehicle.hitch_tongue_rating", names);
  opt_number(v.hitch_trailer_rating, Quantity::rating, u, "tow_vehicle.hitch_trailer_rating",
             names);
  opt_number(v.falr_target, Quantity::falr_target, u, "tow_vehicle.falr_target", names);
  text(t.label, Text::label, "trailer.label", names);
  number(t.ball_to_axle, Quantity::ball_to_axle, u, "trailer.ball_to_axle", names);
  opt_number(t.gvwr, Quantity::rating, u, "trailer.gvwr", names);
  opt_number(t.axle_gawr, Quantity::rating, u, "trailer.axle_gawr", names);
  // The coupling rules (statics model, engine/statics.h).
  using format::number_text;
  const double o = v.rear_axle_to_ball;
  const std::string lu(to_string(u.length));
  if (t.type == TrailerType::conventional && o <= 0) {
    fail(names, "tow_vehicle.rear_axle_to_ball",
         "expected a positive length for a conventional trailer (the ball sits behind the drive "
         "axle), got " +
             number_text(o) + " " + lu);
  }
  if (t.type == TrailerType::fifth_wheel && o > 0) {
    fail(names, "tow_vehicle.rear_axle_to_ball",
         "expected zero or a negative length for a fifth-wheel trailer (the coupling sits over "
         "or ahead of the drive axle), got " +
             number_text(o) + " " + lu);
  }
  if (o <= -v.wheelbase) {
    fail(names, "tow_vehicle.rear_axle_to_ball",
         "expected a coupling behind the steer axle (more than -" + number_text(v.wheelbase) + " " +
             lu + "), got " + number_text(o) + " " + lu);
  }
}

void pass(const Pass& p, WeightUnit unit, const FieldNames& names) {
  const Units u = weight_only(unit);
  text(p.ticket, Text::ticket, "ticket", names, false);
  if (p.setting) {
    text(*p.setting, Text::ticket, "setting", names, false);
    if (p.kind != PassKind::tensioned) {
      fail(names, "setting",
           fmt::format("a bar setting belongs only on a tensioned pass; this "
                       "pass is {}",
                       to_string(p.kind)));
    }
  } else if (p.kind == PassKind::tensioned) {
    fail(names, "setting",
         "missing required field 'setting': a tensioned pass needs the bar "
         "tension setting");
  }
  date_time(p.weighed_at, "weighed_at", names);
  number(p.steer, Quantity::reading, u, "steer", names);
  number(p.drive, Quantity::reading, u, "drive", names);
  opt_number(p.trailer, Quantity::reading, u, "trailer", names);
  if (p.kind == PassKind::unhitched) {
    if (p.trailer && *p.trailer != 0) {
      fail(names, "trailer",
           "expected no trailer reading (or 0) on an unhitched pass, got " +
               format::number_text(*p.trailer) + " " + std::string(to_string(unit)));
    }
  } else if (!p.trailer) {
    fail(names, "trailer",
         fmt::format("missing required field 'trailer': a {} pass needs the "
                     "trailer-axle platform reading",
                     to_string(p.kind)));
  }
  opt_number(p.gross, Quantity::gross, u, "gross", names);
  opt_text(p.scale_id, Text::label, "scale_id", names);
  if (p.void_reason) {
    text(*p.void_reason, Text::label, "void_reason", names);
    if (!p.voided) fail(names, "void_reason", "a void reason belongs only on a voided pass");
  }
  opt_text(p.entered_by, Text::label, "entered_by", names);
  if (p.entered_at) date_time(*p.entered_at, "entered_at", names);
}

void pass_on_scale(const Pass& p, const ScaleInfo& s, WeightUnit unit, const FieldNames& names) {
  const std::string_view u = to_string(unit);
  auto reading = [&](std::string_view field, double value) {
    if (s.capacity && value > *s.capacity) {
      fail(names, field,
           fmt::format("reading {} {} is above the scale capacity of {} {}",
                       format::number_text(value), u, format::number_text(*s.capacity), u));
    }
    if (s.division > 0) {
      const double n = value / s.division;
      if (std::fabs(n - std::round(n)) > 1e-6) {
        fail(names, field,
             fmt::format("reading {} {} is not a multiple of the scale division "
                         "{} {}",
                         format::number_text(value), u, format::number_text(s.division), u));
      }
    }
  };
  reading("steer", p.steer);
  reading("drive", p.drive);
  if (p.trailer) reading("trailer", *p.trailer);
  if (p.gross) {
    const double sum = p.steer + p.drive + p.trailer.value_or(0);
    if (std::fabs(*p.gross - sum) > 1e-9 * std::max(1.0, sum)) {
      using format::number_text;
      fail(names, "gross",
           fmt::format("printed gross {} {} is not the sum of the platforms "
                       "({} + {} + {} = {} {})",
                       number_text(*p.gross), u, number_text(p.steer), number_text(p.drive),
                       number_text(p.trailer.value_or(0)), number_text(sum), u));
    }
  }
}

void session(const Session& s, const FieldNames& names) {
  opt_text(s.station, Text::label, "station", names);
  opt_text(s.operator_name, Text::label, "operator", names);
  opt_text(s.owner, Text::label, "owner", names);
  scale(s.scale, s.units.weight, Nested(names, "scale."));
  rig(s.units, s.tow_vehicle, s.trailer, names);
  opt_number(s.length_uncertainty, Quantity::length_uncertainty, s.units, "length_uncertainty",
             names);
  if (s.passes.empty() || s.passes.size() > kMaxPasses) {
    fail(names, "passes",
         fmt::format("expected 1 to {} passes, got {}", kMaxPasses, s.passes.size()));
  }
  for (std::size_t i = 0; i < s.passes.size(); ++i) {
    const Pass& p = s.passes[i];
    const Nested pn(names, "passes", static_cast<long>(i));
    pass(p, s.units.weight, pn);
    for (std::size_t k = 0; k < i; ++k) {
      if (s.passes[k].ticket == p.ticket) {
        fail(pn, "ticket",
             fmt::format("ticket {} is already used by passes[{}]; each pass "
                         "needs its own ticket",
                         validate::quoted(p.ticket), k));
      }
    }
    if (s.trailer.type == TrailerType::fifth_wheel && p.kind == PassKind::tensioned) {
      fail(pn, "kind",
           "a fifth-wheel trailer takes no weight-distributing bars; expected "
           "unhitched or hitched, got \"tensioned\"");
    }
  }
  if (s.notes) text(*s.notes, Text::notes, "notes", names);
}

}  // namespace sp::validate
