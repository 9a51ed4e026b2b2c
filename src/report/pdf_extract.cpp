#include "report/pdf_extract.h"

// qpdf 11: PointerHolder is not used here (POINTERHOLDER_TRANSITION 4: std::shared_ptr only).
#define POINTERHOLDER_TRANSITION 4
#include <qpdf/Pipeline.hh>
#include <qpdf/QPDF.hh>
#include <qpdf/QPDFAcroFormDocumentHelper.hh>
#include <qpdf/QPDFEmbeddedFileDocumentHelper.hh>
#include <qpdf/QPDFFileSpecObjectHelper.hh>
#include <qpdf/QPDFFormFieldObjectHelper.hh>
#include <stdexcept>

namespace sp::report {
namespace {

// Collects a stream's decoded bytes, refusing more than `cap`.
class CappedBuffer : public Pipeline {
 public:
  explicit CappedBuffer(std::size_t cap) : Pipeline("capped buffer", nullptr), cap_(cap) {}
  void write(unsigned char const* data, size_t len) override {
    if (len > cap_ - out_.size()) throw std::length_error("attachment larger than the limit");
    out_.append(reinterpret_cast<const char*>(data), len);
  }
  void finish() override {}
  std::string take() { return std::move(out_); }

 private:
  std::size_t cap_;
  std::string out_;
};

std::optional<std::string> stream_bytes(QPDFObjectHandle stream) {
  if (!stream.isStream()) return std::nullopt;
  try {
    CappedBuffer buf(kMaxAttachmentBytes);
    bool filtered = false;
    if (!stream.pipeStreamData(&buf, &filtered, 0, qpdf_dl_generalized, true, false)) {
      return std::nullopt;
    }
    return buf.take();
  } catch (const std::exception&) {
    return std::nullopt;
  }
}

std::optional<PdfSignatureDict> signature_of(QPDFFormFieldObjectHelper& field) {
  QPDFObjectHandle v = field.getValue();
  if (!v.isDictionary()) return std::nullopt;
  PdfSignatureDict sig;
  sig.field = field.getFullyQualifiedName();
  QPDFObjectHandle range = v.getKey("/ByteRange");
  if (range.isArray()) {
    for (QPDFObjectHandle n : range.getArrayAsVector()) {
      sig.byte_range.push_back(n.isInteger() ? n.getIntValue() : -1);
    }
  }
  QPDFObjectHandle contents = v.getKey("/Contents");
  if (contents.isString()) sig.contents = contents.getStringValue();
  return sig;
}

}  // namespace

bool looks_like_pdf(std::string_view bytes) {
  // The header only: a file cut short (no %%EOF) is still read (qpdf recovers what it can),
  // so verification can say the signed range runs past its end.
  return bytes.substr(0, 5) == "%PDF-";
}

PdfContents read_pdf(std::string_view pdf) {
  PdfContents out;
  if (!looks_like_pdf(pdf)) {
    out.problem = "no %PDF- header";
    return out;
  }
  try {
    QPDF q;
    q.setSuppressWarnings(true);
    q.processMemoryFile("report", pdf.data(), pdf.size());
    QPDFEmbeddedFileDocumentHelper files(q);
    for (auto& [name, spec] : files.getEmbeddedFiles()) {
      out.attachments.push_back({name, stream_bytes(spec->getEmbeddedFileStream())});
    }
    QPDFAcroFormDocumentHelper form(q);
    for (QPDFFormFieldObjectHelper& field : form.getFormFields()) {
      if (field.getFieldType() != "/Sig") continue;
      if (auto sig = signature_of(field)) out.signatures.push_back(std::move(*sig));
    }
    out.parsed = true;
  } catch (const std::exception& e) {
    out = PdfContents{};
    out.problem = e.what();
  } catch (...) {
    out = PdfContents{};
    out.problem = "unreadable PDF";
  }
  return out;
}

std::optional<std::string> find_attachment(const PdfContents& contents, std::string_view name) {
  const PdfAttachment* found = nullptr;
  for (const auto& a : contents.attachments) {
    if (a.name != name) continue;
    if (found != nullptr) return std::nullopt;  // ambiguous
    found = &a;
  }
  return found ? found->bytes : std::nullopt;
}

std::optional<std::string> find_attachment(std::string_view pdf, std::string_view name) {
  return find_attachment(read_pdf(pdf), name);
}

}  // namespace sp::report
