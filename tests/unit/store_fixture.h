// Shared set-up for the store tests: a store in a temp file (so a second, raw SQLite
// connection can play the part of someone editing the file behind the tool's back), and
// invented demo records (no real stations, people or vehicles).
#pragma once
#include <sqlite3.h>
#include <unistd.h>

#include <cstdio>
#include <cstdlib>
#include <memory>
#include <string>

#include "core/error.h"
#include "store/store.h"

namespace storetest {

using namespace sp;
using namespace sp::store;

struct TempStore {
  std::string dir, path;
  std::unique_ptr<Store> store;
  // parallel_check_rows: see Options (tests pass 2 to run check_chain's two-thread path).
  explicit TempStore(long long parallel_check_rows = Options{}.parallel_check_rows) {
    char tmpl[] = "/tmp/sp-store-test-XXXXXX";
    dir = mkdtemp(tmpl);
    path = dir + "/store.db";
    Options o;
    o.create = true;
    o.parallel_check_rows = parallel_check_rows;
    store = open_sqlite_store(path, o);
  }
  ~TempStore() {
    store.reset();
    for (const char* s : {"", "-wal", "-shm"}) std::remove((path + s).c_str());
    rmdir(dir.c_str());
  }
  // Runs SQL on a separate plain connection (no foreign keys, no defensive mode, like the
  // stock sqlite3 shell). Returns "" on success, else SQLite's message.
  std::string raw(const std::string& sql) const {
    sqlite3* db = nullptr;
    sqlite3_open(path.c_str(), &db);
    char* err = nullptr;
    int rc = sqlite3_exec(db, sql.c_str(), nullptr, nullptr, &err);
    std::string msg = rc == SQLITE_OK ? "" : (err != nullptr ? err : "error");
    sqlite3_free(err);
    sqlite3_close(db);
    return msg;
  }
};

inline ScaleInfo demo_scale(const std::string& code = "ST-3") {
  ScaleInfo s;
  s.id = code;
  s.division = 20;  // lb; typical vehicle-scale division (common practice, references.md)
  s.accuracy_class = "IIIL";
  s.name = "North lane";
  s.location = "Kettle Flats weigh station";
  s.capacity = 60000;
  s.last_inspected = "2026-03-14";
  return s;
}

inline RigRecord demo_rig(const std::string& name = "heron-wren") {
  RigRecord r;
  r.name = name;
  r.units = Units{WeightUnit::lb, LengthUnit::in};
  r.vehicle.label = "Blue Heron 2500 crew cab";
  r.vehicle.wheelbase = 160;
  r.vehicle.rear_axle_to_ball = 52;
  r.vehicle.gvwr = 10000;
  r.vehicle.front_gawr = 5200;
  r.vehicle.rear_gawr = 6000;
  r.vehicle.falr_target = 50;
  r.trailer.label = "Marsh Wren 22 travel trailer";
  r.trailer.ball_to_axle = 180;
  r.trailer.gvwr = 7000;
  return r;
}

inline Pass make_pass(PassKind kind, const std::string& ticket, double steer, double drive,
                      std::optional<double> trailer = std::nullopt,
                      std::optional<std::string> setting = std::nullopt) {
  Pass p;
  p.kind = kind;
  p.ticket = ticket;
  p.weighed_at = "2026-11-03T09:14:00-06:00";
  p.steer = steer;
  p.drive = drive;
  p.trailer = trailer;
  p.setting = std::move(setting);
  p.entered_by = "R. Quill";
  return p;
}

// One scale, one rig, one open session; returns the session id.
inline long long seed_session(Store& s, const ScaleInfo& scale_info = demo_scale()) {
  s.begin_write();
  long long scale = s.add_scale(scale_info, WeightUnit::lb, std::string("R. Quill"), "");
  long long rig = s.add_rig(demo_rig());
  NewSession ns;
  ns.rig_id = rig;
  ns.scale_id = scale;
  ns.operator_name = "R. Quill";
  long long id = s.open_session(ns);
  s.commit();
  return id;
}

// A consistent set of passes (invented, from the statics in references.md with WB 160 in,
// o 52 in, L 180 in, T 800 lb, M 14 897 lb·in, readings rounded to the 20 lb division):
// unhitched, hitched, tensioned. Every pass totals 15 500 lb.
inline void add_demo_passes(Store& s, long long session) {
  s.begin_write();
  s.add_pass(session, make_pass(PassKind::unhitched, "A-1001", 4600, 3900));
  s.add_pass(session, make_pass(PassKind::hitched, "A-1002", 4340, 4960, 6200));
  s.add_pass(session, make_pass(PassKind::tensioned, "A-1003", 4460, 4760, 6280, "4"));
  s.commit();
}

}  // namespace storetest
