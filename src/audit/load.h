// Loaders for the audit: claim files on disk (report PDFs with their .sig, session files,
// folders of them) and sessions of the ticket store, turned into AuditItems.
//
// This is the audit's I/O layer; the rules (audit.h) stay pure. Each input that cannot be read
// is reported to `unreadable` with a message naming the file and what was expected, and the
// audit goes on with the rest (the CLI then exits 65). A session the engine cannot solve is
// still an item: its reconcile_error becomes an `unsolvable` finding.
// Claims: a folder named on the command line is one claim (its sub-folders included); a file
// named directly belongs to the claim of the folder it lies in.
// Folder contents: *.pdf are weigh-reports (their "<name>.pdf.sig" beside them is the detached
// signature), *.json session files; *.sig files are taken with their PDF, other files are
// listed in `skipped`. Files are visited in name order, so output is deterministic.
#pragma once
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "audit/audit.h"
#include "audit/output.h"
#include "audit/output_stream.h"
#include "report/trust.h"
#include "store/store.h"

namespace sp::audit {

struct TrustedKey {
  std::string source;       // the .pub.pem or trust file
  std::string fingerprint;  // report/signer.h fingerprint()
  report::TrustEntry entry;  // its station and validity (none for a bare key)
};

// Reads each --trust PATH: a trust file (report/trust.h), a PEM public key, or a folder whose
// *.pem files are all keys. Throws sp::Error (no_input / data_error) naming the file that is
// missing or not a key.
std::vector<TrustedKey> load_trusted_keys(const std::vector<std::string>& paths);

struct LoadSinks {
  std::function<void(const AuditItem&)> item;
  std::function<void(Unreadable)> unreadable;
  std::function<void(const std::string& path, const std::string& why)> skipped;
};

// Loads every PATH (file or folder). `trusted` decides VerificationFacts::key_trusted.
void load_paths(const std::vector<std::string>& paths, const std::vector<TrustedKey>& trusted,
                const LoadSinks& sinks);

// One weigh-report PDF (with `path`.sig when it exists) / one session file, into an item of
// claim `claim`. nullopt after reporting to sinks.unreadable.
std::optional<AuditItem> load_report(const std::string& path, const std::string& claim,
                                     const std::vector<TrustedKey>& trusted, const LoadSinks& sinks);
std::optional<AuditItem> load_session_file(const std::string& path, const std::string& claim,
                                           const LoadSinks& sinks);

// Sessions of the store: one (`session_id`) or all, streamed in id order. Items get source
// "<store_label>#<id>" and claim `store_label`; the scale's inspection history comes along.
// Throws sp::Error from the store (no_input for a missing session).
void load_store_sessions(store::Store& st, const std::string& store_label,
                         std::optional<long long> session_id, const LoadSinks& sinks);

// The store audit with flat memory: every item goes to `writer` as soon as it is final (only
// sessions holding a ticket that another session also holds, Store::shared_tickets, are kept
// until the end), and the whole audit is written to `out` (audit/output_stream.h). Output equals
// audit_text / audit_json of audit_store(...) with `trusted_keys` added. Returns the counts
// (AuditResult::items empty). Throws as load_store_sessions and AuditStreamWriter do.
AuditResult audit_store_streamed(store::Store& st, const std::string& store_label,
                                 std::optional<long long> session_id, const AuditOptions& options,
                                 const std::vector<std::string>& trusted_keys,
                                 AuditStreamWriter& writer, std::ostream& out);

// The engine's result for an item's session, or the reason it could not be solved.
void reconcile_item(AuditItem& item);

// A whole audit in one call: load, apply the rules, and return the report (options, trusted
// fingerprints, unreadable inputs listed). `on_unreadable` / `on_skipped`, when set, are also
// told as each happens (for messages on stderr). The store variant throws as
// load_store_sessions does.
struct LoadObserver {
  // Called on each item before the rules see it (audit --ledger fills AuditItem::anchor).
  std::function<void(AuditItem&)> prepare;
  std::function<void(const Unreadable&)> on_unreadable;
  std::function<void(const std::string& path, const std::string& why)> on_skipped;
};
AuditReport audit_paths(const std::vector<std::string>& paths,
                        const std::vector<TrustedKey>& trusted, const AuditOptions& options,
                        const LoadObserver& observer = {});
AuditReport audit_store(store::Store& st, const std::string& store_label,
                        std::optional<long long> session_id, const AuditOptions& options,
                        const LoadObserver& observer = {});

}  // namespace sp::audit
