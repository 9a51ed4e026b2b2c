// libharu side of the in-file signature (report/pdf_signature.h): adds the placeholder
// signature dictionary, its invisible field on the first page and the catalog's /AcroForm
// (ISO 32000-1 §12.7.2, §12.7.4.5, §12.8) through libharu's object layer. Internal to
// pdf_doc.cpp; errors are left in the document's error state for its caller to check.
#pragma once
#include <hpdf.h>

#include <optional>

namespace sp::report {

// `signing_time`: the /M entry, or none. Call once, after the first page exists.
void hpdf_reserve_signature(HPDF_Doc pdf, const std::optional<HPDF_Date>& signing_time);

}  // namespace sp::report
