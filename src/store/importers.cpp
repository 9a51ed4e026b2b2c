#include "store/importers.h"

#include <fmt/format.h>

#include <map>
#include <vector>

#include "core/error.h"
#include "format/pass_csv.h"
#include "format/validate.h"

namespace sp::store {

namespace {
// "<source>:<line>: <column>", the CSV's names for the validator (built only on failure).
class CsvLineNames final : public validate::FieldNames {
 public:
  CsvLineNames(const std::string& source, const long& line) : source_(source), line_(line) {}
  std::string name(std::string_view field) const override {
    return fmt::format("{}:{}: {}", source_, line_, field);
  }

 private:
  const std::string& source_;
  const long& line_;
};
}  // namespace

ImportStats import_pass_csv(Store& store, std::istream& in, const std::string& source,
                            const std::optional<std::string>& by,
                            const std::function<void(long long, std::uint64_t)>& progress) {
  PassCsvReader reader(in, source);
  ImportStats stats;
  CsvPassRow row;
  std::string last_ref;
  long long session_id = 0;
  WeightUnit unit = WeightUnit::lb;  // the current session's scale unit
  const CsvLineNames names(source, row.line);
  std::map<std::string, std::pair<long long, WeightUnit>> scale_ids;  // code -> id, unit
  std::map<std::string, long long> rig_ids;  // rig name -> id (rigs repeat across sessions)
  // Consecutive passes of one session go to the store together (one INSERT for up to kBatch
  // rows, Store::add_passes). With the INSERT guard in place one row a statement was cheaper
  // (a table with an INSERT trigger makes SQLite stage a multi-row INSERT in a temporary
  // table first); `import` lifts that guard for its transaction (Store::begin_bulk), and then
  // batches are cheaper again (callgrind, 10^4 rows: 546.6 M instructions with 1 row a
  // statement, 528.7 M with 16; bench/README.md). Without begin_bulk both are correct.
  constexpr size_t kBatch = 16;
  std::vector<Pass> pending;
  std::vector<long> pending_lines;
  auto at_line = [&](long line, const Error& e) {
    if (e.code() == ExitCode::no_input) {
      return Error(ExitCode::data_error, fmt::format("{}:{}: {}", source, line, e.what()));
    }
    return e.within(fmt::format("{}:{}", source, line));
  };
  auto flush = [&]() -> long long {
    if (pending.empty()) return 0;
    std::vector<long long> ids;
    try {
      ids = store.add_passes(session_id, pending);
    } catch (const Error& batch_error) {
      // Nothing of the batch was stored: replay it row by row so the message names the line.
      for (size_t k = 0; k < pending.size(); ++k) {
        try {
          store.add_pass(session_id, pending[k]);
        } catch (const Error& e) {
          throw at_line(pending_lines[k], e);
        }
      }
      throw at_line(pending_lines.front(), batch_error);
    }
    long long before = stats.passes;
    stats.passes += static_cast<long long>(ids.size());
    if (progress && before / 4096 != stats.passes / 4096)
      progress(stats.passes, reader.bytes_read());
    pending.clear();
    pending_lines.clear();
    return ids.back();
  };
  while (reader.next(row)) {
    try {
      if (session_id == 0 || row.session != last_ref) {
        flush();
        auto found = store.find_session_by_ref(row.session);
        if (found) {
          session_id = *found;
          Session s = store.load_session(session_id);
          unit = s.units.weight;
          if (row.scale) {
            if (s.scale.id != *row.scale) {
              throw data_error(fmt::format("scale: session {} is on scale {}, the row says {}",
                                           row.session, s.scale.id, *row.scale));
            }
          }
          ++stats.sessions_joined;
        } else {
          if (!row.scale)
            throw data_error("scale: expected the scale id to open session " + row.session);
          if (!row.rig)
            throw data_error("rig: expected the rig name to open session " + row.session);
          auto it = scale_ids.find(*row.scale);
          if (it == scale_ids.end()) {
            auto sc = store.find_scale(*row.scale);
            if (!sc) {
              throw Error(ExitCode::data_error,
                          "scale: " + *row.scale +
                              " is not in the store (add it with `scaleproof scale add`)");
            }
            it = scale_ids.emplace(*row.scale, std::pair{sc->id, sc->unit}).first;
          }
          unit = it->second.second;
          auto rit = rig_ids.find(*row.rig);
          if (rit == rig_ids.end()) {
            auto rig = store.find_rig(*row.rig);
            if (!rig) {
              throw data_error("rig: " + *row.rig +
                               " is not in the store (add it with `scaleproof rig add`)");
            }
            rit = rig_ids.emplace(*row.rig, rig->id).first;
          }
          NewSession ns;
          ns.ref = row.session;
          ns.rig_id = rit->second;
          ns.scale_id = it->second.first;
          ns.operator_name = row.operator_name;
          ns.opened_by = by;
          session_id = store.open_session(ns);
          ++stats.sessions_opened;
        }
        last_ref = row.session;
      }
    } catch (const Error& e) {
      throw at_line(row.line, e);
    }
    // The row's own checks, named by line and column (the store checks again, by ticket).
    validate::pass(row.pass, unit, names);
    if (!row.pass.entered_by) row.pass.entered_by = by;
    if (row.correction_reason) {
      // A correction row supersedes the pass of its ticket, stored before it: in the store
      // already, or earlier in this file (hence the flush).
      flush();
      try {
        auto pass_id = store.find_pass(session_id, row.pass.ticket);
        if (!pass_id) {
          throw data_error(
              fmt::format("correction_reason: ticket {} has no pass in session {} "
                          "to correct (a correction row comes after its pass)",
                          row.pass.ticket, row.session));
        }
        store.correct_pass(*pass_id, session_id, row.pass, *row.correction_reason,
                           row.pass.entered_by, row.pass.entered_at.value_or(""));
        ++stats.corrected;
        if (row.void_reason) {
          store.void_pass(*pass_id, *row.void_reason, row.pass.entered_by, "");
          ++stats.voided;
        }
      } catch (const Error& e) {
        throw at_line(row.line, e);
      }
      continue;
    }
    const std::optional<std::string> entered_by =
        row.void_reason ? row.pass.entered_by : std::nullopt;
    pending.push_back(std::move(row.pass));  // the reader sets every field of the next row
    pending_lines.push_back(row.line);
    if (row.void_reason) {
      long long pass_id = flush();
      try {
        store.void_pass(pass_id, *row.void_reason, entered_by, "");
      } catch (const Error& e) {
        throw at_line(row.line, e);
      }
      ++stats.voided;
    } else if (pending.size() == kBatch) {
      flush();
    }
  }
  flush();
  if (progress) progress(stats.passes, reader.bytes_read());
  if (stats.passes == 0) throw data_error(source + ": no passes (only a header)");
  return stats;
}

namespace {

bool same(const std::optional<double>& a, const std::optional<double>& b) {
  return a == b;
}

bool same_rig(const RigRecord& r, const Session& s) {
  const TowVehicle& a = r.vehicle;
  const TowVehicle& b = s.tow_vehicle;
  return r.units.weight == s.units.weight && r.units.length == s.units.length &&
         a.label == b.label && a.wheelbase == b.wheelbase &&
         a.rear_axle_to_ball == b.rear_axle_to_ball && same(a.gvwr, b.gvwr) &&
         same(a.front_gawr, b.front_gawr) && same(a.rear_gawr, b.rear_gawr) &&
         same(a.gcwr, b.gcwr) && same(a.hitch_tongue_rating, b.hitch_tongue_rating) &&
         same(a.hitch_trailer_rating, b.hitch_trailer_rating) &&
         same(a.falr_target, b.falr_target) && r.trailer.label == s.trailer.label &&
         r.trailer.type == s.trailer.type && r.trailer.ball_to_axle == s.trailer.ball_to_axle &&
         same(r.trailer.gvwr, s.trailer.gvwr) && same(r.trailer.axle_gawr, s.trailer.axle_gawr);
}

template <class T>
void must_match(const std::string& scale, const char* field, const T& stored, const T& given) {
  if (!(stored == given)) {
    throw data_error(
        fmt::format("scale {}: {} differs from the scale of that id already in the "
                    "store; give the scale another id or fix the file",
                    scale, field));
  }
}

long long scale_for(Store& store, const Session& s, const std::optional<std::string>& by) {
  auto sc = store.find_scale(s.scale.id);
  if (!sc) return store.add_scale(s.scale, s.units.weight, by, "");
  const ScaleInfo& a = sc->info;
  const ScaleInfo& b = s.scale;
  must_match(b.id, "unit", sc->unit, s.units.weight);
  must_match(b.id, "division", a.division, b.division);
  must_match(b.id, "accuracy_class", a.accuracy_class, b.accuracy_class);
  must_match(b.id, "capacity", a.capacity, b.capacity);
  must_match(b.id, "reading_uncertainty", a.reading_uncertainty, b.reading_uncertainty);
  if (b.name) must_match(b.id, "name", a.name, b.name);
  if (b.location) must_match(b.id, "location", a.location, b.location);
  if (b.last_inspected) {
    bool known = false;
    for (const auto& i : store.inspections(sc->id))
      known = known || i.inspected_on == *b.last_inspected;
    if (!known) {
      Inspection i;
      i.scale_id = sc->id;
      i.inspected_on = *b.last_inspected;
      i.notes = "date taken from an imported session file";
      i.entered_by = by;
      store.add_inspection(i);
    }
  }
  return sc->id;
}

long long rig_for(Store& store, const Session& s, const std::optional<std::string>& by) {
  for (const auto& r : store.list_rigs()) {
    if (same_rig(r, s)) return r.id;
  }
  RigRecord r;
  std::string base = s.tow_vehicle.label + " + " + s.trailer.label;
  r.name = base;
  for (int k = 2; store.find_rig(r.name); ++k) r.name = fmt::format("{} ({})", base, k);
  r.units = s.units;
  r.vehicle = s.tow_vehicle;
  r.trailer = s.trailer;
  r.entered_by = by;
  return store.add_rig(r);
}

}  // namespace

long long import_session(Store& store, const Session& session, const std::string& source,
                         const std::optional<std::string>& by) {
  try {
    NewSession ns;
    ns.scale_id = scale_for(store, session, by);
    ns.rig_id = rig_for(store, session, by);
    ns.station = session.station;
    ns.operator_name = session.operator_name;
    ns.owner = session.owner;
    ns.notes = session.notes;
    ns.length_uncertainty = session.length_uncertainty;
    ns.opened_by = by;
    long long id = store.open_session(ns);
    for (size_t i = 0; i < session.passes.size(); ++i) {
      Pass p = session.passes[i];
      try {
        if (!p.entered_by) p.entered_by = by;
        long long pid = store.add_pass(id, p);
        if (p.voided) {
          store.void_pass(pid, p.void_reason.value_or("voided in the imported session file"),
                          p.entered_by, "");
        }
      } catch (const Error& e) {
        throw e.within(fmt::format("$.passes[{}]", i));
      }
    }
    return id;
  } catch (const Error& e) {
    throw e.within(source);
  }
}

std::string export_pass_csv(const SessionHistory& h) {
  std::string text = pass_csv_header();
  CsvPassRow row;
  row.session = h.ref.value_or(fmt::format("session-{}", h.session.session_id.value_or(0)));
  row.scale = h.session.scale.id;
  row.rig = h.rig_name;
  row.operator_name = h.session.operator_name;
  for (const Pass& p : h.session.passes) {
    std::vector<const PassCorrection*> mine;
    for (const auto& c : h.pass_corrections) {
      if (c.pass_id == p.id) mine.push_back(&c);
    }
    row.correction_reason.reset();
    row.pass = mine.empty() ? p : mine.front()->was;
    write_pass_csv_row(text, row);
    for (const auto* c : mine) {
      row.pass = c->now;
      row.pass.voided = c == mine.back() && p.voided;
      row.pass.void_reason = row.pass.voided ? p.void_reason : std::nullopt;
      row.correction_reason = c->reason;
      write_pass_csv_row(text, row);
    }
  }
  return text;
}

}  // namespace sp::store
