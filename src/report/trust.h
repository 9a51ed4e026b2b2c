// Station keys over time: the trust file ("scaleproof-trust/1", TOML) that says which station
// key fingerprints a verifier accepts, for which station, and when.
//
//   format = "scaleproof-trust/1"
//   [[key]]
//   fingerprint = "d75a 9801 82b1 ..."    # required: SHA-256 of the raw key (signer.h), as
//                                         # `key new` prints it; spaces optional
//   station     = "Larkspur Flats Public Scale"   # required: who holds the key
//   valid_from  = "2026-01-01T00:00:00Z"  # optional: reports issued before are refused
//   valid_to    = "2027-01-01T00:00:00Z"  # optional: reports issued at or after are refused
//   revoked_at  = "2026-07-04T12:00:00Z"  # optional: reports issued at or after are refused
// Times are ISO 8601 date-times with Z or an offset. Unknown keys are refused (a typo would
// otherwise be a silently ignored bound). A fingerprint appears once.
// A --trust PATH is a trust file, a bare PEM public key (trusted with no time bounds; station =
// the file's name) or a folder whose *.pem files are such keys (name order).
// Issue time: the record's report.issued_at. A record without one cannot show when it was
// issued; the latest weighing time is then the earliest it can have been issued, which can
// prove a report late (after valid_to or revocation) but never in time, so against a key with
// an end it is "not proven" (a failed check); against one with no end and a start before the
// weighing it holds.
// Errors (load_trust): no_input for a missing path, data_error naming file, entry and field.
#pragma once
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

namespace sp::report {

inline constexpr const char* kTrustFormat = "scaleproof-trust/1";

struct TrustEntry {
  std::string source;       // file it came from
  std::string fingerprint;  // normalised: 16 groups of 4 lower-case hex digits (signer.h)
  std::string station;
  std::optional<std::string> valid_from, valid_to, revoked_at;  // ISO 8601 as written
};

struct TrustList {
  std::vector<TrustEntry> entries;
  const TrustEntry* find(const std::string& fingerprint) const;
};

// Reads every PATH (see above) into one list. Throws sp::Error naming the file.
TrustList load_trust(const std::vector<std::string>& paths);
// Parses trust-file text; `source` names it in messages.
TrustList parse_trust_file(const std::string& text, const std::string& source);

// Whether a report signed by `fingerprint` is within the key's trust. `issued_at`: the
// record's issue time (ISO 8601) or none; `latest_weighing`: the latest pass time of the
// record's session, when known.
struct TrustVerdict {
  bool ok = false;
  const TrustEntry* entry = nullptr;  // null: the key is not in the list
  std::string detail;                 // one line, with the times
};
TrustVerdict check_trust(const TrustList& trust, const std::string& fingerprint,
                         const std::optional<std::string>& issued_at,
                         const std::optional<std::string>& latest_weighing);

// The trust-file text of one entry ("[[key]]" block), for `key new` / `key rotate`.
std::string trust_entry_text(const TrustEntry& e);

}  // namespace sp::report
