// Built structs for the audit's unit tests: one clean weighing that every rule passes, and
// helpers to change one thing at a time. Invented station, scale and rig.
#pragma once
#include <string>
#include <vector>

#include "audit/audit.h"
#include "audit/calendar.h"

namespace sp::audit::test {

// A pickup and travel trailer weighed in three passes at an invented station, 20 lb division.
// The totals of the hitched and tensioned passes are equal (16 960 lb), as statics demand.
inline Session clean_session() {
  Session s;
  s.units = Units{WeightUnit::lb, LengthUnit::in};
  s.scale.id = "ST-3";
  s.scale.division = 20;
  s.scale.accuracy_class = "IIIL";
  s.scale.capacity = 120000;  // 6 000 d: inside HB 44 Table 3's 2 000..10 000 for Class III L
  s.scale.last_inspected = "2026-04-02";
  s.station = "Millbrook Flats weigh station";
  s.tow_vehicle.label = "Half-ton pickup, crew cab";
  s.tow_vehicle.wheelbase = 160;
  s.tow_vehicle.rear_axle_to_ball = 48;
  s.trailer.label = "Travel trailer, 28 ft";
  s.trailer.ball_to_axle = 190;
  Pass a;
  a.kind = PassKind::unhitched;
  a.ticket = "A-1001";
  a.weighed_at = "2026-10-14T09:12:00-05:00";
  a.steer = 4180;
  a.drive = 3620;
  Pass b;
  b.kind = PassKind::hitched;
  b.ticket = "A-1002";
  b.weighed_at = "2026-10-14T09:20:00-05:00";
  b.steer = 3880;
  b.drive = 4960;
  b.trailer = 8120;
  b.gross = 16960;
  Pass c;
  c.kind = PassKind::tensioned;
  c.setting = "4";
  c.ticket = "A-1003";
  c.weighed_at = "2026-10-14T09:28:00-05:00";
  c.steer = 4020;
  c.drive = 4700;
  c.trailer = 8240;
  s.passes = {a, b, c};
  return s;
}

inline VerificationFacts good_verification() {
  VerificationFacts v;
  v.record_signature_ok = true;
  v.key_fingerprint = "d75a 9801 82b1 0ab7";
  v.key_trusted = true;
  v.detached_present = true;
  v.detached_ok = true;
  v.record_matches = true;
  return v;
}

inline AuditItem clean_item(std::string source = "claim-1/session.json",
                            std::string claim = "claim-1") {
  AuditItem it;
  it.source = std::move(source);
  it.claim = std::move(claim);
  it.kind = ItemKind::session;
  it.session = clean_session();
  return it;
}

// Audit clock 2026-12-01T00:00:00Z, claim date 2026-11-01 (18 days after the weighing).
inline AuditOptions clean_options() {
  AuditOptions o;
  o.now = 1796083200;  // 2026-12-01T00:00:00Z (Python datetime)
  o.claim_date = "2026-11-01";
  o.trust_list_given = true;
  return o;
}

inline std::vector<std::string> codes_of(const std::vector<Finding>& fs) {
  std::vector<std::string> out;
  for (const auto& f : fs) out.push_back(f.code);
  return out;
}

}  // namespace sp::audit::test
