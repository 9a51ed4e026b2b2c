#include "report/key_files.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <cstdio>
#include <cstring>
#include <fstream>
#include <sstream>

#include "core/error.h"
#include "report/signer.h"

namespace sp::report {
namespace {

std::string errno_text() { return std::strerror(errno); }

// Writes all of `bytes` to a new file (O_EXCL) with `mode` (less the umask, unless `exact`:
// then exactly `mode`, so a private key is 0600 whatever the umask); throws cant_create / io_error.
void write_new_file(const std::string& path, const std::string& bytes, mode_t mode,
                    bool exact = false) {
  int fd = ::open(path.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, mode);
  if (fd < 0) {
    if (errno == EEXIST) {
      throw Error(ExitCode::cant_create, path + ": already exists; refusing to overwrite it");
    }
    throw Error(ExitCode::cant_create, path + ": cannot create: " + errno_text());
  }
  if (exact && ::fchmod(fd, mode) != 0) {
    std::string why = errno_text();
    ::close(fd);
    ::unlink(path.c_str());
    throw Error(ExitCode::cant_create, path + ": cannot set mode: " + why);
  }
  std::size_t done = 0;
  while (done < bytes.size()) {
    ssize_t n = ::write(fd, bytes.data() + done, bytes.size() - done);
    if (n < 0) {
      if (errno == EINTR) continue;
      std::string why = errno_text();
      ::close(fd);
      ::unlink(path.c_str());
      throw Error(ExitCode::io_error, path + ": write failed: " + why);
    }
    done += static_cast<std::size_t>(n);
  }
  if (::fsync(fd) != 0 || ::close(fd) != 0) {
    std::string why = errno_text();
    ::unlink(path.c_str());
    throw Error(ExitCode::io_error, path + ": write failed: " + why);
  }
}

}  // namespace

KeyFiles key_file_names(const std::string& name) {
  std::string base = name;
  if (base.size() > 4 && base.compare(base.size() - 4, 4, ".key") == 0) {
    base.resize(base.size() - 4);
  }
  if (base.empty()) throw usage_error("key name: expected a non-empty NAME");
  return {base + ".key", base + ".pub.pem", ""};
}

KeyFiles create_key_files(const std::string& name) {
  KeyFiles files = key_file_names(name);
  struct stat st {};
  for (const std::string* p : {&files.private_path, &files.public_path}) {
    if (::lstat(p->c_str(), &st) == 0) {
      throw Error(ExitCode::cant_create, *p + ": already exists; refusing to overwrite it");
    }
  }
  KeyPairPem pair = generate_key_pair();
  // 0600: only the owner may read the private key (it signs reports in the station's name).
  write_new_file(files.private_path, pair.private_pem, 0600, /*exact=*/true);
  try {
    write_new_file(files.public_path, pair.public_pem, 0644);
  } catch (...) {
    ::unlink(files.private_path.c_str());
    throw;
  }
  files.fingerprint = fingerprint(verifier_from_pem(pair.public_pem, files.public_path)->public_key());
  return files;
}

std::string read_file_bytes(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    if (errno == ENOENT) throw Error(ExitCode::no_input, path + ": no such file");
    throw Error(ExitCode::io_error, path + ": cannot open: " + errno_text());
  }
  std::ostringstream ss;
  ss << in.rdbuf();
  if (in.bad()) throw Error(ExitCode::io_error, path + ": read failed");
  return ss.str();
}

std::string read_private_key_file(const std::string& path) {
  int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC);
  if (fd < 0) {
    if (errno == ENOENT) throw Error(ExitCode::no_input, path + ": no such file");
    throw Error(ExitCode::io_error, path + ": cannot open: " + errno_text());
  }
  struct stat st {};
  if (::fstat(fd, &st) != 0) {
    std::string why = errno_text();
    ::close(fd);
    throw Error(ExitCode::io_error, path + ": cannot read its mode: " + why);
  }
  if ((st.st_mode & 077) != 0) {
    ::close(fd);
    char mode[8];
    std::snprintf(mode, sizeof mode, "%04o", static_cast<unsigned>(st.st_mode & 07777));
    throw data_error(
        path + ": private key file has mode " + mode +
        ", so group or others can read it; refusing to use it. Restrict it with `chmod 600 " +
        path + "` (and make a new key with `scaleproof key rotate` if others may have copied it)");
  }
  std::string out;
  char buf[4096];
  for (;;) {
    ssize_t n = ::read(fd, buf, sizeof buf);
    if (n < 0 && errno == EINTR) continue;
    if (n < 0) {
      std::string why = errno_text();
      ::close(fd);
      throw Error(ExitCode::io_error, path + ": read failed: " + why);
    }
    if (n == 0) break;
    out.append(buf, static_cast<std::size_t>(n));
    if (out.size() > (1u << 20)) {
      ::close(fd);
      throw data_error(path + ": larger than 1 MiB; expected a PEM private key");
    }
  }
  ::close(fd);
  return out;
}

void write_file_atomic(const std::string& path, const std::string& bytes, bool exclusive) {
  struct stat st {};
  if (exclusive && ::lstat(path.c_str(), &st) == 0) {
    throw Error(ExitCode::cant_create, path + ": already exists; refusing to overwrite it");
  }
  std::string tmp = path + ".tmp-" + std::to_string(::getpid());
  ::unlink(tmp.c_str());
  write_new_file(tmp, bytes, 0644);
  // link() fails when the target exists, which keeps `exclusive` race-free; rename() replaces.
  int rc = exclusive ? ::link(tmp.c_str(), path.c_str()) : ::rename(tmp.c_str(), path.c_str());
  int saved = errno;
  if (exclusive || rc != 0) ::unlink(tmp.c_str());
  if (rc != 0) {
    errno = saved;
    throw Error(ExitCode::cant_create, path + ": cannot create: " + errno_text());
  }
}

void sync_folders(const std::vector<std::string>& paths) {
  std::vector<std::string> done;
  for (const auto& p : paths) {
    const auto slash = p.find_last_of('/');
    const std::string dir = slash == std::string::npos ? "." : slash == 0 ? "/" : p.substr(0, slash);
    if (std::find(done.begin(), done.end(), dir) != done.end()) continue;
    done.push_back(dir);
    const int fd = ::open(dir.c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC);
    if (fd < 0 || ::fsync(fd) != 0) {
      const std::string why = errno_text();
      if (fd >= 0) ::close(fd);
      throw Error(ExitCode::io_error, dir + ": cannot sync the folder: " + why);
    }
    ::close(fd);
  }
}

}  // namespace sp::report
