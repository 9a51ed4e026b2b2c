// Reads a weigh-report PDF back: its embedded files (attachments) and its signature
// dictionaries, with qpdf (libqpdf 11), so any valid arrangement of the same objects reads
// alike: key order, object streams, compressed or uncompressed streams, a `qpdf` rewrite.
//
// Safe on untrusted bytes: never throws (a parse failure is `problem`), prints nothing (qpdf's
// warnings suppressed), and decodes an attachment only up to kMaxAttachmentBytes, so a
// compressed stream cannot inflate without bound. It says what is in the file, not whether
// the file is intact: that is what the signatures are for (pdf_signature.h).
#pragma once
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "report/pdf_signature.h"

namespace sp::report {

// A weigh record is a few kilobytes; 16 MiB bounds a hostile compressed stream.
inline constexpr std::size_t kMaxAttachmentBytes = 16u << 20;

struct PdfAttachment {
  std::string name;                  // the embedded-files name-tree key
  std::optional<std::string> bytes;  // nullopt: unreadable or over the limit
};

struct PdfContents {
  bool parsed = false;
  std::string problem;  // why the PDF could not be read, when !parsed
  std::vector<PdfAttachment> attachments;
  std::vector<PdfSignatureDict> signatures;  // every signature field with a value, in order
};

bool looks_like_pdf(std::string_view bytes);
PdfContents read_pdf(std::string_view pdf);

// The bytes of the attachment called `name` in `contents` or in `pdf`, or nullopt when there is
// none, it cannot be read, or two attachments have that name.
std::optional<std::string> find_attachment(const PdfContents& contents, std::string_view name);
std::optional<std::string> find_attachment(std::string_view pdf, std::string_view name);

}  // namespace sp::report
