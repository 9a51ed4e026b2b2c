// The signature a weigh-report carries inside its PDF: ISO 32000-1 §12.8 (digital signatures),
// one revision, no incremental update.
//
// Writing: the PDF is made with a signature placeholder (PdfDocument::reserve_signature): an
// invisible signature field on page 1 whose value is the signature dictionary
//   << /Type /Sig /Filter /Adobe.PPKLite /SubFilter /adbe.pkcs7.detached
//      /ByteRange [0 2147483647 2147483647 2147483647] /Contents <00...00> [/M (D:...)] >>
// (§12.8.1 Table 252, §12.8.3.3: a DER PKCS#7/CMS SignedData over the byte ranges, detached).
// sign_pdf_in_place then writes the real /ByteRange (padded with spaces to the placeholder's
// width, so no byte moves): [0 a b n-b] where a..b-1 is exactly the /Contents hex string
// "<...>", and fills that string with the hex of make_cms_signature over bytes 0..a-1 and
// b..n-1, zero-padded. So the signature covers every byte of the file but its own value, and
// anything after byte n (an incremental update, appended bytes) is outside it and detectable.
//
// Reading (check_pdf_signature): the byte range must start at 0, its gap must be exactly a hex
// string whose value is the dictionary's /Contents (read by the PDF parser), and it must end at
// the end of the file; the CMS must hold over the two ranges.
#pragma once
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "report/cms_signature.h"
#include "report/signer.h"

namespace sp::report {

// Bytes reserved for the DER SignedData (its hex string is twice as long). What we write is
// about 680 bytes (one certificate, three signed attributes); 1024 leaves room and costs 2 KB.
inline constexpr std::size_t kSignatureReserve = 1024;
// Each /ByteRange placeholder number: INT32_MAX, the widest number libharu writes, so the real
// offsets (a report is far below 2 GiB) always fit in its width.
inline constexpr const char* kByteRangePlaceholder = "2147483647";

// Fills the placeholder of `pdf` (see above) with a CMS signature by `signer`; signing_time is
// the record's issue time (seconds since 1970, UTC) or none. Throws sp::Error(internal) when
// the placeholder is missing or ambiguous, or the signature does not fit.
void sign_pdf_in_place(std::string& pdf, const Signer& signer,
                       std::optional<std::int64_t> signing_time);

// One signature dictionary as the PDF parser read it (pdf_reader.h).
struct PdfSignatureDict {
  std::string field;                  // the field's /T, for messages
  std::vector<long long> byte_range;  // /ByteRange as read
  std::string contents;               // /Contents, decoded (DER + zero padding)
};

// What one in-file signature proves about `pdf`.
struct PdfSignatureCheck {
  bool valid = false;       // well formed, the CMS holds, and it covers the whole file
  bool whole_file = false;  // ranges are [0, a) and [b, n) with the gap its own /Contents
  // The CMS holds over the ranges it names (valid, or bytes were added after covered_end).
  bool holds_over_range = false;
  std::string problem;      // why not valid, in words (names offsets); empty when valid
  std::string signer_key;   // raw key of the CMS signer, when the CMS parsed
  std::optional<std::int64_t> signing_time;
  long long covered_end = 0;  // end of the signed range (offset of the first byte after it)
  long long gap_start = 0, gap_end = 0;
};
PdfSignatureCheck check_pdf_signature(std::string_view pdf, const PdfSignatureDict& sig);

}  // namespace sp::report
