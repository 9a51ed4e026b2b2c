#include "report/pdf_signature.h"

#include <string>

#include "core/error.h"

namespace sp::report {
namespace {

std::size_t find_unique(std::string_view hay, std::string_view needle, const char* what) {
  std::size_t at = hay.find(needle);
  if (at == std::string_view::npos || hay.find(needle, at + 1) != std::string_view::npos) {
    throw Error(ExitCode::internal, std::string("PDF signature: the ") + what +
                                        " placeholder is missing or not unique");
  }
  return at;
}

bool is_space(char c) {
  return c == ' ' || c == '\n' || c == '\r' || c == '\t' || c == '\f' || c == '\0';
}

int hex_value(char c) {
  if (c >= '0' && c <= '9') return c - '0';
  if (c >= 'a' && c <= 'f') return c - 'a' + 10;
  if (c >= 'A' && c <= 'F') return c - 'A' + 10;
  return -1;
}

// The value of the PDF hex string `s` ("<...>", ISO 32000-1 §7.3.4.3: white space ignored, an
// odd final digit taken as followed by 0); nullopt when `s` is not one.
std::optional<std::string> hex_string_value(std::string_view s) {
  if (s.size() < 2 || s.front() != '<' || s.back() != '>') return std::nullopt;
  std::string out;
  int hi = -1;
  for (char c : s.substr(1, s.size() - 2)) {
    if (is_space(c)) continue;
    int v = hex_value(c);
    if (v < 0) return std::nullopt;
    if (hi < 0) {
      hi = v;
    } else {
      out += static_cast<char>(hi * 16 + v);
      hi = -1;
    }
  }
  if (hi >= 0) out += static_cast<char>(hi * 16);
  return out;
}

}  // namespace

void sign_pdf_in_place(std::string& pdf, const Signer& signer,
                       std::optional<std::int64_t> signing_time) {
  const std::string p = kByteRangePlaceholder;
  // libharu writes arrays as "[ 0 1 2 3 ]".
  const std::string range_marker = "[ 0 " + p + " " + p + " " + p;
  const std::size_t range_at = find_unique(pdf, range_marker, "/ByteRange");
  const std::string hex_marker = "<" + std::string(2 * kSignatureReserve, '0') + ">";
  const std::size_t a = find_unique(pdf, hex_marker, "/Contents");
  const std::size_t b = a + hex_marker.size();
  std::string range =
      "[ 0 " + std::to_string(a) + " " + std::to_string(b) + " " + std::to_string(pdf.size() - b);
  range.resize(range_marker.size(), ' ');  // same width: no byte after it moves
  pdf.replace(range_at, range.size(), range);
  std::string content;
  content.reserve(pdf.size() - hex_marker.size());
  content.append(pdf, 0, a).append(pdf, b, std::string::npos);
  const std::string hex = to_hex(make_cms_signature(content, signer, signing_time));
  if (hex.size() > 2 * kSignatureReserve) {
    throw Error(ExitCode::internal, "PDF signature: the CMS signature (" +
                                        std::to_string(hex.size() / 2) + " bytes) exceeds the " +
                                        std::to_string(kSignatureReserve) + " bytes reserved");
  }
  pdf.replace(a + 1, hex.size(), hex);
}

PdfSignatureCheck check_pdf_signature(std::string_view pdf, const PdfSignatureDict& sig) {
  PdfSignatureCheck out;
  const long long n = static_cast<long long>(pdf.size());
  const auto& r = sig.byte_range;
  if (r.size() != 4) {
    out.problem = "/ByteRange does not hold four numbers";
    return out;
  }
  for (long long v : r) {
    if (v < 0 || v > (1LL << 40)) {
      out.problem = "/ByteRange holds a negative or absurd number";
      return out;
    }
  }
  out.gap_start = r[0] + r[1];
  out.gap_end = r[2];
  out.covered_end = r[2] + r[3];
  if (r[0] != 0) {
    out.problem = "the signed range starts at byte " + std::to_string(r[0]) +
                  ", not at the start of the file";
    return out;
  }
  if (out.gap_end < out.gap_start) {
    out.problem = "the /ByteRange ranges overlap";
    return out;
  }
  if (out.covered_end > n) {
    out.problem = "the signed range ends at byte " + std::to_string(out.covered_end) +
                  " but the file has only " + std::to_string(n) +
                  " bytes: the file was changed or cut short after signing";
    return out;
  }
  // The gap must be exactly this signature's own /Contents, so no other byte escapes it.
  std::optional<std::string> gap =
      hex_string_value(pdf.substr(static_cast<std::size_t>(out.gap_start),
                                  static_cast<std::size_t>(out.gap_end - out.gap_start)));
  if (!gap || *gap != sig.contents) {
    out.problem = "the bytes left out of the signed range (" + std::to_string(out.gap_start) +
                  " to " + std::to_string(out.gap_end) +
                  ") are not exactly the signature's own /Contents";
    return out;
  }
  std::string content;
  content.reserve(static_cast<std::size_t>(r[1] + r[3]));
  content.append(pdf.substr(0, static_cast<std::size_t>(r[1])));
  content.append(pdf.substr(static_cast<std::size_t>(r[2]), static_cast<std::size_t>(r[3])));
  CmsCheck cms = check_cms_signature(sig.contents, content);
  out.signer_key = cms.signer_key;
  out.signing_time = cms.signing_time;
  out.whole_file = out.covered_end == n;
  if (!cms.valid()) {
    out.problem = out.whole_file
                      ? cms.problem
                      : "the signature claims bytes 0 to " + std::to_string(out.covered_end) +
                            " of " + std::to_string(n) +
                            " only, and does not hold even over them (" + cms.problem + ")";
    return out;
  }
  out.holds_over_range = true;
  if (!out.whole_file) {
    out.problem = "the signature covers bytes 0 to " + std::to_string(out.covered_end) +
                  " only; the " + std::to_string(n - out.covered_end) + " bytes from offset " +
                  std::to_string(out.covered_end) +
                  " on were added after signing (an incremental update or appended data)";
    return out;
  }
  out.valid = true;
  return out;
}

}  // namespace sp::report
