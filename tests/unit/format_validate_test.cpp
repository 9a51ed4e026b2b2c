// The one validator (format/validate.h): the field-fault table (tests/bad-input/fields.tsv)
// through the session-file reader and the CSV reader + validate::pass (the importer's two
// steps), with the same message on both; text faults; the Cf table; the CSV formula guard's
// round trip; and that values which pass allocate nothing.
// Sources: the Cf list is Unicode 15.0's general category Cf (UnicodeData.txt), generated with
// Python 3.11's unicodedata (Unicode 14.0) plus U+13439-U+1343F, which 15.0 added; the
// formula guard is OWASP's "CSV Injection" advice (from memory).
#include <doctest/doctest.h>

#include <atomic>
#include <cstdlib>
#include <fstream>
#include <functional>
#include <new>
#include <nlohmann/json.hpp>
#include <sstream>

#include "core/error.h"
#include "format/pass_csv.h"
#include "format/session_json.h"
#include "format/validate.h"

// Counts allocations while `g_counting` is set (the no-allocation regression below). The
// replacement operators pair malloc with free on purpose; GCC cannot see that once inlined.
#pragma GCC diagnostic ignored "-Wmismatched-new-delete"
namespace {
std::atomic<bool> g_counting{false};
std::atomic<long> g_allocations{0};
}  // namespace
void* operator new(std::size_t n) {
  if (g_counting) ++g_allocations;
  if (void* p = std::malloc(n == 0 ? 1 : n)) return p;
  throw std::bad_alloc();
}
void operator delete(void* p) noexcept {
  std::free(p);
}
void operator delete(void* p, std::size_t) noexcept {
  std::free(p);
}

using namespace sp;
using nlohmann::json;

namespace {

std::string read_file(const std::string& path) {
  std::ifstream f(path, std::ios::binary);
  REQUIRE(f);
  std::stringstream ss;
  ss << f.rdbuf();
  return ss.str();
}

struct FieldFault {
  std::string field, flag, value, message;
};

std::vector<FieldFault> field_faults() {
  std::istringstream in(read_file(SCALEPROOF_SOURCE_DIR "/tests/bad-input/fields.tsv"));
  std::vector<FieldFault> out;
  std::string line;
  while (std::getline(in, line)) {
    if (line.empty() || line[0] == '#') continue;
    FieldFault f;
    std::istringstream cols(line);
    std::getline(cols, f.field, '\t');
    std::getline(cols, f.flag, '\t');
    std::getline(cols, f.value, '\t');
    std::getline(cols, f.message, '\t');
    out.push_back(f);
  }
  return out;
}

// "passes[0].steer" -> "/passes/0/steer"
json::json_pointer pointer(const std::string& field) {
  std::string p = "/";
  for (char c : field) {
    if (c == '.' || c == '[') {
      p += '/';
    } else if (c != ']') {
      p += c;
    }
  }
  return json::json_pointer(p);
}

std::string error_of(const std::function<void()>& f) {
  try {
    f();
  } catch (const Error& e) {
    CHECK(e.code() == ExitCode::data_error);
    return e.what();
  }
  return "(no error)";
}

// The base pass of the table as one CSV row, with `cell` in place of `column`'s value.
std::string csv_with(const std::string& column, const std::string& cell) {
  std::vector<std::pair<std::string, std::string>> cols = {
      {"session", "K-1"},      {"kind", "unhitched"},
      {"ticket", "T-0001001"}, {"weighed_at", "2026-01-01T09:00:00-05:00"},
      {"steer", "4460"},       {"drive", "4000"},
      {"entered_by", "bench"}};
  std::string head, row;
  for (auto& [name, value] : cols) {
    if (name == column) value = cell;
    head += (head.empty() ? "" : ",") + name;
    row += (row.empty() ? "" : ",") + value;
  }
  return head + "\n" + row + "\n";
}

std::string repeat(const std::string& s, int n) {
  std::string out;
  for (int i = 0; i < n; ++i) out += s;
  return out;
}

std::string base_session() {
  return read_file(SCALEPROOF_SOURCE_DIR "/tests/fuzz/corpus/session_json/valid_1.json");
}

}  // namespace

