// CMS SignedData with Ed25519 (see cms_signature.h for the fields and why the one signature is
// made with Signer::sign). OpenSSL 3 CMS, X.509 and ASN.1 APIs; no hand-written DER encoder.
#include "report/cms_signature.h"

#include <openssl/asn1.h>
#include <openssl/bn.h>
#include <openssl/cms.h>
#include <openssl/err.h>
#include <openssl/evp.h>
#include <openssl/objects.h>
#include <openssl/x509.h>
#include <openssl/x509v3.h>

#include <cstdio>
#include <cstring>
#include <ctime>
#include <memory>

#include "core/error.h"

namespace sp::report {
namespace {

template <typename T, void (*Free)(T*)>
struct Deleter {
  void operator()(T* p) const { Free(p); }
};
using X509Ptr = std::unique_ptr<X509, Deleter<X509, X509_free>>;
using CmsPtr = std::unique_ptr<CMS_ContentInfo, Deleter<CMS_ContentInfo, CMS_ContentInfo_free>>;
using PkeyPtr = std::unique_ptr<EVP_PKEY, Deleter<EVP_PKEY, EVP_PKEY_free>>;
using BitsPtr = std::unique_ptr<ASN1_BIT_STRING, Deleter<ASN1_BIT_STRING, ASN1_BIT_STRING_free>>;
using TimePtr = std::unique_ptr<ASN1_TIME, Deleter<ASN1_TIME, ASN1_TIME_free>>;

const unsigned char* ubytes(std::string_view s) {
  return reinterpret_cast<const unsigned char*>(s.data());
}

[[noreturn]] void fail(const std::string& what) {
  ERR_clear_error();
  throw Error(ExitCode::internal, "CMS signature: " + what);
}

// Days from 1970-01-01 to y-m-d in the proleptic Gregorian calendar (H. Hinnant's
// days_from_civil, public domain).
std::int64_t days_from_civil(std::int64_t y, unsigned m, unsigned d) {
  y -= m <= 2;
  const std::int64_t era = (y >= 0 ? y : y - 399) / 400;
  const auto yoe = static_cast<unsigned>(y - era * 400);
  const unsigned doy = (153 * (m + (m > 2 ? -3 : 9)) + 2) / 5 + d - 1;
  const unsigned doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
  return era * 146097 + static_cast<std::int64_t>(doe) - 719468;
}

template <typename F>
std::string der(F&& encode) {
  unsigned char* p = nullptr;
  int n = encode(&p);
  if (n <= 0 || p == nullptr) fail("DER encoding failed");
  std::string out(reinterpret_cast<const char*>(p), static_cast<std::size_t>(n));
  OPENSSL_free(p);
  return out;
}

PkeyPtr public_pkey(std::string_view raw) {
  PkeyPtr key(EVP_PKEY_new_raw_public_key(EVP_PKEY_ED25519, nullptr, ubytes(raw), raw.size()));
  if (!key) fail("not an Ed25519 public key");
  return key;
}

void set_ed25519(const X509_ALGOR* alg) {
  // X509_get0_* hand out const pointers into the certificate we are building; the objects
  // themselves are ours and mutable (OpenSSL's own signing code writes them the same way).
  if (X509_ALGOR_set0(const_cast<X509_ALGOR*>(alg), OBJ_nid2obj(NID_ED25519), V_ASN1_UNDEF,
                      nullptr) != 1) {
    fail("cannot set the Ed25519 algorithm");
  }
}

void set_signature_bits(const ASN1_BIT_STRING* bits, const std::string& sig) {
  auto* b = const_cast<ASN1_BIT_STRING*>(bits);
  if (ASN1_BIT_STRING_set(b, const_cast<unsigned char*>(ubytes(sig)),
                          static_cast<int>(sig.size())) != 1) {
    fail("cannot store the certificate signature");
  }
  // No unused bits (as OpenSSL's ASN1_item_sign leaves a signature).
  b->flags &= ~(ASN1_STRING_FLAG_BITS_LEFT | 0x07);
  b->flags |= ASN1_STRING_FLAG_BITS_LEFT;
}

// The station certificate of cms_signature.h, signed with `signer`.
X509Ptr station_certificate(const Signer& signer, EVP_PKEY* key, std::int64_t not_before) {
  const std::string pub = signer.public_key();
  X509Ptr x(X509_new());
  if (!x || X509_set_version(x.get(), 2) != 1) fail("cannot make a certificate");
  unsigned char serial[8];
  std::memcpy(serial, sha256(pub).data(), sizeof serial);
  serial[0] &= 0x7f;  // a positive INTEGER of at most 20 octets (RFC 5280 §4.1.2.2)
  BIGNUM* bn = BN_bin2bn(serial, sizeof serial, nullptr);
  bool ok = bn != nullptr && BN_to_ASN1_INTEGER(bn, X509_get_serialNumber(x.get())) != nullptr;
  BN_free(bn);
  if (!ok) fail("cannot set the serial number");
  const std::string fp = fingerprint(pub);
  const std::string cn = "scaleproof station key " + fp.substr(0, 19);
  X509_NAME* name = X509_get_subject_name(x.get());
  if (X509_NAME_add_entry_by_NID(name, NID_commonName, MBSTRING_UTF8, ubytes(cn),
                                 static_cast<int>(cn.size()), -1, 0) != 1 ||
      X509_set_issuer_name(x.get(), name) != 1) {
    fail("cannot set the certificate's name");
  }
  // The SubjectPublicKeyInfo set from the raw key (RFC 8410 §4: id-Ed25519, no parameters):
  // X509_set_pubkey would start OpenSSL's encoder framework, a tenth of a report's instructions.
  (void)key;
  auto* spki_key = static_cast<unsigned char*>(OPENSSL_memdup(pub.data(), pub.size()));
  if (spki_key == nullptr ||
      X509_PUBKEY_set0_param(X509_get_X509_PUBKEY(x.get()), OBJ_nid2obj(NID_ED25519), V_ASN1_UNDEF,
                             nullptr, spki_key, static_cast<int>(pub.size())) != 1) {
    OPENSSL_free(spki_key);
    fail("cannot set the certificate's key");
  }
  if (ASN1_TIME_set(X509_getm_notBefore(x.get()), static_cast<time_t>(not_before)) == nullptr ||
      ASN1_TIME_set_string(X509_getm_notAfter(x.get()), "99991231235959Z") != 1) {
    fail("cannot set the certificate's validity or key");
  }
  BitsPtr usage(ASN1_BIT_STRING_new());
  if (!usage || ASN1_BIT_STRING_set_bit(usage.get(), 0, 1) != 1 ||  // digitalSignature
      ASN1_BIT_STRING_set_bit(usage.get(), 1, 1) != 1 ||            // nonRepudiation
      X509_add1_ext_i2d(x.get(), NID_key_usage, usage.get(), 1, X509V3_ADD_DEFAULT) != 1) {
    fail("cannot add the key usage");
  }
  set_ed25519(X509_get0_tbs_sigalg(x.get()));
  const ASN1_BIT_STRING* sig_bits = nullptr;
  const X509_ALGOR* sig_alg = nullptr;
  X509_get0_signature(&sig_bits, &sig_alg, x.get());
  set_ed25519(sig_alg);
  const std::string tbs = der([&](unsigned char** p) { return i2d_re_X509_tbs(x.get(), p); });
  set_signature_bits(sig_bits, signer.sign(tbs));
  // Read back from its DER: that decodes the key into the certificate's EVP_PKEY, which
  // CMS_add1_signer compares with the signer's (set0_param alone leaves it empty).
  const std::string encoded = der([&](unsigned char** p) { return i2d_X509(x.get(), p); });
  const unsigned char* p = ubytes(encoded);
  X509Ptr back(d2i_X509(nullptr, &p, static_cast<long>(encoded.size())));
  if (!back) fail("cannot read back the certificate");
  return back;
}

// One TLV of a DER buffer.
struct Tlv {
  const unsigned char* start = nullptr;
  const unsigned char* body = nullptr;
  long length = 0;
  int tag = 0, cls = 0;
  bool constructed = false;
  const unsigned char* end() const { return body + length; }
};

// Reads the TLV at `p` (definite length, within `stop`); false on anything else.
bool read_tlv(const unsigned char* p, const unsigned char* stop, Tlv& out) {
  if (p >= stop) return false;
  const unsigned char* q = p;
  long len = 0;
  int tag = 0, cls = 0;
  int r = ASN1_get_object(&q, &len, &tag, &cls, stop - p);
  if ((r & 0x80) != 0 || r == 0x21) return false;  // error, or indefinite length
  if (len < 0 || len > stop - q) return false;
  out = {p, q, len, tag, cls, (r & V_ASN1_CONSTRUCTED) != 0};
  return true;
}

// The DER the SignerInfo's signature covers: its signedAttrs [0] with the tag of a SET OF
// (RFC 5652 §5.4), read from the encoding itself. nullopt when the structure is not the one
// make_cms_signature writes (a SignedData with its SignerInfo's signed attributes).
// `digest_set`, when given, receives the SignedData's digestAlgorithms SET (its whole TLV).
std::optional<std::string> signed_attributes(std::string_view der_bytes,
                                             std::string* digest_set = nullptr) {
  const unsigned char* const stop = ubytes(der_bytes) + der_bytes.size();
  Tlv t;
  // ContentInfo ::= SEQUENCE { contentType, [0] EXPLICIT SignedData }
  if (!read_tlv(ubytes(der_bytes), stop, t) || t.tag != V_ASN1_SEQUENCE) return std::nullopt;
  const unsigned char* in_end = t.end();
  Tlv oid, wrap, sd;
  if (!read_tlv(t.body, in_end, oid) || oid.tag != V_ASN1_OBJECT) return std::nullopt;
  if (!read_tlv(oid.end(), in_end, wrap) || wrap.cls != V_ASN1_CONTEXT_SPECIFIC || wrap.tag != 0)
    return std::nullopt;
  if (!read_tlv(wrap.body, wrap.end(), sd) || sd.tag != V_ASN1_SEQUENCE) return std::nullopt;
  // SignedData ::= SEQUENCE { version, digestAlgorithms SET, encapContentInfo,
  //                           [0] certificates OPTIONAL, [1] crls OPTIONAL, signerInfos SET }
  const unsigned char* p = sd.body;
  Tlv f, dset;
  for (int skip = 0; skip < 3; ++skip) {
    if (!read_tlv(p, sd.end(), f)) return std::nullopt;
    if (skip == 1) dset = f;
    p = f.end();
  }
  while (read_tlv(p, sd.end(), f) && f.cls == V_ASN1_CONTEXT_SPECIFIC) p = f.end();
  if (!read_tlv(p, sd.end(), f) || f.tag != V_ASN1_SET || f.cls != V_ASN1_UNIVERSAL)
    return std::nullopt;
  Tlv si;
  if (!read_tlv(f.body, f.end(), si) || si.tag != V_ASN1_SEQUENCE) return std::nullopt;
  // SignerInfo ::= SEQUENCE { version, sid, digestAlgorithm, [0] signedAttrs, ... }
  p = si.body;
  for (int skip = 0; skip < 3; ++skip) {
    if (!read_tlv(p, si.end(), f)) return std::nullopt;
    p = f.end();
  }
  if (!read_tlv(p, si.end(), f) || f.cls != V_ASN1_CONTEXT_SPECIFIC || f.tag != 0 || !f.constructed)
    return std::nullopt;
  if (digest_set != nullptr)
    *digest_set = std::string(reinterpret_cast<const char*>(dset.start),
                              static_cast<std::size_t>(dset.end() - dset.start));
  std::string out(reinterpret_cast<const char*>(f.start),
                  static_cast<std::size_t>(f.end() - f.start));
  out[0] = static_cast<char>(V_ASN1_SET | V_ASN1_CONSTRUCTED);  // [0] IMPLICIT -> SET OF
  return out;
}

// DER of SET { AlgorithmIdentifier { id-sha512 } } (parameters absent, RFC 5754 §2).
std::string sha512_set() {
  static const std::string set = [] {
    X509_ALGOR* a = X509_ALGOR_new();
    X509_ALGOR_set_md(a, EVP_sha512());
    std::string alg = der([&](unsigned char** p) { return i2d_X509_ALGOR(a, p); });
    X509_ALGOR_free(a);
    return std::string(1, static_cast<char>(V_ASN1_SET | V_ASN1_CONSTRUCTED)) +
           static_cast<char>(alg.size()) + alg;
  }();
  return set;
}

std::string sha512(std::string_view data) {
  std::string out(64, '\0');
  unsigned int len = 0;
  if (EVP_Digest(data.data(), data.size(), reinterpret_cast<unsigned char*>(out.data()), &len,
                 EVP_sha512(), nullptr) != 1 ||
      len != 64) {
    fail("SHA-512 failed");
  }
  return out;
}

std::optional<std::int64_t> asn1_seconds(const ASN1_TIME* t) {
  struct tm tm {};
  if (t == nullptr || ASN1_TIME_to_tm(t, &tm) != 1) return std::nullopt;
  return days_from_civil(tm.tm_year + 1900, static_cast<unsigned>(tm.tm_mon + 1),
                         static_cast<unsigned>(tm.tm_mday)) *
             86400 +
         tm.tm_hour * 3600 + tm.tm_min * 60 + tm.tm_sec;
}

}  // namespace

std::optional<std::int64_t> iso_utc_seconds(std::string_view iso) {
  const std::string s(iso);
  int y = 0, mo = 0, d = 0, h = 0, mi = 0, sec = 0, n = 0;
  if (s.size() < 19 ||
      std::sscanf(s.c_str(), "%4d-%2d-%2dT%2d:%2d:%2d%n", &y, &mo, &d, &h, &mi, &sec, &n) != 6 ||
      n != 19 || mo < 1 || mo > 12 || d < 1 || d > 31 || h < 0 || h > 23 || mi < 0 || mi > 59 ||
      sec < 0 || sec > 60) {
    return std::nullopt;
  }
  std::int64_t t = days_from_civil(y, static_cast<unsigned>(mo), static_cast<unsigned>(d)) * 86400 +
                   h * 3600 + mi * 60 + sec;
  const std::string zone = s.substr(19);
  if (zone.empty() || zone == "Z") return t;
  int oh = 0, om = 0, m = 0;
  if (zone.size() != 6 || (zone[0] != '+' && zone[0] != '-') ||
      std::sscanf(zone.c_str() + 1, "%2d:%2d%n", &oh, &om, &m) != 2 || m != 5 || oh < 0 ||
      oh > 23 || om < 0 || om > 59) {
    return std::nullopt;
  }
  const std::int64_t offset = oh * 3600 + om * 60;
  return zone[0] == '+' ? t - offset : t + offset;
}

std::string make_cms_signature(std::string_view content, const Signer& signer,
                               std::optional<std::int64_t> signing_time) {
  PkeyPtr key = public_pkey(signer.public_key());
  X509Ptr cert = station_certificate(signer, key.get(), signing_time.value_or(0));
  const unsigned flags = CMS_PARTIAL | CMS_DETACHED | CMS_BINARY;
  CmsPtr cms(CMS_sign(nullptr, nullptr, nullptr, nullptr, flags));
  if (!cms) fail("cannot start a SignedData");
  // CMS_PARTIAL: OpenSSL adds the signer, its certificate and digest algorithm, but does not
  // sign (see the header); the public key is all CMS_add1_signer needs for that.
  CMS_SignerInfo* si =
      CMS_add1_signer(cms.get(), cert.get(), key.get(), EVP_sha512(), flags | CMS_NOSMIMECAP);
  if (si == nullptr) fail("cannot add the signer");
  X509_ALGOR* sig_alg = nullptr;
  CMS_SignerInfo_get0_algs(si, nullptr, nullptr, nullptr, &sig_alg);
  if (sig_alg == nullptr) fail("no signature algorithm");
  set_ed25519(sig_alg);
  const std::string digest = sha512(content);
  if (CMS_signed_get_attr_by_NID(si, NID_pkcs9_contentType, -1) < 0 &&
      CMS_signed_add1_attr_by_NID(si, NID_pkcs9_contentType, V_ASN1_OBJECT,
                                  OBJ_nid2obj(NID_pkcs7_data), -1) != 1) {
    fail("cannot add the content-type attribute");
  }
  if (CMS_signed_add1_attr_by_NID(si, NID_pkcs9_messageDigest, V_ASN1_OCTET_STRING, ubytes(digest),
                                  static_cast<int>(digest.size())) != 1) {
    fail("cannot add the message-digest attribute");
  }
  if (signing_time) {
    TimePtr t(ASN1_TIME_set(nullptr, static_cast<time_t>(*signing_time)));
    if (!t || CMS_signed_add1_attr_by_NID(si, NID_pkcs9_signingTime, ASN1_STRING_type(t.get()),
                                          t.get(), -1) != 1) {
      fail("cannot add the signing-time attribute");
    }
  }
  const std::string unsigned_der =
      der([&](unsigned char** p) { return i2d_CMS_ContentInfo(cms.get(), p); });
  std::optional<std::string> attrs = signed_attributes(unsigned_der);
  if (!attrs) fail("cannot find the signed attributes in the encoding");
  const std::string sig = signer.sign(*attrs);
  if (ASN1_STRING_set(CMS_SignerInfo_get0_signature(si), sig.data(),
                      static_cast<int>(sig.size())) != 1) {
    fail("cannot store the signature");
  }
  return der([&](unsigned char** p) { return i2d_CMS_ContentInfo(cms.get(), p); });
}

CmsCheck check_cms_signature(std::string_view der_bytes, std::string_view content) {
  CmsCheck out;
  try {
    const unsigned char* p = ubytes(der_bytes);
    CmsPtr cms(d2i_CMS_ContentInfo(nullptr, &p, static_cast<long>(der_bytes.size())));
    if (!cms) {
      out.problem = "the signature is not a DER CMS ContentInfo";
      ERR_clear_error();
      return out;
    }
    for (std::size_t i = static_cast<std::size_t>(p - ubytes(der_bytes)); i < der_bytes.size();
         ++i) {
      if (der_bytes[i] != '\0') {
        out.problem = "bytes other than zero padding follow the CMS signature";
        return out;
      }
    }
    ASN1_OCTET_STRING** econtent = CMS_get0_content(cms.get());
    STACK_OF(CMS_SignerInfo)* infos = CMS_get0_SignerInfos(cms.get());
    if (OBJ_obj2nid(CMS_get0_type(cms.get())) != NID_pkcs7_signed || infos == nullptr ||
        sk_CMS_SignerInfo_num(infos) != 1 || econtent == nullptr || *econtent != nullptr ||
        OBJ_obj2nid(CMS_get0_eContentType(cms.get())) != NID_pkcs7_data) {
      out.problem = "not a detached SignedData of data with exactly one signer";
      ERR_clear_error();
      return out;
    }
    CMS_SignerInfo* si = sk_CMS_SignerInfo_value(infos, 0);
    CMS_set1_signers_certs(cms.get(), nullptr, 0);
    ERR_clear_error();
    X509* cert = nullptr;
    X509_ALGOR *dig = nullptr, *sig_alg = nullptr;
    CMS_SignerInfo_get0_algs(si, nullptr, &cert, &dig, &sig_alg);
    if (dig == nullptr || sig_alg == nullptr || OBJ_obj2nid(dig->algorithm) != NID_sha512 ||
        OBJ_obj2nid(sig_alg->algorithm) != NID_ED25519) {
      out.problem = "the signer does not use Ed25519 with SHA-512 (RFC 8419)";
      return out;
    }
    EVP_PKEY* key = cert ? X509_get0_pubkey(cert) : nullptr;
    std::string raw(kPublicKeySize, '\0');
    std::size_t raw_len = raw.size();
    if (key == nullptr || EVP_PKEY_get_id(key) != EVP_PKEY_ED25519 ||
        EVP_PKEY_get_raw_public_key(key, reinterpret_cast<unsigned char*>(raw.data()), &raw_len) !=
            1 ||
        raw_len != kPublicKeySize) {
      out.problem = "no Ed25519 certificate of the signer inside the signature";
      ERR_clear_error();
      return out;
    }
    // The certificate only carries the key, but nothing in it may change either: it must be
    // self-signed by that key, as make_cms_signature writes it.
    if (X509_verify(cert, key) != 1) {
      out.problem = "the certificate inside the signature is not self-signed by its key";
      ERR_clear_error();
      return out;
    }
    out.signer_key = raw;
    const auto* ctype = static_cast<const ASN1_OBJECT*>(
        CMS_signed_get0_data_by_OBJ(si, OBJ_nid2obj(NID_pkcs9_contentType), -3, V_ASN1_OBJECT));
    const auto* md = static_cast<const ASN1_OCTET_STRING*>(CMS_signed_get0_data_by_OBJ(
        si, OBJ_nid2obj(NID_pkcs9_messageDigest), -3, V_ASN1_OCTET_STRING));
    std::string digest_set;
    std::optional<std::string> attrs = signed_attributes(der_bytes, &digest_set);
    // The SignedData's list of digest algorithms is a processing hint outside the signature;
    // it must still be exactly {id-sha512} (RFC 8419 §3.1), so no byte of the file is free.
    if (attrs && digest_set != sha512_set()) {
      out.problem = "the SignedData's digest algorithms are not exactly SHA-512";
      return out;
    }
    if (ctype == nullptr || OBJ_obj2nid(ctype) != NID_pkcs7_data || md == nullptr || !attrs) {
      out.problem = "the signed attributes lack the content type or the message digest";
      ERR_clear_error();
      return out;
    }
    const ASN1_OBJECT* st = OBJ_nid2obj(NID_pkcs9_signingTime);
    const void* t = CMS_signed_get0_data_by_OBJ(si, st, -3, V_ASN1_UTCTIME);
    if (t == nullptr) t = CMS_signed_get0_data_by_OBJ(si, st, -3, V_ASN1_GENERALIZEDTIME);
    out.signing_time = asn1_seconds(static_cast<const ASN1_TIME*>(t));
    out.parsed = true;
    const std::string digest = sha512(content);
    out.digest_ok = ASN1_STRING_length(md) == 64 &&
                    std::memcmp(ASN1_STRING_get0_data(md), digest.data(), 64) == 0;
    const ASN1_OCTET_STRING* sig = CMS_SignerInfo_get0_signature(si);
    out.signature_ok =
        sig != nullptr &&
        verifier_from_raw(raw)->verify(
            *attrs, std::string_view(reinterpret_cast<const char*>(ASN1_STRING_get0_data(sig)),
                                     static_cast<std::size_t>(ASN1_STRING_length(sig))));
    if (!out.signature_ok) {
      out.problem = "the Ed25519 signature of the signed attributes does not hold";
    } else if (!out.digest_ok) {
      out.problem =
          "the signed bytes changed after signing: their SHA-512 is not the signed message digest";
    }
  } catch (const std::exception& e) {
    out.parsed = false;
    out.problem = std::string("cannot check the signature: ") + e.what();
  }
  ERR_clear_error();
  return out;
}

}  // namespace sp::report
