// libharu 2.3.0 implementation of PdfDocument. Gotchas (shared/notes/libraries.md): errors are
// sticky, so we check after every call and throw from our own frames, never from the C
// callback; HPDF_AttachFile names the attachment with the path exactly as given, so files are
// attached by bare name from a private temporary folder.
#include "report/pdf_doc.h"

#include <fcntl.h>
#include <hpdf.h>
#include <hpdf_objects.h>
#include <hpdf_streams.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cmath>
#include <cstdio>
#include <cstdlib>

#include "core/embedded.h"
#include "core/error.h"
#include "report/hpdf_signature.h"
#include "report/to_unicode.h"
#include "report/winansi.h"

namespace sp::report {
namespace {

struct HpdfErrorState {
  HPDF_STATUS code = HPDF_OK;
  HPDF_STATUS detail = 0;
};

void on_hpdf_error(HPDF_STATUS code, HPDF_STATUS detail, void* user) {
  auto* st = static_cast<HpdfErrorState*>(user);
  if (st->code == HPDF_OK) {  // keep the first error: later ones follow from it
    st->code = code;
    st->detail = detail;
  }
}

// ISO 8601 "YYYY-MM-DDTHH:MM:SS[Z|+HH:MM|-HH:MM]" as a PDF date. A UTC time is written as '+'
// with zero offsets: libharu 2.3.0 rejects 'Z' (shared/notes/libraries.md).
std::optional<HPDF_Date> try_parse_date(const std::string& iso) {
  int y = 0, mo = 0, d = 0, h = 0, mi = 0, s = 0, n = 0;
  if (iso.size() < 19 ||
      std::sscanf(iso.c_str(), "%4d-%2d-%2dT%2d:%2d:%2d%n", &y, &mo, &d, &h, &mi, &s, &n) != 6 || n != 19) {
    return std::nullopt;
  }
  if (y < 1 || mo < 1 || mo > 12 || d < 1 || d > 31 || h > 23 || mi > 59 || s > 59 || h < 0 || mi < 0 || s < 0) {
    return std::nullopt;
  }
  HPDF_Date date{y, mo, d, h, mi, s, '+', 0, 0};
  std::string zone = iso.substr(19);
  if (zone.empty() || zone == "Z") return date;
  int oh = 0, om = 0, m = 0;
  if (zone.size() != 6 || (zone[0] != '+' && zone[0] != '-') ||
      std::sscanf(zone.c_str() + 1, "%2d:%2d%n", &oh, &om, &m) != 2 || m != 5 || oh > 23 || om > 59 ||
      oh < 0 || om < 0) {
    return std::nullopt;
  }
  if (oh != 0 || om != 0) date.ind = zone[0];
  date.off_hour = oh;
  date.off_minutes = om;
  return date;
}

HPDF_Date parse_date(const std::string& iso) {
  auto d = try_parse_date(iso);
  if (!d) throw data_error("date '" + iso + "': expected YYYY-MM-DDTHH:MM:SS with Z or an offset +HH:MM");
  return *d;
}

class HpdfDocument : public PdfDocument {
 public:
  explicit HpdfDocument(const std::string& font_dir) {
    pdf_ = HPDF_New(on_hpdf_error, &err_);
    if (pdf_ == nullptr) throw Error(ExitCode::internal, "libharu: cannot create a document");
    HPDF_SetCompressionMode(pdf_, HPDF_COMP_ALL);
    HPDF_UseUTFEncodings(pdf_);
    HPDF_SetCurrentEncoder(pdf_, "UTF-8");  // document info strings are UTF-8 too
    check("setting up UTF-8");
    // Each face is checked now (a missing font fails before anything is drawn) but read and
    // embedded only when a string first needs it.
    const char* files[3] = {"/DejaVuSans.ttf", "/DejaVuSans-Bold.ttf", "/DejaVuSansMono.ttf"};
    for (int i = 0; i < 3; ++i) {
      faces_[i].path = font_dir + files[i];
      struct stat st {};
      if (::stat(faces_[i].path.c_str(), &st) != 0) {
        throw Error(ExitCode::no_input, faces_[i].path + ": font not found (Debian package fonts-dejavu-core)");
      }
    }
  }
  ~HpdfDocument() override {
    HPDF_Free(pdf_);
    remove_temp();
  }
  HpdfDocument(const HpdfDocument&) = delete;
  HpdfDocument& operator=(const HpdfDocument&) = delete;

  void new_page(float width, float height) override {
    page_ = HPDF_AddPage(pdf_);
    check("adding a page");
    HPDF_Page_SetWidth(page_, width);
    HPDF_Page_SetHeight(page_, height);
    check("sizing a page");
  }

