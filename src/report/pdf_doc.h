// A small PDF writing surface, implemented with libharu (make_pdf_document).
//
// Coordinates are PDF points (1/72 in), origin at the bottom-left of the page, y up.
// Text is UTF-8, drawn with DejaVu Sans (regular / bold / mono) embedded as TTF subsets:
// what fits WinAnsiEncoding with the faces' WinAnsi cuts compiled into the binary
// (cmake/fonts.cmake, simple fonts), anything else with the full faces read from font_dir
// (fonts-dejavu-core) as UTF-8 Type0 fonts; Unicode spaces such as the thin space that groups
// digits are drawn as gaps of their width (report/winansi.h). Characters outside the BMP are
// dropped by libharu. Grey levels are 0 (black) .. 1 (white): the report prints in black and
// white, so everything is told apart by grey, dash and marker shape, never by colour alone.
// Output is deterministic: the same calls give the same bytes (no /ID, no automatic dates).
// Failures throw sp::Error(internal) with libharu's error code; a font missing from disk
// throws sp::Error(no_input) naming the path.
#pragma once
#include <memory>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace sp::report {

enum class Font { regular, bold, mono };
enum class Dash { solid, dashed, dotted };

struct DocInfo {
  std::string title, author, subject, creator, keywords;
  // Creation date "YYYY-MM-DDTHH:MM:SS" followed by "Z", "+HH:MM", "-HH:MM" or nothing
  // (taken as UTC); empty: no date in the file. Anything else throws data_error.
  std::string created;
};

class PdfDocument {
 public:
  virtual ~PdfDocument() = default;
  // Starts a new page of the given size in points; later drawing goes to it.
  virtual void new_page(float width, float height) = 0;
  virtual void text(float x, float y, std::string_view utf8, float size, Font font = Font::regular,
                    float grey = 0) = 0;
  virtual float text_width(std::string_view utf8, float size, Font font = Font::regular) = 0;
  virtual void line(float x1, float y1, float x2, float y2, float width = 0.6f, float grey = 0,
                    Dash dash = Dash::solid) = 0;
  // Rectangle with lower-left (x, y); fill_grey < 0 means not filled; stroke_width 0: no stroke.
  virtual void rect(float x, float y, float w, float h, float stroke_width, float fill_grey = -1) = 0;
  // Closed polygon through points (x0, y0, x1, y1, ...).
  virtual void polygon(const std::vector<float>& xy, float stroke_width, float fill_grey = -1) = 0;
  virtual void circle(float x, float y, float r, float stroke_width, float fill_grey = -1) = 0;
  // Embeds `bytes` as an attachment named `name` (a bare file name, no folder).
  virtual void attach(const std::string& name, const std::string& bytes) = 0;
  virtual void set_info(const DocInfo& info) = 0;
  // Reserves the in-file signature (report/pdf_signature.h: an invisible signature field on the
  // first page with placeholder /ByteRange and /Contents, which sign_pdf_in_place fills once
  // finish() has returned the bytes). `signing_time`: a DocInfo::created date for /M, or "".
  // Call once, after the first page.
  virtual void reserve_signature(const std::string& signing_time) = 0;
  // Finishes the document and returns the file's bytes. Call once.
  virtual std::string finish() = 0;
};

// True when `iso` is a date DocInfo::created accepts.
bool valid_pdf_date(const std::string& iso);

// Full faces are read from `font_dir` (default: fonts-dejavu-core's folder); all three must
// exist there, even when every string fits the compiled-in cuts, so a missing font fails
// alike whatever the text.
std::unique_ptr<PdfDocument> make_pdf_document(
    const std::string& font_dir = "/usr/share/fonts/truetype/dejavu");

}  // namespace sp::report
