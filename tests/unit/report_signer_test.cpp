#include <doctest/doctest.h>
#include <openssl/evp.h>

#include "core/error.h"
#include "report/signer.h"

using namespace sp::report;

namespace {
std::string hex(const char* h) {
  std::string out;
  REQUIRE(from_hex(h, out));
  return out;
}
}  // namespace

TEST_CASE("RFC 8032 section 7.1 TEST 1 reproduces byte for byte") {
  // RFC 8032 §7.1 TEST 1 (values copied in shared/notes/references.md).
  auto signer = signer_from_seed(hex("9d61b19deffd5a60ba844af492ec2cc44449c5697b326919703bac031cae7f60"));
  CHECK(to_hex(signer->public_key()) == "d75a980182b10ab7d54bfed3c964073a0ee172f3daa62325af021a68f707511a");
  std::string sig = signer->sign("");
  CHECK(to_hex(sig) ==
        "e5564300c360ac729086e2cc806e828a84877f1eb8e5d974d873e065224901555fb8821590a33bacc61e39701cf9b46b"
        "d25bf5f0595bbe24655141438e7a100b");
  auto verifier = verifier_from_raw(signer->public_key());
  CHECK(verifier->verify("", sig));
  CHECK_FALSE(verifier->verify("x", sig));
}