  void text(float x, float y, std::string_view utf8, float size, Font font, float grey) override {
    need_page();
    HPDF_Page_SetGrayFill(page_, grey);
    for (const TextRun& run : split_winansi_runs(utf8)) {
      if (run.kind != TextRun::Kind::gap) {
        HPDF_Page_BeginText(page_);
        HPDF_Page_SetFontAndSize(page_, font_for(font, run), size);
        HPDF_Page_TextOut(page_, x, y, run.bytes.c_str());
        HPDF_Page_EndText(page_);
      }
      x += run_width(font, run, size);
    }
    HPDF_Page_SetGrayFill(page_, 0);
    check("writing text");
  }

  float text_width(std::string_view utf8, float size, Font font) override {
    need_page();
    float w = 0;
    for (const TextRun& run : split_winansi_runs(utf8)) w += run_width(font, run, size);
    check("measuring text");
    return w;
  }

  void line(float x1, float y1, float x2, float y2, float width, float grey, Dash dash) override {
    need_page();
    HPDF_Page_SetLineWidth(page_, width);
    HPDF_Page_SetGrayStroke(page_, grey);
    set_dash(dash);
    HPDF_Page_MoveTo(page_, x1, y1);
    HPDF_Page_LineTo(page_, x2, y2);
    HPDF_Page_Stroke(page_);
    set_dash(Dash::solid);
    HPDF_Page_SetGrayStroke(page_, 0);
    check("drawing a line");
  }

  void rect(float x, float y, float w, float h, float stroke_width, float fill_grey) override {
    need_page();
    prepare(stroke_width, fill_grey);
    HPDF_Page_Rectangle(page_, x, y, w, h);
    paint(stroke_width, fill_grey);
    check("drawing a rectangle");
  }

  void polygon(const std::vector<float>& xy, float stroke_width, float fill_grey) override {
    need_page();
    if (xy.size() < 6) return;
    prepare(stroke_width, fill_grey);
    HPDF_Page_MoveTo(page_, xy[0], xy[1]);
    for (std::size_t i = 2; i + 1 < xy.size(); i += 2) HPDF_Page_LineTo(page_, xy[i], xy[i + 1]);
    HPDF_Page_ClosePath(page_);
    paint(stroke_width, fill_grey);
    check("drawing a polygon");
  }

  void circle(float x, float y, float r, float stroke_width, float fill_grey) override {
    need_page();
    prepare(stroke_width, fill_grey);
    HPDF_Page_Circle(page_, x, y, r);
    paint(stroke_width, fill_grey);
    check("drawing a circle");
  }

  void attach(const std::string& name, const std::string& bytes) override {
    if (name.empty() || name.find('/') != std::string::npos || name[0] == '.') {
      throw Error(ExitCode::internal, "PDF attachment: expected a bare file name, got '" + name + "'");
    }
    write_temp(name, bytes, "attachment");
    // The reader opens the file now and reads it when the document is saved.
    int here = ::open(".", O_RDONLY | O_DIRECTORY | O_CLOEXEC);
    if (here < 0 || ::chdir(temp_dir_.c_str()) != 0) {
      if (here >= 0) ::close(here);
      throw Error(ExitCode::io_error, temp_dir_ + ": cannot enter the temporary folder");
    }
    HPDF_EmbeddedFile ef = HPDF_AttachFile(pdf_, name.c_str());
    int back = ::fchdir(here);
    ::close(here);
    if (back != 0) throw Error(ExitCode::io_error, "cannot return to the working folder");
    check("attaching " + name);
    // Store the attachment uncompressed, so the signed record is readable in the file itself
    // and verification needs no inflater.
    auto* efdict = static_cast<HPDF_Dict>(HPDF_Dict_GetItem(ef, "EF", HPDF_OCLASS_DICT));
    auto* stream = efdict ? static_cast<HPDF_Dict>(HPDF_Dict_GetItem(efdict, "F", HPDF_OCLASS_DICT))
                          : nullptr;
    if (stream == nullptr) throw Error(ExitCode::internal, "libharu: attachment has no stream");
    stream->filter = HPDF_STREAM_FILTER_NONE;
  }

  void set_info(const DocInfo& info) override {
    auto put = [&](HPDF_InfoType t, const std::string& v) {
      if (!v.empty()) HPDF_SetInfoAttr(pdf_, t, v.c_str());
    };
    put(HPDF_INFO_TITLE, info.title);
    put(HPDF_INFO_AUTHOR, info.author);
    put(HPDF_INFO_SUBJECT, info.subject);
    put(HPDF_INFO_CREATOR, info.creator);
    put(HPDF_INFO_KEYWORDS, info.keywords);
    put(HPDF_INFO_PRODUCER, info.creator);
    if (!info.created.empty()) HPDF_SetInfoDateAttr(pdf_, HPDF_INFO_CREATION_DATE, parse_date(info.created));
    check("writing document info");
  }