TEST_CASE("field-fault table: the session file and the CSV give the same message") {
  const auto faults = field_faults();
  REQUIRE(faults.size() >= 20);
  const std::string base = base_session();
  for (const FieldFault& f : faults) {
    CAPTURE(f.field);
    CAPTURE(f.value);
    json doc = json::parse(base);
    doc[pointer(f.field)] = json::parse(f.value);
    const std::string got = error_of([&] { parse_session_json(doc.dump(), "base.json"); });
    CHECK(got == "base.json: $." + f.field + ": " + f.message);

    const std::string pass_prefix = "passes[0].";
    if (f.field.rfind(pass_prefix, 0) != 0) continue;
    // The CSV: the reader (text and number form), then validate::pass as the importer runs it.
    const std::string column = f.field.substr(pass_prefix.size());
    const json v = json::parse(f.value);
    const std::string cell = v.is_string() ? v.get<std::string>() : v.dump();
    std::istringstream in(csv_with(column, cell));
    const std::string csv = error_of([&] {
      PassCsvReader reader(in, "in.csv");
      CsvPassRow row;
      while (reader.next(row)) {
        validate::pass(row.pass, WeightUnit::lb, validate::PrefixNames("in.csv:2: "));
      }
    });
    CHECK(csv == "in.csv:2: " + column + ": " + f.message);
  }
}

TEST_CASE("the validator names fields as the caller asks") {
  TowVehicle v;
  v.label = "x";
  v.wheelbase = 138;
  v.rear_axle_to_ball = 42;
  v.gvwr = 1e308;
  Trailer t;
  t.label = "y";
  t.ball_to_axle = 214;
  const std::string msg = "expected a rating greater than 0 and at most 200000 lb, got 1e+308";
  CHECK(error_of([&] { validate::rig(Units{}, v, t, validate::PrefixNames("rig.toml: ")); }) ==
        "rig.toml: tow_vehicle.gvwr: " + msg);
  const validate::TableNames flags(
      std::vector<validate::TableNames::Entry>{{"tow_vehicle.gvwr", "--gvwr"}});
  CHECK(error_of([&] { validate::rig(Units{}, v, t, flags); }) == "--gvwr: " + msg);
  v.gvwr.reset();
  v.wheelbase = 0;
  CHECK(error_of([&] { validate::rig(Units{}, v, t, flags); }) ==
        "tow_vehicle.wheelbase: expected a length greater than 0 and at most 1200 in, got 0");
}

