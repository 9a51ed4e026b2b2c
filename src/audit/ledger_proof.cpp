#include "audit/ledger_proof.h"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <nlohmann/json.hpp>

#include "core/error.h"
#include "report/checkpoint.h"
#include "report/signer.h"

namespace sp::audit {

std::string short_head(const std::string& head) {
  return head.size() > 8 ? head.substr(0, 8) + "\u2026" : head;
}

Anchor parse_anchor(const std::string& text, const std::string& flag) {
  const auto colon = text.find(':');
  auto bad = [&](const std::string& why) {
    return usage_error(
        fmt::format("{}: expected ROWS:HASH (a row count, a colon, the 64 hex "
                    "digits of the head hash, as printed on a report), got '{}': {}",
                    flag, text, why));
  };
  if (colon == std::string::npos) throw bad("no colon");
  const std::string rows_text = text.substr(0, colon);
  if (rows_text.empty() || rows_text.size() > 15 ||
      !std::all_of(rows_text.begin(), rows_text.end(),
                   [](char c) { return std::isdigit(static_cast<unsigned char>(c)) != 0; })) {
    throw bad("the row count is not a whole number");
  }
  Anchor a;
  a.rows = std::stoll(rows_text);
  if (a.rows < 1) throw bad("the row count must be at least 1");
  for (char c : text.substr(colon + 1)) {
    if (c == ' ') continue;
    const char l = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
    if (!std::isxdigit(static_cast<unsigned char>(l)))
      throw bad("the hash holds a non-hex character");
    a.head += l;
  }
  if (a.head.size() != 64) throw bad(fmt::format("the hash has {} hex digits", a.head.size()));
  a.source = flag;
  return a;
}

AnchorResult check_anchor(store::Store& st, const Anchor& a, long long verified_rows, bool chain_ok,
                          long long lower) {
  if (a.rows > verified_rows) {
    if (!chain_ok) {
      return {AnchorState::not_proven,
              fmt::format("the chain breaks at position {}, before row {}, so the anchor cannot "
                          "be proven",
                          verified_rows + 1, a.rows)};
    }
    return {AnchorState::tail_missing,
            verified_rows == 0
                ? fmt::format("the store holds no rows; rows 1 to {} were removed", a.rows)
                : fmt::format("the chain has only {} rows: rows {} to {} were removed from the "
                              "end",
                              verified_rows, verified_rows + 1, a.rows)};
  }
  const std::optional<std::string> stored = st.stored_hash_at(a.rows);
  if (stored && *stored == a.head) return {AnchorState::holds, ""};
  return {AnchorState::rewritten,
          fmt::format("row {} now has head {}, not {}: the chain was rewritten in rows {} to {}",
                      a.rows, stored ? short_head(*stored) : "(none)", short_head(a.head),
                      lower + 1, a.rows)};
}

namespace {

report::CheckpointClaim claim_of(const store::Checkpoint& c) {
  return {c.rows, c.head, c.signed_at, c.signed_by};
}

std::string checkpoint_name(const CheckpointResult& r) {
  return fmt::format("checkpoint {} (chain position {}, signed {} with key {})", r.number,
                     r.checkpoint.seq, r.checkpoint.signed_at, r.checkpoint.key_fingerprint);
}

}  // namespace

LedgerProof prove_ledger(store::Store& st, const ProofOptions& o) {
  LedgerProof p;
  p.chain = st.check_chain(o.progress);
  p.schema_version = st.schema_version();
  p.schema = st.check_schema();
  for (const auto& d : p.schema) {
    p.failures.push_back(fmt::format("schema: {} {} {}", d.type, d.name, d.problem));
  }
  // Rows 1..verified are proven by the walk: all of them when it passed, else those before
  // the first bad row (the walk stops there; ChainCheck::rows counts the rows before it).
  const long long verified = p.chain.rows;

  // Sizes known to hold so far, to locate a rewrite between the last good anchor and a bad one.
  std::vector<long long> holding;
  auto lower_bound_of = [&](long long rows) {
    long long best = 0;
    for (long long h : holding) {
      if (h < rows) best = std::max(best, h);
    }
    return best;
  };

  std::vector<store::Checkpoint> cps = st.list_checkpoints();
  // Checked in order of the rows they sign, so each rewrite is located after the latest good one.
  std::vector<CheckpointResult> results;
  for (size_t i = 0; i < cps.size(); ++i) {
    results.push_back({cps[i], static_cast<int>(i) + 1, false});
  }
  std::vector<size_t> order(results.size());
  for (size_t i = 0; i < order.size(); ++i) order[i] = i;
  std::stable_sort(order.begin(), order.end(), [&](size_t a, size_t b) {
    return results[a].checkpoint.rows < results[b].checkpoint.rows;
  });
  long long unproven = 0;
  for (size_t i : order) {
    CheckpointResult& r = results[i];
    const store::Checkpoint& c = r.checkpoint;
    if (!report::checkpoint_signature_holds(claim_of(c), c.public_key, c.signature)) {
      p.failures.push_back(
          fmt::format("{}: the signature does not match the rows and head it "
                      "states (forged or altered)",
                      checkpoint_name(r)));
      continue;
    }
    if (!o.station_keys.empty()) {
      std::string raw;
      report::from_hex(c.public_key, raw);
      if (std::find(o.station_keys.begin(), o.station_keys.end(), raw) == o.station_keys.end()) {
        p.failures.push_back(
            fmt::format("{}: signed by a key that is not the station key "
                        "given with --pubkey",
                        checkpoint_name(r)));
        continue;
      }
    }
    AnchorResult a =
        check_anchor(st, Anchor{c.rows, c.head, ""}, verified, p.chain.ok, lower_bound_of(c.rows));
    if (a.state == AnchorState::not_proven) {
      ++unproven;
      continue;
    }
    if (a.state != AnchorState::holds) {
      p.failures.push_back(fmt::format("{} signs rows 1 to {} with head {}, but {}",
                                       checkpoint_name(r), c.rows, short_head(c.head), a.detail));
      continue;
    }
    if (c.seq != c.rows + 1) {
      p.failures.push_back(
          fmt::format("{} signs rows 1 to {} but stands at position {}, not "
                      "right after them (rows were moved)",
                      checkpoint_name(r), c.rows, c.seq));
      continue;
    }
    r.holds = true;
    holding.push_back(c.rows);
  }
  if (unproven > 0) {
    p.notes.push_back(
        fmt::format("{} checkpoint(s) sign rows after the first bad row and "
                    "could not be checked",
                    unproven));
  }
  if (!cps.empty() && o.station_keys.empty()) {
    p.notes.push_back(
        "checkpoint keys not compared with the station's (no --pubkey): a "
        "signature proves only that whoever holds the key named in it signed");
  }
  p.checkpoints = std::move(results);

  std::vector<Anchor> anchors = o.anchors;
  std::stable_sort(anchors.begin(), anchors.end(),
                   [](const Anchor& a, const Anchor& b) { return a.rows < b.rows; });
  for (const Anchor& a : anchors) {
    AnchorResult r = check_anchor(st, a, verified, p.chain.ok, lower_bound_of(a.rows));
    if (r.state == AnchorState::holds) {
      holding.push_back(a.rows);
    } else if (r.state != AnchorState::not_proven) {
      p.failures.push_back(fmt::format("anchor {}:{} ({}) is not a prefix of the chain: {}", a.rows,
                                       short_head(a.head), a.source, r.detail));
    } else {
      p.notes.push_back(
          fmt::format("anchor {}:{} ({}): {}", a.rows, short_head(a.head), a.source, r.detail));
    }
    p.anchors.emplace_back(a, std::move(r));
  }
  return p;
}

store::Checkpoint append_signed_checkpoint(store::Store& st, const report::Signer& signer,
                                           const std::string& signed_at,
                                           const std::optional<std::string>& signed_by) {
  const store::ChainHead head = st.chain_head();
  if (head.rows == 0) throw data_error("checkpoint: the store is empty; there is nothing to sign");
  const report::CheckpointClaim claim{head.rows, head.head, signed_at, signed_by};
  const report::SignedCheckpoint s = report::sign_checkpoint(claim, signer);
  store::Checkpoint c;
  c.rows = claim.rows;
  c.head = claim.head;
  c.public_key = s.public_key_hex;
  c.key_fingerprint = s.fingerprint;
  c.signature = s.signature_hex;
  c.signed_by = claim.signed_by;
  c.signed_at = claim.signed_at;
  c.id = st.add_checkpoint(c);
  c.seq = head.rows + 1;
  return c;
}

std::vector<Anchor> anchors_from_check_json(const std::string& text, const std::string& source) {
  nlohmann::json j = nlohmann::json::parse(text, nullptr, false);
  if (!j.is_object() || j.value("format", "") != "scaleproof-check/1") {
    throw data_error(source +
                     ": expected the JSON that `scaleproof check-store --json` prints "
                     "(format scaleproof-check/1)");
  }
  std::vector<Anchor> out;
  try {
    int n = 0;
    for (const auto& c : j.value("checkpoints", nlohmann::json::array())) {
      ++n;
      report::CheckpointClaim claim{c.at("rows").get<long long>(), c.at("head").get<std::string>(),
                                    c.at("signed_at").get<std::string>(), std::nullopt};
      if (!c.at("signed_by").is_null()) claim.signed_by = c.at("signed_by").get<std::string>();
      if (!report::checkpoint_signature_holds(claim, c.at("public_key").get<std::string>(),
                                              c.at("signature").get<std::string>())) {
        throw data_error(
            fmt::format("{}: checkpoint {} (rows 1 to {}): the signature does not "
                        "hold; this file was altered",
                        source, n, claim.rows));
      }
      out.push_back({claim.rows, claim.head, fmt::format("checkpoint {} in {}", n, source)});
    }
    // A failed proof states no head (null): only its signed checkpoints are anchors then.
    if (j.at("rows").get<long long>() > 0 && j.at("head").is_string()) {
      out.push_back(
          {j.at("rows").get<long long>(), j.at("head").get<std::string>(), "head in " + source});
    }
  } catch (const nlohmann::json::exception& e) {
    throw data_error(source + ": " + e.what());
  }
  return out;
}

}  // namespace sp::audit
