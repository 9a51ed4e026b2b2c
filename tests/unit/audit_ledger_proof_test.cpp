// The ledger proof (audit/ledger_proof.h): signed checkpoints and outside anchors as prefixes of
// the chain, on a store rewritten behind the tool's back (the rewrite recomputes every hash, as
// tests/e2e/rewrite_ledger.py does; here the store's own writer builds the forged twin).
#include <doctest/doctest.h>

#include "audit/ledger_proof.h"
#include "report/checkpoint.h"
#include "store/chain.h"
#include "unit/store_fixture.h"

using namespace storetest;
using sp::audit::Anchor;
using sp::audit::AnchorState;

namespace {

// A checkpoint of the current head signed with `signer`, appended.
void sign_checkpoint(Store& st, const sp::report::Signer& signer) {
  st.begin_write();
  sp::audit::append_signed_checkpoint(st, signer, "2026-10-14T10:00:00Z", std::string("I. Varga"));
  st.commit();
}

void add_scale(Store& st, const std::string& code) {
  st.begin_write();
  st.add_scale(demo_scale(code), WeightUnit::lb, std::nullopt, "2026-10-14T10:00:00Z");
  st.commit();
}

std::string seed32(char c) {
  return std::string(32, c);
}

}  // namespace

TEST_CASE("parse_anchor reads ROWS:HASH as printed, grouped or not, and names bad input") {
  const std::string hex(64, 'a');
  CHECK(sp::audit::parse_anchor("12:" + hex, "--expect").rows == 12);
  CHECK(sp::audit::parse_anchor("12:AAAAAAAA " + hex.substr(8), "--expect").head == hex);
  for (const char* bad : {"12", ":aa", "x:aa", "0:aa", "12:zz"}) {
    CAPTURE(bad);
    CHECK_THROWS_AS(sp::audit::parse_anchor(bad, "--expect"), sp::Error);
  }
}

TEST_CASE("an honest append keeps every checkpoint and anchor") {
  TempStore ts;
  add_demo_passes(*ts.store, seed_session(*ts.store));
  auto key = sp::report::signer_from_seed(seed32('\x11'));
  sign_checkpoint(*ts.store, *key);
  const ChainHead before = ts.store->chain_head();
  add_scale(*ts.store, "ST-7");
  sp::audit::ProofOptions o;
  o.anchors.push_back({before.rows, before.head, "--expect"});
  o.station_keys.push_back(key->public_key());
  ts.store->begin_read();
  auto p = sp::audit::prove_ledger(*ts.store, o);
  ts.store->rollback();
  CAPTURE(p.failures.size());
  CHECK(p.ok());
  REQUIRE(p.checkpoints.size() == 1);
  CHECK(p.checkpoints[0].holds);
  CHECK(p.anchors[0].second.state == AnchorState::holds);
}

TEST_CASE("a rewrite with every hash recomputed is named by the checkpoint that covers it") {
  // The forged twin: the same rows but one scale's name, built by the store's own writer (so
  // every hash is recomputed and the chain links), then the victim's signed checkpoint row
  // appended with a recomputed row hash, as a rewrite that keeps the signed rows leaves it.
  TempStore honest, twin;
  auto key = sp::report::signer_from_seed(seed32('\x22'));
  add_demo_passes(*honest.store, seed_session(*honest.store));
  sign_checkpoint(*honest.store, *key);
  const Checkpoint cp = honest.store->list_checkpoints().at(0);
  {
    ScaleInfo other = demo_scale("ST-3");
    other.name = "Other lane";
    add_demo_passes(*twin.store, seed_session(*twin.store, other));
  }
  const ChainHead th = twin.store->chain_head();
  REQUIRE(th.rows == cp.rows);
  Encoder enc;
  Sha256 sha;
  enc.start(table_desc("checkpoints"), cp.seq, 1);
  enc.add_int(cp.rows);
  for (const std::string* t : {&cp.head, &cp.public_key, &cp.key_fingerprint, &cp.signature}) {
    enc.add_text(*t);
  }
  enc.add_text(*cp.signed_by);
  enc.add_text(cp.signed_at);
  Hash prev{};
  for (size_t i = 0; i < 32; ++i) {
    prev[i] = static_cast<unsigned char>(std::stoi(th.head.substr(2 * i, 2), nullptr, 16));
  }
  const std::string hash = to_hex(sha.digest(enc.chained(prev)));
  REQUIRE(twin.raw("INSERT INTO checkpoints VALUES (1, " + std::to_string(cp.seq) + ", x'" + hash +
                   "', " + std::to_string(cp.rows) + ", '" + cp.head + "', '" + cp.public_key +
                   "', '" + cp.key_fingerprint + "', '" + cp.signature + "', '" + *cp.signed_by +
                   "', '" + cp.signed_at + "')")
              .empty());
  sp::audit::ProofOptions o;
  o.station_keys.push_back(key->public_key());
  twin.store->begin_read();
  auto p = sp::audit::prove_ledger(*twin.store, o);
  twin.store->rollback();
  CHECK(p.chain.ok);  // the chain alone is fooled
  CHECK(p.schema.empty());
  REQUIRE(p.failures.size() == 1);
  CAPTURE(p.failures[0]);
  CHECK(p.failures[0].find("checkpoint 1 (chain position " + std::to_string(cp.seq)) == 0);
  CHECK(p.failures[0].find("the chain was rewritten in rows 1 to " + std::to_string(cp.rows)) !=
        std::string::npos);
}

