// Binary form of an ItemAudit (item_codec.h): little-endian fixed-width integers, strings as a
// u32 length and bytes, optionals as a u8 flag.
#include "audit/item_codec.h"

#include <cstdint>
#include <cstring>

#include "core/error.h"

namespace sp::audit {
namespace {

// A field added to ItemAudit, Finding or EvidenceValue must be added to encode/decode below,
// or the streamed audit would silently drop it: these sizes (g++ 12, x86-64) make the build
// fail first. Update them together with the codec.
static_assert(sizeof(EvidenceValue) == 3 * sizeof(std::string) + 16, "update item_codec");
static_assert(sizeof(Finding) == 3 * sizeof(std::string) + 8 +
                                     2 * sizeof(std::optional<std::string>) +
                                     sizeof(std::vector<EvidenceValue>),
              "update item_codec");
static_assert(sizeof(ItemAudit) == 8 + 4 * sizeof(std::string) + 24 + sizeof(std::vector<Finding>),
              "update item_codec");

template <typename T>
void put_raw(std::string& out, T v) {
  char b[sizeof(T)];
  std::memcpy(b, &v, sizeof(T));
  out.append(b, sizeof(T));
}

void put_str(std::string& out, const std::string& s) {
  put_raw(out, static_cast<std::uint32_t>(s.size()));
  out += s;
}

void put_opt(std::string& out, const std::optional<std::string>& s) {
  put_raw(out, static_cast<std::uint8_t>(s ? 1 : 0));
  if (s) put_str(out, *s);
}

class Reader {
 public:
  explicit Reader(std::string_view b) : b_(b) {}
  template <typename T>
  T raw() {
    need(sizeof(T));
    T v;
    std::memcpy(&v, b_.data() + at_, sizeof(T));
    at_ += sizeof(T);
    return v;
  }
  std::string str() {
    const auto n = raw<std::uint32_t>();
    need(n);
    std::string s(b_.substr(at_, n));
    at_ += n;
    return s;
  }
  std::optional<std::string> opt() {
    if (raw<std::uint8_t>() == 0) return std::nullopt;
    return str();
  }
  bool done() const { return at_ == b_.size(); }

 private:
  void need(std::size_t n) const {
    if (b_.size() - at_ < n) {
      throw Error(ExitCode::io_error, "audit: a temporary file's record is truncated");
    }
  }
  std::string_view b_;
  std::size_t at_ = 0;
};

}  // namespace

void encode_item(const ItemAudit& ia, std::string& out) {
  put_raw(out, ia.index);
  put_str(out, ia.source);
  put_str(out, ia.claim);
  put_raw(out, static_cast<std::uint8_t>(ia.kind));
  put_str(out, ia.label);
  put_raw(out, static_cast<std::uint8_t>(ia.verdict));
  put_str(out, ia.verdict_reason);
  put_raw(out, static_cast<std::uint8_t>(ia.weight_unit));
  put_raw(out, static_cast<std::uint32_t>(ia.findings.size()));
  for (const auto& f : ia.findings) {
    put_str(out, f.code);
    put_raw(out, static_cast<std::uint8_t>(f.severity));
    put_str(out, f.message);
    put_opt(out, f.ticket);
    put_opt(out, f.platform);
    put_raw(out, static_cast<std::uint32_t>(f.values.size()));
    for (const auto& v : f.values) {
      put_str(out, v.name);
      put_str(out, v.text);
      put_raw(out, static_cast<std::uint8_t>(v.number ? 1 : 0));
      if (v.number) put_raw(out, *v.number);
      put_str(out, v.unit);
    }
    put_str(out, f.rule);
  }
}

ItemAudit decode_item(std::string_view bytes) {
  Reader r(bytes);
  ItemAudit ia;
  ia.index = r.raw<std::uint32_t>();
  ia.source = r.str();
  ia.claim = r.str();
  ia.kind = static_cast<ItemKind>(r.raw<std::uint8_t>());
  ia.label = r.str();
  ia.verdict = static_cast<Verdict>(r.raw<std::uint8_t>());
  ia.verdict_reason = r.str();
  ia.weight_unit = static_cast<WeightUnit>(r.raw<std::uint8_t>());
  const auto nf = r.raw<std::uint32_t>();
  ia.findings.reserve(nf);
  for (std::uint32_t i = 0; i < nf; ++i) {
    Finding f;
    f.code = r.str();
    f.severity = static_cast<Severity>(r.raw<std::uint8_t>());
    f.message = r.str();
    f.ticket = r.opt();
    f.platform = r.opt();
    const auto nv = r.raw<std::uint32_t>();
    f.values.reserve(nv);
    for (std::uint32_t k = 0; k < nv; ++k) {
      EvidenceValue v;
      v.name = r.str();
      v.text = r.str();
      if (r.raw<std::uint8_t>() != 0) v.number = r.raw<double>();
      v.unit = r.str();
      f.values.push_back(std::move(v));
    }
    f.rule = r.str();
    ia.findings.push_back(std::move(f));
  }
  if (!r.done()) throw Error(ExitCode::io_error, "audit: a temporary file's record is malformed");
  return ia;
}

}  // namespace sp::audit