  void reserve_signature(const std::string& signing_time) override {
    std::optional<HPDF_Date> when;
    if (!signing_time.empty()) when = parse_date(signing_time);
    hpdf_reserve_signature(pdf_, when);
    check("reserving the signature");
  }

  std::string finish() override {
    HPDF_SaveToStream(pdf_);
    check("saving the document");
    HPDF_UINT32 size = HPDF_GetStreamSize(pdf_);
    std::string out(size, '\0');
    HPDF_UINT32 got = size;
    HPDF_ReadFromStream(pdf_, reinterpret_cast<HPDF_BYTE*>(out.data()), &got);
    // libharu reports HPDF_STREAM_EOF after a complete read; only the byte count matters here.
    if (got != size) throw Error(ExitCode::internal, "libharu: short read of the saved document");
    HPDF_ResetError(pdf_);
    err_ = {};
    remove_temp();
    return out;
  }

 private:
  struct Face {
    std::string path;
    HPDF_Font single = nullptr;  // WinAnsiEncoding
    HPDF_Font utf8 = nullptr;    // UTF-8, Type0
  };

  static int index(Font f) { return f == Font::regular ? 0 : f == Font::bold ? 1 : 2; }

  void check(const std::string& what) {
    if (err_.code != HPDF_OK) {
      char buf[64];
      std::snprintf(buf, sizeof buf, "0x%04X (detail %u)", static_cast<unsigned>(err_.code),
                    static_cast<unsigned>(err_.detail));
      throw Error(ExitCode::internal, "libharu: " + what + " failed with error " + buf);
    }
  }
  void need_page() {
    if (page_ == nullptr) throw Error(ExitCode::internal, "PDF: drawing before the first page");
  }
  void set_dash(Dash d) {
    static const HPDF_UINT16 dashed[] = {5, 3};
    static const HPDF_UINT16 dotted[] = {1, 2};
    if (d == Dash::dashed) {
      HPDF_Page_SetDash(page_, dashed, 2, 0);
    } else if (d == Dash::dotted) {
      HPDF_Page_SetDash(page_, dotted, 2, 0);
    } else {
      HPDF_Page_SetDash(page_, nullptr, 0, 0);
    }
  }
  // Graphics state may change only outside a path (libharu: HPDF_PAGE_INVALID_GMODE).
  void prepare(float stroke_width, float fill_grey) {
    if (fill_grey >= 0) HPDF_Page_SetGrayFill(page_, fill_grey);
    if (stroke_width > 0) HPDF_Page_SetLineWidth(page_, stroke_width);
  }
  void paint(float stroke_width, float fill_grey) {
    if (fill_grey >= 0 && stroke_width > 0) {
      HPDF_Page_FillStroke(page_);
    } else if (fill_grey >= 0) {
      HPDF_Page_Fill(page_);
    } else if (stroke_width > 0) {
      HPDF_Page_Stroke(page_);
    } else {
      HPDF_Page_EndPath(page_);
    }
    HPDF_Page_SetGrayFill(page_, 0);
  }
  // The font that draws `run` in face `font`. WinAnsi runs use a simple TrueType font made
  // from the face's compiled-in WinAnsi subset, other runs the full face from font_dir as a
  // UTF-8 (Type0, Identity-H) font; each is made on first use. Why: libharu builds a Type0
  // font's code-to-glyph map by a linear cmap search for each of the 65 536 BMP code points,
  // and reads, copies and deflates every table of an embedded face; the two made four fifths of
  // a report's time (bench/README.md). The report's own wording fits WinAnsi; names and places
  // may not, and those still draw with the full face.
  HPDF_Font font_for(Font font, const TextRun& run) {
    Face& face = faces_[index(font)];
    if (run.kind == TextRun::Kind::unicode) {
      if (face.utf8 == nullptr) {
        face.utf8 = get_font(load(face.path), "UTF-8", face.path);
        replace_to_unicode(face.utf8, face.path);
      }
      return face.utf8;
    }
    if (face.single == nullptr) {
      // The face's WinAnsi subset compiled into the binary (cmake/fonts.cmake). libharu
      // loads fonts from files only, so it goes through the private temporary folder; the
      // name starts with '.', which no attachment may, so the two never collide.
      const std::string file = face.path.substr(face.path.rfind('/') + 1);
      std::string_view bytes;
      for (const auto& f : embedded::font_files()) {
        if (f.name == file) bytes = f.contents;
      }
      if (bytes.empty()) throw Error(ExitCode::internal, file + ": no WinAnsi subset compiled in");
      face.single = get_font(load(write_temp("." + file, bytes, "font")), "WinAnsiEncoding", file);
    }
    return face.single;
  }
  // libharu gives a UTF-8 Type0 font its encoder's code-to-CID CMap as /ToUnicode, which no
  // reader accepts (report/to_unicode.h). The stream object stays where libharu put it (it
  // also sets its filter before writing); only its contents and the encoding CMap's keys go.
  void replace_to_unicode(HPDF_Font font, const std::string& what) {
    auto* cmap = static_cast<HPDF_Dict>(HPDF_Dict_GetItem(font, "ToUnicode", HPDF_OCLASS_DICT));
    if (cmap == nullptr || cmap->stream == nullptr) {
      throw Error(ExitCode::internal, "libharu: " + what + " (UTF-8) has no ToUnicode stream");
    }
    HPDF_MemStream_FreeData(cmap->stream);
    for (const char* key : {"Type", "CMapName", "CIDSystemInfo", "WMode"})
      HPDF_Dict_RemoveElement(cmap, key);
    const std::string& text = identity_to_unicode_cmap();
    HPDF_Stream_Write(cmap->stream, reinterpret_cast<const HPDF_BYTE*>(text.data()),
                      static_cast<HPDF_UINT>(text.size()));
    check("writing the ToUnicode CMap of " + what);
  }
  const char* load(const std::string& path) {
    const char* name = HPDF_LoadTTFontFromFile(pdf_, path.c_str(), HPDF_TRUE);
    check("loading font " + path);
    return name;
  }
  HPDF_Font get_font(const char* name, const char* encoding, const std::string& what) {
    HPDF_Font f = HPDF_GetFont(pdf_, name, encoding);
    check("selecting font " + what + " (" + encoding + ")");
    return f;
  }
  // Advance of `run` in points. A gap is the width the face gives its space character (read
  // from the font's metrics by code point, which needs no UTF-8 font).
  float run_width(Font font, const TextRun& run, float size) {
    HPDF_Font f = font_for(font, run);
    if (run.kind == TextRun::Kind::gap) {
      return static_cast<float>(HPDF_Font_GetUnicodeWidth(f, static_cast<HPDF_UNICODE>(run.code_point))) * size /
             1000.0f;
    }
    HPDF_Page_SetFontAndSize(page_, f, size);
    return HPDF_Page_TextWidth(page_, run.bytes.c_str());
  }
  // Writes `bytes` to `name` in the private temporary folder (removed by remove_temp).
  std::string write_temp(const std::string& name, std::string_view bytes, const char* what) {
    make_temp();
    std::string path = temp_dir_ + "/" + name;
    std::FILE* f = std::fopen(path.c_str(), "wb");
    if (f == nullptr || std::fwrite(bytes.data(), 1, bytes.size(), f) != bytes.size() ||
        std::fclose(f) != 0) {
      if (f != nullptr) temp_files_.push_back(path);
      throw Error(ExitCode::io_error, path + ": cannot write a temporary " + what);
    }
    temp_files_.push_back(path);
    return path;
  }
  void make_temp() {
    if (!temp_dir_.empty()) return;
    const char* base = std::getenv("TMPDIR");
    std::string tmpl = std::string(base && *base ? base : "/tmp") + "/scaleproof-pdf-XXXXXX";
    if (::mkdtemp(tmpl.data()) == nullptr) {
      throw Error(ExitCode::io_error, tmpl + ": cannot create a temporary folder");
    }
    temp_dir_ = tmpl;
  }
  void remove_temp() {
    for (const auto& f : temp_files_) ::unlink(f.c_str());
    temp_files_.clear();
    if (!temp_dir_.empty()) ::rmdir(temp_dir_.c_str());
    temp_dir_.clear();
  }

  HpdfErrorState err_;
  HPDF_Doc pdf_ = nullptr;
  HPDF_Page page_ = nullptr;
  Face faces_[3];
  std::string temp_dir_;
  std::vector<std::string> temp_files_;
};

}  // namespace

bool valid_pdf_date(const std::string& iso) { return try_parse_date(iso).has_value(); }

std::unique_ptr<PdfDocument> make_pdf_document(const std::string& font_dir) {
  return std::make_unique<HpdfDocument>(font_dir);
}

}  // namespace sp::report