TEST_CASE("SHA-256 of abc matches FIPS 180-4") {
  // FIPS 180-4 example "abc" (shared/notes/references.md).
  CHECK(to_hex(sha256("abc")) == "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
}

TEST_CASE("fingerprint is SHA-256 of the raw public key in 4-character groups") {
  std::string pk = hex("d75a980182b10ab7d54bfed3c964073a0ee172f3daa62325af021a68f707511a");
  std::string fp = fingerprint(pk);
  CHECK(fp.size() == 64 + 15);
  std::string joined;
  for (char c : fp) {
    if (c != ' ') joined += c;
  }
  CHECK(joined == to_hex(sha256(pk)));
  CHECK(fp[4] == ' ');
}

TEST_CASE("PEM key pair round-trips and signs verifiably") {
  KeyPairPem pair = generate_key_pair();
  CHECK(pair.private_pem.find(std::string("BEGIN PRIVATE") + " KEY") != std::string::npos);
  CHECK(pair.public_pem.find("BEGIN PUBLIC KEY") != std::string::npos);
  auto signer = signer_from_pem(pair.private_pem, "station.key");
  auto verifier = verifier_from_pem(pair.public_pem, "station.pub.pem");
  CHECK(signer->public_key() == verifier->public_key());
  CHECK(public_key_pem(signer->public_key()) == pair.public_pem);
  std::string msg = "weigh record";
  CHECK(verifier->verify(msg, signer->sign(msg)));
  auto other = verifier_from_pem(generate_key_pair().public_pem, "other.pub.pem");
  CHECK_FALSE(other->verify(msg, signer->sign(msg)));
}

TEST_CASE("verifier rejects malformed signatures without throwing") {
  auto signer = signer_from_seed(std::string(32, '\x01'));
  auto verifier = verifier_from_raw(signer->public_key());
  std::string sig = signer->sign("m");
  struct Case {
    const char* what;
    std::string sig;
  };
  for (const Case& c : {Case{"empty", ""}, Case{"short", sig.substr(0, 63)}, Case{"long", sig + "x"},
                        Case{"zeros", std::string(64, '\0')}, Case{"flipped", std::string(1, static_cast<char>(sig[0] ^ 1)) + sig.substr(1)}}) {
    CAPTURE(c.what);
    CHECK_FALSE(verifier->verify("m", c.sig));
  }
}

TEST_CASE("bad PEM is a data error naming the file") {
  struct Case {
    const char* what;
    std::string pem;
  };
  // A PEM armour around garbage, built here so no key-shaped block sits in the source.
  const std::string armour = std::string("PRIVATE") + " KEY-----";
  std::string rsa_like = "-----BEGIN " + armour + "\nAAAA\n-----END " + armour + "\n";
  for (const Case& c : {Case{"empty", ""}, Case{"garbage", "hello"}, Case{"bad body", rsa_like},
                        Case{"public as private", generate_key_pair().public_pem}}) {
    CAPTURE(c.what);
    try {
      signer_from_pem(c.pem, "keys/station.key");
      FAIL("expected an error");
    } catch (const sp::Error& e) {
      CHECK(e.code() == sp::ExitCode::data_error);
      CHECK(std::string(e.what()).find("keys/station.key") != std::string::npos);
    }
  }
}

namespace {
// PEM armour of a PKCS #8 private key around `der` (RFC 7468 §10), one base64 line per 64
// characters as OpenSSL writes it.
std::string pkcs8_pem(const std::string& der) {
  std::string b64(4 * ((der.size() + 2) / 3) + 1, '\0');
  int n = EVP_EncodeBlock(reinterpret_cast<unsigned char*>(b64.data()),
                          reinterpret_cast<const unsigned char*>(der.data()), static_cast<int>(der.size()));
  b64.resize(static_cast<std::size_t>(n));
  std::string body;
  for (std::size_t i = 0; i < b64.size(); i += 64) body += b64.substr(i, 64) + "\n";
  const std::string armour = std::string("PRIVATE") + " KEY-----";
  return "-----BEGIN " + armour + "\n" + body + "-----END " + armour + "\n";
}
// RFC 8410 §7: PrivateKeyInfo { version 0, AlgorithmIdentifier { oid }, OCTET STRING {
// OCTET STRING seed } } for the 1.3.101.x family (112 = Ed25519, 110 = X25519).
std::string curve_pkcs8(unsigned char oid_last, const std::string& seed32) {
  const unsigned char head[16] = {0x30, 0x2e, 0x02, 0x01, 0x00, 0x30, 0x05, 0x06,
                                  0x03, 0x2b, 0x65, oid_last, 0x04, 0x22, 0x04, 0x20};
  return std::string(reinterpret_cast<const char*>(head), sizeof head) + seed32;
}
}  // namespace

TEST_CASE("RFC 8032 TEST 1 secret read from its RFC 8410 PKCS #8 PEM gives the RFC's public key") {
  // Seed and public key: RFC 8032 §7.1 TEST 1; the PKCS #8 structure: RFC 8410 §7 (its §10.3
  // example has the same 16-byte prefix, "MC4CAQAwBQYDK2VwBCIEI...").
  const std::string pem = pkcs8_pem(curve_pkcs8(0x70, hex("9d61b19deffd5a60ba844af492ec2cc44449c5697b326919703bac031cae7f60")));
  CHECK(pem.substr(28, 20) == "MC4CAQAwBQYDK2VwBCIE");
  auto signer = signer_from_pem(pem, "station.key");
  CHECK(to_hex(signer->public_key()) == "d75a980182b10ab7d54bfed3c964073a0ee172f3daa62325af021a68f707511a");
}

TEST_CASE("the Ed25519 PKCS #8 fast path agrees with OpenSSL's general PEM decoder") {
  // Reference: OpenSSL's PEM_read_bio_PrivateKey, reached by any variation the fast path does
  // not take (here a blank line after the armour, which PEM readers ignore, RFC 7468 §3).
  for (int i = 0; i < 20; ++i) {
    CAPTURE(i);
    KeyPairPem pair = generate_key_pair();
    auto fast = signer_from_pem(pair.private_pem, "station.key");
    auto general = signer_from_pem(pair.private_pem + "\n", "station.key");
    CHECK(fast->public_key() == general->public_key());
    CHECK(fast->sign("weigh record") == general->sign("weigh record"));
  }
  // An X25519 key has the same shape but another algorithm: the fast path declines and the
  // general decoder's answer stands (a data error naming the file).
  try {
    signer_from_pem(pkcs8_pem(curve_pkcs8(0x6e, std::string(32, '\x07'))), "keys/x25519.key");
    FAIL("expected an error");
  } catch (const sp::Error& e) {
    CHECK(e.code() == sp::ExitCode::data_error);
    CHECK(std::string(e.what()).find("keys/x25519.key") != std::string::npos);
  }
}
