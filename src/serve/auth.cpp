#include "serve/auth.h"

#include <openssl/crypto.h>
#include <openssl/evp.h>
#include <openssl/hmac.h>
#include <openssl/rand.h>

#include <sstream>

#include "core/error.h"

namespace sp::serve {

namespace {

constexpr std::size_t kSaltBytes = 16;  // NIST SP 800-132 §5.1: at least 128 bits
constexpr std::size_t kHashBytes = 32;  // SHA-256 output length
constexpr std::size_t kMaxName = 64;

std::string pbkdf2(const std::string& password, const std::string& salt, int iterations) {
  std::string out(kHashBytes, '\0');
  if (PKCS5_PBKDF2_HMAC(password.data(), static_cast<int>(password.size()),
                        reinterpret_cast<const unsigned char*>(salt.data()),
                        static_cast<int>(salt.size()), iterations, EVP_sha256(),
                        static_cast<int>(out.size()),
                        reinterpret_cast<unsigned char*>(out.data())) != 1) {
    throw Error(ExitCode::internal, "PBKDF2 failed");
  }
  return out;
}

bool unhex(const std::string& text, std::string& out) {
  if (text.size() % 2 != 0) return false;
  out.clear();
  for (std::size_t i = 0; i < text.size(); i += 2) {
    int v = 0;
    for (std::size_t k = i; k < i + 2; ++k) {
      const char c = text[k];
      int d = c >= '0' && c <= '9' ? c - '0' : c >= 'a' && c <= 'f' ? c - 'a' + 10 : -1;
      if (d < 0) return false;
      v = v * 16 + d;
    }
    out.push_back(static_cast<char>(v));
  }
  return true;
}

}  // namespace

std::string random_bytes(std::size_t n) {
  std::string out(n, '\0');
  if (RAND_bytes(reinterpret_cast<unsigned char*>(out.data()), static_cast<int>(n)) != 1) {
    throw Error(ExitCode::internal, "the system's random generator failed");
  }
  return out;
}

std::string hex(const std::string& bytes) {
  static const char* digits = "0123456789abcdef";
  std::string out;
  for (unsigned char c : bytes) {
    out.push_back(digits[c >> 4]);
    out.push_back(digits[c & 15]);
  }
  return out;
}

void check_operator_name(const std::string& name) {
  if (name.empty() || name.size() > kMaxName) {
    throw data_error("--name: expected 1 to 64 characters, got " + std::to_string(name.size()));
  }
  for (unsigned char c : name) {
    if (c == ':' || c < 0x20 || c == 0x7f) {
      throw data_error("--name: ':' and control characters are not allowed in an operator name");
    }
  }
}

std::string operator_line(const std::string& name, const std::string& password, int iterations) {
  check_operator_name(name);
  if (password.empty()) throw data_error("password: expected at least one character on stdin");
  const std::string salt = random_bytes(kSaltBytes);
  return name + ":pbkdf2-sha256:" + std::to_string(iterations) + ":" + hex(salt) + ":" +
         hex(pbkdf2(password, salt, iterations));
}

std::vector<OperatorEntry> parse_operators(const std::string& text, const std::string& file) {
  std::vector<OperatorEntry> out;
  std::istringstream in(text);
  std::string line;
  int n = 0;
  while (std::getline(in, line)) {
    ++n;
    if (line.empty() || line[0] == '#') continue;
    const std::string where = file + ":" + std::to_string(n);
    std::vector<std::string> parts;
    std::size_t from = 0;
    for (;;) {
      const std::size_t colon = line.find(':', from);
      parts.push_back(line.substr(from, colon - from));
      if (colon == std::string::npos) break;
      from = colon + 1;
    }
    if (parts.size() != 5 || parts[1] != "pbkdf2-sha256") {
      throw data_error(where +
                       ": expected NAME:pbkdf2-sha256:ITERATIONS:SALT:HASH (made by `scaleproof "
                       "operator add`)");
    }
    OperatorEntry e;
    e.name = parts[0];
    try {
      check_operator_name(e.name);
    } catch (const Error& err) {
      throw err.within(where);
    }
    std::size_t used = 0;
    long long it = 0;
    try {
      it = std::stoll(parts[2], &used);
    } catch (const std::exception&) {
      used = 0;
    }
    if (used == 0 || used != parts[2].size() || it < 1 || it > 100000000) {
      throw data_error(where + ": iterations: expected a whole number from 1 to 100000000");
    }
    e.iterations = static_cast<int>(it);
    if (!unhex(parts[3], e.salt) || e.salt.empty()) {
      throw data_error(where + ": salt: expected lower-case hex");
    }
    if (!unhex(parts[4], e.hash) || e.hash.size() != kHashBytes) {
      throw data_error(where + ": hash: expected 64 lower-case hex digits");
    }
    for (const auto& o : out) {
      if (o.name == e.name) throw data_error(where + ": operator " + e.name + " is listed twice");
    }
    out.push_back(std::move(e));
  }
  return out;
}

bool password_matches(const OperatorEntry& op, const std::string& password) {
  const std::string h = pbkdf2(password, op.salt, op.iterations);
  return h.size() == op.hash.size() && CRYPTO_memcmp(h.data(), op.hash.data(), h.size()) == 0;
}

std::string hmac_hex(const std::string& key, const std::string& message) {
  unsigned char out[EVP_MAX_MD_SIZE];
  unsigned int len = 0;
  if (HMAC(EVP_sha256(), key.data(), static_cast<int>(key.size()),
           reinterpret_cast<const unsigned char*>(message.data()), message.size(), out,
           &len) == nullptr) {
    throw Error(ExitCode::internal, "HMAC failed");
  }
  return hex(std::string(reinterpret_cast<const char*>(out), len));
}

bool same_token(const std::string& a, const std::string& b) {
  return !a.empty() && a.size() == b.size() && CRYPTO_memcmp(a.data(), b.data(), a.size()) == 0;
}

std::string SignIns::sign_in(const std::string& name) {
  std::string token = hex(random_bytes(32));
  std::lock_guard<std::mutex> lock(mu_);
  by_token_[token] = name;
  return token;
}

std::optional<std::string> SignIns::who(const std::string& token) const {
  std::lock_guard<std::mutex> lock(mu_);
  auto it = by_token_.find(token);
  if (it == by_token_.end()) return std::nullopt;
  return it->second;
}

long long SignInThrottle::wait_seconds(const std::string& name, long long now) const {
  std::lock_guard<std::mutex> lock(mu_);
  auto it = by_name_.find(name);
  return it == by_name_.end() || it->second.locked_until <= now ? 0 : it->second.locked_until - now;
}

void SignInThrottle::failed(const std::string& name, long long now) {
  std::lock_guard<std::mutex> lock(mu_);
  if (by_name_.size() >= kMaxNames && by_name_.count(name) == 0) {
    for (auto it = by_name_.begin(); it != by_name_.end();)
      it = it->second.locked_until > now ? std::next(it) : by_name_.erase(it);
    if (by_name_.size() >= kMaxNames) return;  // every tracked name is locked: nothing to add
  }
  Count& c = by_name_[name];
  if (++c.failures >= kMaxFailures) {
    c.failures = 0;
    c.locked_until = now + kLockSeconds;
  }
}

void SignInThrottle::succeeded(const std::string& name) {
  std::lock_guard<std::mutex> lock(mu_);
  by_name_.erase(name);
}

void SignIns::sign_out(const std::string& token) {
  std::lock_guard<std::mutex> lock(mu_);
  by_token_.erase(token);
}

}  // namespace sp::serve
