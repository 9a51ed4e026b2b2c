#include <doctest/doctest.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cstdlib>

#include "core/error.h"
#include "report/key_files.h"
#include "report/signer.h"

using namespace sp::report;

namespace {
std::string temp_dir() {
  std::string t = "/tmp/sp-keys-XXXXXX";
  REQUIRE(::mkdtemp(t.data()) != nullptr);
  return t;
}
}  // namespace

TEST_CASE("key files: private key mode 0600, public PEM readable, fingerprint matches") {
  std::string dir = temp_dir();
  KeyFiles f = create_key_files(dir + "/station");
  struct stat st {};
  REQUIRE(::stat(f.private_path.c_str(), &st) == 0);
  CHECK((st.st_mode & 0777) == 0600);
  auto signer = signer_from_pem(read_file_bytes(f.private_path), f.private_path);
  auto verifier = verifier_from_pem(read_file_bytes(f.public_path), f.public_path);
  CHECK(signer->public_key() == verifier->public_key());
  CHECK(f.fingerprint == fingerprint(verifier->public_key()));
  ::unlink(f.private_path.c_str());
  ::unlink(f.public_path.c_str());
  ::rmdir(dir.c_str());
}

TEST_CASE("key files are never overwritten and no half pair is left") {
  std::string dir = temp_dir();
  KeyFiles first = create_key_files(dir + "/station");
  std::string before = read_file_bytes(first.private_path);
  struct Case {
    const char* what;
    std::string name;
  };
  for (const Case& c : {Case{"both exist", dir + "/station"}, Case{"with .key suffix", dir + "/station.key"}}) {
    CAPTURE(c.what);
    try {
      create_key_files(c.name);
      FAIL("expected cant_create");
    } catch (const sp::Error& e) {
      CHECK(e.code() == sp::ExitCode::cant_create);
    }
  }
  CHECK(read_file_bytes(first.private_path) == before);
  // Only the public file exists: refused before anything is written.
  write_file_atomic(dir + "/half.pub.pem", "x", true);
  CHECK_THROWS_AS(create_key_files(dir + "/half"), sp::Error);
  CHECK(::access((dir + "/half.key").c_str(), F_OK) != 0);
  for (const char* f : {"/station.key", "/station.pub.pem", "/half.pub.pem"}) ::unlink((dir + f).c_str());
  ::rmdir(dir.c_str());
}

TEST_CASE("write_file_atomic exclusive refuses an existing file and keeps it") {
  std::string dir = temp_dir();
  std::string p = dir + "/report.pdf";
  write_file_atomic(p, "first", true);
  CHECK_THROWS_AS(write_file_atomic(p, "second", true), sp::Error);
  CHECK(read_file_bytes(p) == "first");
  ::unlink(p.c_str());
  ::rmdir(dir.c_str());
}