TEST_CASE("anchors: a dropped tail, a rewritten row and a broken chain are told apart") {
  TempStore ts;
  add_demo_passes(*ts.store, seed_session(*ts.store));
  const ChainHead h = ts.store->chain_head();
  ts.store->begin_read();
  const long long n = ts.store->check_chain({}).rows;
  CHECK(sp::audit::check_anchor(*ts.store, {h.rows, h.head, ""}, n, true).state ==
        AnchorState::holds);
  auto tail = sp::audit::check_anchor(*ts.store, {h.rows + 2, h.head, ""}, n, true);
  CHECK(tail.state == AnchorState::tail_missing);
  CHECK(tail.detail.find("rows " + std::to_string(h.rows + 1) + " to " +
                         std::to_string(h.rows + 2)) != std::string::npos);
  auto other = sp::audit::check_anchor(*ts.store, {h.rows, std::string(64, 'f'), ""}, n, true, 3);
  CHECK(other.state == AnchorState::rewritten);
  CHECK(other.detail.find("rewritten in rows 4 to " + std::to_string(h.rows)) != std::string::npos);
  CHECK(sp::audit::check_anchor(*ts.store, {h.rows, h.head, ""}, 2, false).state ==
        AnchorState::not_proven);
  ts.store->rollback();
}

TEST_CASE("checkpoints: a bad signature and a foreign key are each one failure") {
  TempStore ts;
  add_demo_passes(*ts.store, seed_session(*ts.store));
  auto station = sp::report::signer_from_seed(seed32('\x33'));
  auto other = sp::report::signer_from_seed(seed32('\x44'));
  sign_checkpoint(*ts.store, *station);
  sign_checkpoint(*ts.store, *other);
  sp::audit::ProofOptions o;
  o.station_keys.push_back(station->public_key());
  ts.store->begin_read();
  auto p = sp::audit::prove_ledger(*ts.store, o);
  ts.store->rollback();
  REQUIRE(p.failures.size() == 1);
  CHECK(p.failures[0].find("checkpoint 2") != std::string::npos);
  CHECK(p.failures[0].find("not the station key") != std::string::npos);
  // Altered behind the tool's back (the hash not recomputed: the walk names the row as well).
  REQUIRE(ts.raw("DROP TRIGGER checkpoints_no_update; UPDATE checkpoints SET rows = 3 WHERE id = 1")
              .empty());
  ts.store->begin_read();
  p = sp::audit::prove_ledger(*ts.store, {});
  ts.store->rollback();
  CHECK_FALSE(p.chain.ok);
  bool forged = false, schema = false;
  for (const auto& f : p.failures) {
    forged = forged || f.find("checkpoint 1 (chain position") != std::string::npos;
    schema = schema || f.find("checkpoints_no_update is missing") != std::string::npos;
  }
  CHECK(forged);
  CHECK(schema);
}