TEST_CASE("text faults name what was seen") {
  struct Case {
    const char* name;
    std::string text;
    validate::Text kind;
    const char* fault;  // "" = fine
  };
  using validate::Text;
  const Case cases[] = {
      {"plain", "Bench pickup", Text::label, ""},
      {"accents and CJK", "Caf\xC3\xA9 \xE6\x9D\xB1", Text::label, ""},
      {"ESC",
       "a\x1b"
       "b",
       Text::label,
       "expected text without control characters, got control character U+001B at character 2"},
      {"DEL", "a\x7f", Text::label, "got control character U+007F at character 2"},
      {"C1 NEL", "a\xC2\x85", Text::label, "got control character U+0085 at character 2"},
      {"NUL", std::string("a\0b", 3), Text::ticket, "got control character U+0000"},
      {"newline in a label", "a\nb", Text::label,
       "expected one line of text, got a line break (U+000A) at character 2"},
      {"CR in a label", "a\rb", Text::label, "got a line break (U+000D)"},
      {"tab in a label", "a\tb", Text::label, "got control character U+0009"},
      {"newline and tab in notes", "a\n\tb", Text::notes, ""},
      {"bidi override in notes too", "a\n\xE2\x80\xAE", Text::notes,
       "got U+202E (right-to-left override) at character 3"},
      {"LRE", "\xE2\x80\xAA", Text::label, "U+202A (left-to-right embedding)"},
      {"PDF", "\xE2\x80\xAC", Text::label, "U+202C (pop directional formatting)"},
      {"PDI", "\xE2\x81\xA9", Text::label, "U+2069 (pop directional isolate)"},
      {"zero width joiner", "a\xE2\x80\x8D", Text::label, "U+200D (zero width joiner)"},
      {"word joiner", "a\xE2\x81\xA0", Text::label, "U+2060 (word joiner)"},
      {"BOM inside text", "a\xEF\xBB\xBF", Text::label, "U+FEFF"},
      {"soft hyphen", "a\xC2\xAD", Text::label, "U+00AD (soft hyphen)"},
      {"line separator", "a\xE2\x80\xA8", Text::label, "U+2028 (line separator)"},
      {"tag character", "a\xF3\xA0\x80\x81", Text::label, "U+E0001 (invisible format character)"},
      {"invalid byte", "a\xff", Text::label,
       "expected UTF-8 text, got the byte 0xFF at byte 2, which is not UTF-8"},
      {"overlong", "\xC0\x80", Text::label, "got the byte 0xC0 at byte 1"},
      {"surrogate", "\xED\xA0\x80", Text::label, "got the byte 0xED at byte 1"},
      {"truncated", "ab\xE2\x80", Text::label, "got the byte 0xE2 at byte 3"},
      {"200 two-byte characters", repeat("\xC3\xA9", 200), Text::label, ""},
      {"201 two-byte characters", repeat("\xC3\xA9", 201), Text::label,
       "expected at most 200 characters, got 201"},
      {"201 characters", std::string(201, 'x'), Text::label,
       "expected at most 200 characters, got 201"},
      {"65-character ticket", std::string(65, 'T'), Text::ticket,
       "expected at most 64 characters, got 65"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.name);
    const std::string fault = validate::text_fault(c.text, c.kind);
    CAPTURE(fault);
    if (*c.fault == '\0') {
      CHECK(fault.empty());
    } else {
      CHECK(fault.find(c.fault) != std::string::npos);
    }
  }
}

TEST_CASE("every Unicode Cf character is refused, and its neighbours are not") {
  // Unicode 15.0 general category Cf (see the file comment for how the list was made).
  const std::pair<char32_t, char32_t> cf[] = {
      {0x00AD, 0x00AD},   {0x0600, 0x0605},   {0x061C, 0x061C},   {0x06DD, 0x06DD},
      {0x070F, 0x070F},   {0x0890, 0x0891},   {0x08E2, 0x08E2},   {0x180E, 0x180E},
      {0x200B, 0x200F},   {0x202A, 0x202E},   {0x2060, 0x2064},   {0x2066, 0x206F},
      {0xFEFF, 0xFEFF},   {0xFFF9, 0xFFFB},   {0x110BD, 0x110BD}, {0x110CD, 0x110CD},
      {0x13430, 0x1343F}, {0x1BCA0, 0x1BCA3}, {0x1D173, 0x1D17A}, {0xE0001, 0xE0001},
      {0xE0020, 0xE007F}};
  auto utf8 = [](char32_t c) {
    std::string s;
    if (c < 0x800) {
      s += static_cast<char>(0xC0 | (c >> 6));
    } else if (c < 0x10000) {
      s += static_cast<char>(0xE0 | (c >> 12));
      s += static_cast<char>(0x80 | ((c >> 6) & 0x3F));
    } else {
      s += static_cast<char>(0xF0 | (c >> 18));
      s += static_cast<char>(0x80 | ((c >> 12) & 0x3F));
      s += static_cast<char>(0x80 | ((c >> 6) & 0x3F));
    }
    s += static_cast<char>(0x80 | (c & 0x3F));
    return s;
  };
  for (const auto& [lo, hi] : cf) {
    for (char32_t c = lo; c <= hi; ++c) {
      CAPTURE(static_cast<unsigned>(c));
      CHECK_FALSE(validate::text_fault(utf8(c), validate::Text::label).empty());
    }
    // The neighbours are visible characters (none of them is Cf, Zl or Zp).
    for (char32_t c : {lo - 1, hi + 1}) {
      if (c == 0x2029) continue;  // a paragraph separator (Zp): refused too
      CAPTURE(static_cast<unsigned>(c));
      CHECK(validate::text_fault(utf8(c), validate::Text::label).empty());
    }
  }
}

