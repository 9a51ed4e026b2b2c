#include "report/hpdf_signature.h"

#include <hpdf_doc.h>
#include <hpdf_objects.h>

#include <cstdio>
#include <cstdlib>
#include <string>

#include "report/pdf_signature.h"

namespace sp::report {
namespace {

HPDF_Array number_array(HPDF_MMgr mmgr, std::initializer_list<HPDF_INT32> values) {
  HPDF_Array a = HPDF_Array_New(mmgr);
  if (a == nullptr) return nullptr;
  for (HPDF_INT32 v : values) HPDF_Array_AddNumber(a, v);
  return a;
}

// ISO 32000-1 §7.9.4 date string: D:YYYYMMDDHHmmSSOHH'mm'.
std::string pdf_date(const HPDF_Date& d) {
  char buf[32];
  if (d.off_hour == 0 && d.off_minutes == 0) {
    std::snprintf(buf, sizeof buf, "D:%04d%02d%02d%02d%02d%02dZ", d.year, d.month, d.day, d.hour,
                  d.minutes, d.seconds);
  } else {
    std::snprintf(buf, sizeof buf, "D:%04d%02d%02d%02d%02d%02d%c%02d'%02d'", d.year, d.month, d.day,
                  d.hour, d.minutes, d.seconds, d.ind, d.off_hour, d.off_minutes);
  }
  return buf;
}

}  // namespace

void hpdf_reserve_signature(HPDF_Doc pdf, const std::optional<HPDF_Date>& signing_time) {
  HPDF_MMgr mmgr = pdf->mmgr;
  HPDF_Page page = HPDF_GetPageByIndex(pdf, 0);
  if (page == nullptr) return;  // the error state says why

  // The signature dictionary (§12.8.1 Table 252), an indirect object.
  HPDF_Dict sig = HPDF_Dict_New(mmgr);
  if (sig == nullptr || HPDF_Xref_Add(pdf->xref, sig) != HPDF_OK) return;
  HPDF_Dict_AddName(sig, "Type", "Sig");
  HPDF_Dict_AddName(sig, "Filter", "Adobe.PPKLite");
  HPDF_Dict_AddName(sig, "SubFilter", "adbe.pkcs7.detached");
  const auto wide = static_cast<HPDF_INT32>(std::strtol(kByteRangePlaceholder, nullptr, 10));
  HPDF_Dict_Add(sig, "ByteRange", number_array(mmgr, {0, wide, wide, wide}));
  const std::string zeros(kSignatureReserve, '\0');
  HPDF_Dict_Add(sig, "Contents",
                HPDF_Binary_New(mmgr, reinterpret_cast<HPDF_BYTE*>(const_cast<char*>(zeros.data())),
                                static_cast<HPDF_UINT>(zeros.size())));
  if (signing_time) {
    HPDF_Dict_Add(sig, "M", HPDF_String_New(mmgr, pdf_date(*signing_time).c_str(), nullptr));
  }

  // Its field, merged with an invisible widget annotation on page 1 (§12.7.4.5, §12.5.6.19):
  // zero rectangle, flags Print (4) + Locked (128).
  HPDF_Dict field = HPDF_Dict_New(mmgr);
  if (field == nullptr || HPDF_Xref_Add(pdf->xref, field) != HPDF_OK) return;
  HPDF_Dict_AddName(field, "FT", "Sig");
  HPDF_Dict_Add(field, "T", HPDF_String_New(mmgr, "station signature", nullptr));
  HPDF_Dict_Add(field, "V", sig);
  HPDF_Dict_AddName(field, "Type", "Annot");
  HPDF_Dict_AddName(field, "Subtype", "Widget");
  HPDF_Dict_Add(field, "Rect", number_array(mmgr, {0, 0, 0, 0}));
  HPDF_Dict_AddNumber(field, "F", 132);
  HPDF_Dict_Add(field, "P", page);
  auto* annots = static_cast<HPDF_Array>(HPDF_Dict_GetItem(page, "Annots", HPDF_OCLASS_ARRAY));
  if (annots == nullptr) {
    annots = HPDF_Array_New(mmgr);
    HPDF_Dict_Add(page, "Annots", annots);
  }
  HPDF_Array_Add(annots, field);

  // The document's interactive form (§12.7.2): SigFlags 3 = SignaturesExist + AppendOnly.
  HPDF_Dict form = HPDF_Dict_New(mmgr);
  HPDF_Array fields = HPDF_Array_New(mmgr);
  if (form == nullptr || fields == nullptr) return;
  HPDF_Array_Add(fields, field);
  HPDF_Dict_Add(form, "Fields", fields);
  HPDF_Dict_AddNumber(form, "SigFlags", 3);
  HPDF_Dict_Add(pdf->catalog, "AcroForm", form);
}

}  // namespace sp::report
