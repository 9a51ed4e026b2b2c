// The station console: every page and /api/ endpoint of `scaleproof serve` as one function
// from a Request to a Response (serve/http.h), with no socket. It has no logic of its own: it
// calls the store (store/store.h), the engine (reconcile, plan, verdict), report issuing and
// verification (report/issue.h, report/verify.h) and the ledger proof (audit/ledger_proof.h),
// the same calls the CLI makes.
//
// Contract (docs/console.md, /work console contract): handle() never throws. Each request opens
// its own store connection (SQLite connections are not shared across the server's threads)
// and runs in one transaction: a failed request writes nothing. Errors map to statuses:
// data_error/usage 400 (JSON {"error", "field"}: the library's own message, and the request
// field it names when it leads the message), no_input 404, a duplicate ticket 409, a body over
// Config::max_body 413, temp_fail (store busy) 503 with Retry-After, a bad CSRF token or a write
// without a signed-in operator 403. Every response carries Content-Security-Policy,
// X-Content-Type-Options and Referrer-Policy. Thread-safe: handle() may run on many threads.
#pragma once
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "report/signer.h"
#include "serve/auth.h"
#include "serve/http.h"

namespace sp::serve {

struct Config {
  std::string db_path;
  // --key: the station's signer; null: no report page. The key never leaves the process.
  std::shared_ptr<const report::Signer> signer;
  // --operators: when set, every write needs a signed-in operator (recorded as entered_by).
  std::optional<std::vector<OperatorEntry>> operators;
  // Without --operators: who is recorded as entered_by, the same as the CLI's default
  // ($SCALEPROOF_OPERATOR, else $USER; cli/store_cli.h who()). Ignored with --operators, where
  // only a signed-in operator writes.
  std::optional<std::string> local_operator;
  // 2 MiB: a weigh-report is well under a megabyte, and a report, its .sig and a key fit;
  // anything larger is not something the console takes (common practice).
  std::size_t max_body = 2u << 20;
  // 2 s: a pass add holds the write lock ~1 ms; a request waits this long, then 503.
  int busy_timeout_ms = 2000;
  std::string software = "scaleproof";  // "scaleproof X.Y.Z" for issued reports
};

class Console {
 public:
  explicit Console(Config config);
  ~Console();
  Console(const Console&) = delete;
  Console& operator=(const Console&) = delete;

  Response handle(const Request& request) noexcept;
  const Config& config() const;

  struct State;

 private:
  std::unique_ptr<State> state_;
};

}  // namespace sp::serve
