// Reads embedded files (attachments) back out of a PDF, as written by pdf_doc.h.
//
// This is a deliberately small reader for untrusted bytes: it never crashes or loops on
// arbitrary input, allocates at most the input's size, and understands only what our writer
// produces: an uncompressed embedded-file stream referenced from a file specification
// "/F (name) ... /EF << /F n g R >>", with /Length direct or indirect. Anything else is
// "not found". It does not tell whether the rest of the file is a valid PDF.
#pragma once
#include <optional>
#include <string>
#include <string_view>

namespace sp::report {

bool looks_like_pdf(std::string_view bytes);
// The bytes of the attachment called `name`, or nullopt when there is none (or it is
// ambiguous: two attachments of that name).
std::optional<std::string> find_attachment(std::string_view pdf, std::string_view name);

}  // namespace sp::report