TEST_CASE("plain decimals: what the CSV and the flags read as numbers") {
  struct Case {
    const char* text;
    bool ok;
    double value;
  };
  const Case cases[] = {{"4460", true, 4460}, {"0.5", true, 0.5},  {"-40", true, -40},
                        {"-0", true, 0},      {".5", true, 0.5},   {"5.", true, 5},
                        {"", false, 0},       {"-", false, 0},     {".", false, 0},
                        {"+5", false, 0},     {"1e3", false, 0},   {"4460 lb", false, 0},
                        {" 5", false, 0},     {"1.2.3", false, 0}, {"0x10", false, 0},
                        {"inf", false, 0},    {"nan", false, 0},   {"5,0", false, 0}};
  for (const Case& c : cases) {
    CAPTURE(c.text);
    double v = -1;
    CHECK(validate::parse_number(c.text, v) == c.ok);
    if (c.ok) CHECK(v == c.value);
  }
  double v = 0;
  CHECK(validate::parse_number("1" + std::string(308, '0'), v));
  CHECK(v == 1e308);
}

// OWASP "CSV Injection" (from memory): a cell a spreadsheet would evaluate is written as text.
TEST_CASE("CSV: cells that look like formulas are written as text and read back as stored") {
  const char* values[] = {"=HYPERLINK(\"http://example.invalid\",\"x\")",
                          "+1",
                          "-5",
                          "@SUM(A1:A2)",
                          "'Bert",  // a quote before an ordinary character stays as it is
                          "'=x",    // a stored quote before a trigger survives
                          "''",
                          "'",
                          "plain",
                          "a=b"};
  for (const char* value : values) {
    CAPTURE(value);
    CsvPassRow row;
    row.session = value;
    row.scale = value;
    row.rig = value;
    row.operator_name = value;
    row.pass.kind = PassKind::tensioned;
    row.pass.setting = value;
    row.pass.ticket = value;
    row.pass.weighed_at = "2026-01-01T09:00:00-05:00";
    row.pass.steer = 4460;
    row.pass.drive = 4000;
    row.pass.trailer = 4600;
    row.pass.scale_id = value;
    row.pass.entered_by = value;
    row.pass.voided = true;
    row.pass.void_reason = value;
    std::string out = pass_csv_header();
    write_pass_csv_row(out, row);
    const std::string_view v(value);
    const bool guarded = needs_text_prefix(v);
    CHECK(guarded ==
          (v[0] == '=' || v[0] == '+' || v[0] == '-' || v[0] == '@' || v == "'=x" || v == "''"));
    if (guarded) {
      // Quoted, with the guard quote first: a spreadsheet shows the cell as text.
      CHECK(out.find("\n\"'" + std::string(v.substr(0, 1))) != std::string::npos);
    }
    std::istringstream in(out);
    PassCsvReader reader(in, "out.csv");
    CsvPassRow back;
    REQUIRE(reader.next(back));
    CHECK(back.session == value);
    CHECK(back.scale == value);
    CHECK(back.rig == value);
    CHECK(back.operator_name == value);
    CHECK(back.pass.setting == value);
    CHECK(back.pass.ticket == value);
    CHECK(back.pass.scale_id == value);
    CHECK(back.pass.entered_by == value);
    CHECK(back.pass.void_reason == value);
  }
  // A cell a person typed with the guard reads as the text after it.
  std::istringstream typed(csv_with("entered_by", "'=clerk"));
  PassCsvReader reader(typed, "in.csv");
  CsvPassRow row;
  REQUIRE(reader.next(row));
  CHECK(row.pass.entered_by == "=clerk");
  // Weight columns are numbers: never guarded, and a guard there is not a number.
  std::istringstream quoted_weight(csv_with("steer", "'4460"));
  CHECK(error_of([&] {
          PassCsvReader r(quoted_weight, "in.csv");
          CsvPassRow x;
          r.next(x);
        }) == "in.csv:2: steer: expected a number, got \"'4460\"");
}

