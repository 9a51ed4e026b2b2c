// Ed25519 signing (RFC 8032) behind a small interface, so callers and tests work in memory.
//
// Keys: a raw Ed25519 public key is 32 bytes, a signature 64 bytes (RFC 8032 §5.1.5, §5.1.6).
// Key files are PEM: the private key as unencrypted PKCS#8, the public key as
// SubjectPublicKeyInfo ("BEGIN PUBLIC KEY"), so stock `openssl pkeyutl` reads them.
// Fingerprint: SHA-256 (FIPS 180-4) of the raw 32-byte public key, lower-case hex, in groups
// of 4 characters separated by spaces (16 groups), for reading aloud over the phone.
// Errors: malformed PEM or a key that is not Ed25519 throws sp::Error(data_error).
#pragma once
#include <memory>
#include <string>
#include <string_view>

namespace sp::report {

inline constexpr std::size_t kPublicKeySize = 32;
inline constexpr std::size_t kSignatureSize = 64;

class Signer {
 public:
  virtual ~Signer() = default;
  // 64-byte raw Ed25519 signature of `message` (PureEd25519: the message itself, no prehash).
  virtual std::string sign(std::string_view message) const = 0;
  // The matching raw 32-byte public key.
  virtual std::string public_key() const = 0;
};

class Verifier {
 public:
  virtual ~Verifier() = default;
  // True when `signature` is a valid signature of `message`; false for any malformed input.
  virtual bool verify(std::string_view message, std::string_view signature) const = 0;
  virtual std::string public_key() const = 0;  // raw 32 bytes
};

// A signer from a 32-byte secret seed (RFC 8032 §5.1.5 "private key").
std::unique_ptr<Signer> signer_from_seed(std::string_view seed32);
// A signer from a PEM private key; `source` names the file in error messages.
std::unique_ptr<Signer> signer_from_pem(std::string_view pem, const std::string& source);
// A verifier from a raw 32-byte public key (throws data_error on a wrong size).
std::unique_ptr<Verifier> verifier_from_raw(std::string_view public_key32);
// A verifier from a PEM public key; `source` names the file in error messages.
std::unique_ptr<Verifier> verifier_from_pem(std::string_view pem, const std::string& source);

// A fresh key pair from the operating system's random source (OpenSSL's CSPRNG).
struct KeyPairPem {
  std::string private_pem;  // PKCS#8
  std::string public_pem;   // SubjectPublicKeyInfo
};
KeyPairPem generate_key_pair();
// PEM (SubjectPublicKeyInfo) for a raw 32-byte public key.
std::string public_key_pem(std::string_view public_key32);

// SHA-256 of `data` (32 raw bytes).
std::string sha256(std::string_view data);
// Lower-case hex of bytes.
std::string to_hex(std::string_view bytes);
// Bytes of a hex string; nullopt-like empty result with ok=false on bad input.
bool from_hex(std::string_view hex, std::string& out);
// "d75a 9801 ..." : SHA-256 of the raw public key in 4-character groups.
std::string fingerprint(std::string_view public_key32);

}  // namespace sp::report
