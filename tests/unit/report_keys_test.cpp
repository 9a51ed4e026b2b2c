#include <doctest/doctest.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cstdio>
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

TEST_CASE(
    "private key files that group or others can access are refused, naming the mode and the fix") {
  // OpenSSH refuses identity files with any of the mode bits 077 set (ssh(1), common practice
  // for secrets); the key that signs reports in the station's name gets the same rule.
  std::string dir = temp_dir();
  KeyFiles f = create_key_files(dir + "/station");
  struct Case {
    mode_t mode;
    bool accepted;
  };
  const Case cases[] = {{0600, true},  {0400, true},  {0700, true},  {0640, false}, {0644, false},
                        {0604, false}, {0660, false}, {0666, false}, {0620, false}, {0602, false},
                        {0610, false}, {0601, false}, {0755, false}, {0777, false}};
  for (const Case& c : cases) {
    char want[8];
    std::snprintf(want, sizeof want, "%04o", static_cast<unsigned>(c.mode));
    CAPTURE(want);
    REQUIRE(::chmod(f.private_path.c_str(), c.mode) == 0);
    if (c.accepted) {
      CHECK(signer_from_pem(read_private_key_file(f.private_path), f.private_path)
                ->public_key()
                .size() == kPublicKeySize);
      continue;
    }
    try {
      read_private_key_file(f.private_path);
      FAIL("expected data_error");
    } catch (const sp::Error& e) {
      std::string msg = e.what();
      CAPTURE(msg);
      CHECK(e.code() == sp::ExitCode::data_error);
      CHECK(msg.find(f.private_path) != std::string::npos);
      CHECK(msg.find(std::string("mode ") + want) != std::string::npos);
      CHECK(msg.find("chmod 600 " + f.private_path) != std::string::npos);
    }
  }
  try {
    read_private_key_file(dir + "/missing.key");
    FAIL("expected no_input");
  } catch (const sp::Error& e) {
    CHECK(e.code() == sp::ExitCode::no_input);
  }
  ::unlink(f.private_path.c_str());
  ::unlink(f.public_path.c_str());
  ::rmdir(dir.c_str());
}

TEST_CASE("key new writes the private key 0600 whatever the umask") {
  std::string dir = temp_dir();
  mode_t old = ::umask(0);
  KeyFiles f = create_key_files(dir + "/station");
  ::umask(old);
  struct stat st {};
  REQUIRE(::stat(f.private_path.c_str(), &st) == 0);
  CHECK((st.st_mode & 07777) == 0600);
  ::unlink(f.private_path.c_str());
  ::unlink(f.public_path.c_str());
  ::rmdir(dir.c_str());
}
