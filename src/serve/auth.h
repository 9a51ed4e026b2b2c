// Operators and their passwords, sign-in tokens and CSRF tokens for the console.
//
// Operators file: one operator per line, `NAME:pbkdf2-sha256:ITERATIONS:SALT_HEX:HASH_HEX`,
// written by `scaleproof operator add` (lines starting with '#' and empty lines are ignored).
// The hash is PBKDF2-HMAC-SHA256 (RFC 8018 §5.2, libcrypto PKCS5_PBKDF2_HMAC) over the
// password with a 16-byte random salt, 32-byte output. kPbkdf2Iterations = 600 000: OWASP
// Password Storage Cheat Sheet (2023), PBKDF2-HMAC-SHA256. A name is 1..64 characters without
// ':' or control characters (it goes into the ledger as entered_by).
// CSRF: a token is HMAC-SHA256(server secret, visitor id) in hex: the visitor id lives in a
// cookie, the secret only in the process (new at every start), so a page of another site can
// neither read nor forge it. Tokens compare in constant time (CRYPTO_memcmp).
#pragma once
#include <cstddef>
#include <iterator>
#include <map>
#include <mutex>
#include <optional>
#include <string>
#include <vector>

namespace sp::serve {

inline constexpr int kPbkdf2Iterations = 600000;

struct OperatorEntry {
  std::string name;
  int iterations = kPbkdf2Iterations;
  std::string salt;  // raw bytes
  std::string hash;  // raw 32 bytes
};

// Random bytes from the OS generator (RAND_bytes); throws sp::Error(internal) when it fails.
std::string random_bytes(std::size_t n);
std::string hex(const std::string& bytes);

// Checks a name (data_error naming `--name`).
void check_operator_name(const std::string& name);
// One line of the file for `name` and `password` (new random salt); no newline.
std::string operator_line(const std::string& name, const std::string& password,
                          int iterations = kPbkdf2Iterations);
// Parses the file's text; data_error "<file>:<line>: ..." for a malformed line or a name twice.
std::vector<OperatorEntry> parse_operators(const std::string& text, const std::string& file);
// The password is the operator's (constant-time compare of the derived hash).
bool password_matches(const OperatorEntry& op, const std::string& password);

// HMAC-SHA256 of `message` under `key`, hex.
std::string hmac_hex(const std::string& key, const std::string& message);
bool same_token(const std::string& a, const std::string& b);

// Signed-in operators by sign-in token (random, in a cookie). Thread-safe.
class SignIns {
 public:
  std::string sign_in(const std::string& name);  // returns the new token
  std::optional<std::string> who(const std::string& token) const;
  void sign_out(const std::string& token);

 private:
  mutable std::mutex mu_;
  std::map<std::string, std::string> by_token_;
};

// Failed sign-ins by operator name (known or not, so a lock does not tell names apart): after
// kMaxFailures in a row a name is refused for kLockSeconds before its password is checked, so
// guessing costs the guesser time rather than the station's CPU (OWASP Authentication Cheat
// Sheet, "account lockout": a threshold and a lock period; 5 tries and 60 s are common
// practice). At most kMaxNames names are tracked; when full, those not locked are forgotten.
// Thread-safe. `now`: seconds on a monotonic clock.
class SignInThrottle {
 public:
  static constexpr int kMaxFailures = 5;
  static constexpr long long kLockSeconds = 60;
  static constexpr std::size_t kMaxNames = 4096;
  long long wait_seconds(const std::string& name, long long now) const;  // 0: may try now
  void failed(const std::string& name, long long now);
  void succeeded(const std::string& name);

 private:
  struct Count {
    int failures = 0;
    long long locked_until = 0;
  };
  mutable std::mutex mu_;
  std::map<std::string, Count> by_name_;
};

}  // namespace sp::serve