TEST_CASE("CSV errors say what they saw, not \"invalid bytes\"") {
  struct Case {
    const char* name;
    std::string text;
    const char* message;
  };
  const std::string h = "session,kind,ticket,weighed_at,steer,drive,entered_by\n";
  const Case cases[] = {
      {"ESC", h + "K-1,unhitched,T-1\x1b,2026-01-01T09:00:00Z,4460,4000,x\n",
       "in.csv:2: ticket: expected text without control characters, got control character "
       "U+001B at character 4"},
      {"newline inside a quoted field",
       h + "K-1,unhitched,T-1,2026-01-01T09:00:00Z,4460,4000,\"a\nb\"\n",
       "in.csv:2: entered_by: expected one line of text, got a newline inside a quoted field"},
      {"CRLF inside a quoted field",
       h + "K-1,unhitched,T-1,2026-01-01T09:00:00Z,4460,4000,\"a\r\nb\"\r\n",
       "in.csv:2: entered_by: expected one line of text, got a newline inside a quoted field"},
      {"bare CR", h + "K-1,unhitched,T-1,2026-01-01T09:00:00Z,4460,4000,a\rb\n",
       "in.csv:2: entered_by: expected one line of text, got a line break (U+000D) at "
       "character 2"},
      {"Latin-1 byte", h + "K-1,unhitched,T-\xe9,2026-01-01T09:00:00Z,4460,4000,x\n",
       "in.csv:2: ticket: expected UTF-8 text, got the byte 0xE9 at byte 3, which is not UTF-8"},
      {"right-to-left override in a name",
       h + "K-1,unhitched,T-1,2026-01-01T09:00:00Z,4460,4000,ab\xE2\x80\xAE"
           "cd\n",
       "in.csv:2: entered_by: expected text without invisible or direction-changing "
       "characters, got U+202E (right-to-left override) at character 3"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.name);
    std::istringstream in(c.text);
    CHECK(error_of([&] {
            PassCsvReader reader(in, "in.csv");
            CsvPassRow row;
            while (reader.next(row)) {
            }
          }) == c.message);
  }
}

// Regression: the validator must not allocate for values that pass (it runs on every row of a
// CSV import, bench/README.md item 1).
TEST_CASE("validate_pass_allocates_nothing_for_a_valid_pass") {
  Pass p;
  p.kind = PassKind::tensioned;
  p.setting = "4";
  p.ticket = "T-0001003";
  p.weighed_at = "2026-01-01T09:12:00-05:00";
  p.steer = 4340;
  p.drive = 4720;
  p.trailer = 4600;
  p.gross = 13660;
  p.entered_by = "bench";
  ScaleInfo scale;
  scale.id = "ST-1";
  scale.division = 20;
  const validate::PrefixNames names("in.csv:2: ");
  g_allocations = 0;
  g_counting = true;
  validate::pass(p, WeightUnit::lb, names);
  validate::pass_on_scale(p, scale, WeightUnit::lb, names);
  const bool fine =
      validate::text_fault("Bench pickup \xE6\x9D\xB1", validate::Text::label).empty();
  g_counting = false;
  CHECK(fine);
  CHECK(g_allocations == 0);
}
