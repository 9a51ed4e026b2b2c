#include "report/record.h"

#include <algorithm>
#include <cmath>

#include "core/error.h"
#include "engine/result.h"
#include "report/signer.h"

namespace sp::report {
namespace {

// Normalises numbers so the text is canonical: integral doubles become integers, -0 becomes 0.
nlohmann::json normalised(const nlohmann::json& v, const std::string& path) {
  switch (v.type()) {
    case nlohmann::json::value_t::object: {
      nlohmann::json out = nlohmann::json::object();  // std::map: keys sorted by bytes
      for (auto it = v.begin(); it != v.end(); ++it)
        out[it.key()] = normalised(*it, path + "." + it.key());
      return out;
    }
    case nlohmann::json::value_t::array: {
      nlohmann::json out = nlohmann::json::array();
      for (std::size_t i = 0; i < v.size(); ++i) {
        out.push_back(normalised(v[i], path + "[" + std::to_string(i) + "]"));
      }
      return out;
    }
    case nlohmann::json::value_t::number_float: {
      double d = v.get<double>();
      if (!std::isfinite(d))
        throw data_error("weigh record: " + path + ": expected a finite number");
      // 2^53: beyond it not every integer is a double, so keep the float form.
      if (d == std::floor(d) && std::fabs(d) < 9007199254740992.0) {
        return static_cast<std::int64_t>(d);
      }
      return d;
    }
    default:
      return v;
  }
}

bool numbers_agree(double a, double b) {
  double scale = std::max({1.0, std::fabs(a), std::fabs(b)});
  return std::fabs(a - b) <= kRecomputeTolerance * scale;
}

// How results are compared: strictly, or as results from before the verdict (record.h).
struct Mode {
  bool legacy = false;
};

// Free text of a pre-verdict result, reworded since: never compared.
bool legacy_wording(const std::string& key) {
  return key == "message" || key == "label" || key == "note" || key == "unsolved";
}

// A flag as a legacy comparison sees it: everything but its wording.
nlohmann::json flag_identity(const nlohmann::json& f) {
  nlohmann::json id = nlohmann::json::object();
  if (!f.is_object()) return f;
  for (const char* k : {"code", "severity", "ticket", "platform", "field", "needed"}) {
    if (f.contains(k)) id[k] = f.at(k);
  }
  return id;
}

bool same_flag(const nlohmann::json& a, const nlohmann::json& b);

void compare(const nlohmann::json& a, const nlohmann::json& b, const std::string& path,
             std::vector<std::string>& out, std::size_t max_lines, Mode mode);

// Legacy flags: each stated flag is raised again; a recomputed flag the record lacks is a
// difference unless it is of a kind added since (rating-over).
void compare_legacy_flags(const nlohmann::json& a, const nlohmann::json& b, const std::string& path,
                          std::vector<std::string>& out, std::size_t max_lines) {
  std::vector<bool> used(b.size(), false);
  for (std::size_t i = 0; i < a.size() && out.size() < max_lines; ++i) {
    bool found = false;
    for (std::size_t k = 0; k < b.size() && !found; ++k) {
      if (!used[k] && same_flag(a[i], b[k])) used[k] = found = true;
    }
    if (!found)
      out.push_back(path + "[" + std::to_string(i) + "]: record " + flag_identity(a[i]).dump() +
                    ", not recomputed");
  }
  for (std::size_t k = 0; k < b.size() && out.size() < max_lines; ++k) {
    const bool added_since = b[k].is_object() && b[k].value("code", "") == kRatingOverFlag;
    if (!used[k] && !added_since) {
      out.push_back(path + ": recomputed " + flag_identity(b[k]).dump() +
                    ", missing from the record");
    }
  }
}

bool same_flag(const nlohmann::json& a, const nlohmann::json& b) {
  std::vector<std::string> diffs;
  compare(flag_identity(a), flag_identity(b), "", diffs, 1, Mode{false});
  return diffs.empty();
}

void compare(const nlohmann::json& a, const nlohmann::json& b, const std::string& path,
             std::vector<std::string>& out, std::size_t max_lines, Mode mode) {
  if (out.size() >= max_lines) return;
  if (a.is_number() && b.is_number()) {
    if (!numbers_agree(a.get<double>(), b.get<double>())) {
      out.push_back(path + ": record " + a.dump() + ", recomputed " + b.dump());
    }
    return;
  }
  if (a.type() != b.type()) {
    out.push_back(path + ": record " + a.dump() + ", recomputed " + b.dump());
    return;
  }
  if (a.is_object()) {
    for (auto it = a.begin(); it != a.end(); ++it) {
      const std::string at = path + "." + it.key();
      if (mode.legacy && legacy_wording(it.key())) continue;
      if (!b.contains(it.key())) {
        out.push_back(at + ": in the record, not recomputed");
      } else if (mode.legacy && it.key() == "flags" && it->is_array() &&
                 b.at(it.key()).is_array()) {
        compare_legacy_flags(*it, b.at(it.key()), at, out, max_lines);
      } else {
        compare(*it, b.at(it.key()), at, out, max_lines, mode);
      }
    }
    if (mode.legacy) return;  // keys added since are not held against an old record
    for (auto it = b.begin(); it != b.end(); ++it) {
      if (!a.contains(it.key()))
        out.push_back(path + "." + it.key() + ": recomputed, missing from the record");
    }
  } else if (a.is_array()) {
    if (a.size() != b.size()) {
      out.push_back(path + ": record has " + std::to_string(a.size()) + " entries, recomputed " +
                    std::to_string(b.size()));
      return;
    }
    for (std::size_t i = 0; i < a.size(); ++i) {
      compare(a[i], b[i], path + "[" + std::to_string(i) + "]", out, max_lines, mode);
    }
  } else if (a != b) {
    out.push_back(path + ": record " + a.dump() + ", recomputed " + b.dump());
  }
}

}  // namespace

std::string canonical_json(const nlohmann::json& value) {
  // dump(): no indent, no spaces; ensure_ascii false; strict UTF-8 (throws on invalid).
  try {
    return normalised(value, "$").dump(-1, ' ', false, nlohmann::json::error_handler_t::strict);
  } catch (const nlohmann::json::exception& e) {
    throw data_error(std::string("weigh record: ") + e.what());
  }
}

std::string report_id(const nlohmann::json& record_without_id) {
  return "SP-" + to_hex(sha256(canonical_json(record_without_id))).substr(0, 12);
}

nlohmann::json build_record(const nlohmann::json& session, const nlohmann::json& results,
                            const RecordMeta& meta) {
  nlohmann::json report = {
      {"issued_at", meta.issued_at ? nlohmann::json(*meta.issued_at) : nlohmann::json(nullptr)},
      {"signed_by", meta.signed_by ? nlohmann::json(*meta.signed_by) : nlohmann::json(nullptr)},
      {"paper", meta.paper},
      {"software", meta.software},
      {"public_key", to_hex(meta.public_key)},
      {"key_fingerprint", fingerprint(meta.public_key)},
  };
  nlohmann::json ledger = nullptr;
  if (meta.ledger) {
    ledger = {{"rows", meta.ledger->rows}, {"head", meta.ledger->head}, {"checkpoint", nullptr}};
    if (const auto& c = meta.ledger->checkpoint) {
      ledger["checkpoint"] = {
          {"position", c->position},
          {"rows", c->rows},
          {"head", c->head},
          {"signed_at", c->signed_at},
          {"signed_by", c->signed_by ? nlohmann::json(*c->signed_by) : nlohmann::json(nullptr)},
          {"key_fingerprint", c->key_fingerprint},
          {"public_key", c->public_key},
          {"signature", c->signature}};
    }
  }
  nlohmann::json record = {{"format", kRecordFormat},
                           {"report", report},
                           {"session", session},
                           {"results", results},
                           {"ledger", ledger}};
  record["report"]["id"] = report_id(record);
  return record;
}

std::optional<LedgerAnchor> record_ledger(const nlohmann::json& record) {
  auto it = record.find("ledger");
  if (it == record.end() || it->is_null()) return std::nullopt;
  try {
    LedgerAnchor a;
    a.rows = it->at("rows").get<long long>();
    a.head = it->at("head").get<std::string>();
    const nlohmann::json& c = it->at("checkpoint");
    if (!c.is_null()) {
      CheckpointRef r;
      r.position = c.at("position").get<long long>();
      r.rows = c.at("rows").get<long long>();
      r.head = c.at("head").get<std::string>();
      r.signed_at = c.at("signed_at").get<std::string>();
      if (!c.at("signed_by").is_null()) r.signed_by = c.at("signed_by").get<std::string>();
      r.key_fingerprint = c.at("key_fingerprint").get<std::string>();
      r.public_key = c.at("public_key").get<std::string>();
      r.signature = c.at("signature").get<std::string>();
      a.checkpoint = r;
    }
    return a;
  } catch (const nlohmann::json::exception& e) {
    throw data_error(std::string("weigh record: $.ledger: expected {rows, head, checkpoint}: ") +
                     e.what());
  }
}

namespace {

bool is_wording_key(const std::string& key) {
  return key == "message" || key == "label" || key == "note" || key == "unsolved";
}

// Copies `stated`'s strings over `v` wherever both hold a string at the same path (only under
// wording keys), recursing through objects and equal-length arrays.
void keep_stated_wording(nlohmann::json& v, const nlohmann::json& stated, bool wording) {
  if (v.is_string() && stated.is_string()) {
    if (wording) v = stated;
  } else if (v.is_object() && stated.is_object()) {
    for (auto it = v.begin(); it != v.end(); ++it) {
      auto s = stated.find(it.key());
      if (s != stated.end()) keep_stated_wording(*it, *s, wording || is_wording_key(it.key()));
    }
  } else if (v.is_array() && stated.is_array() && v.size() == stated.size()) {
    for (std::size_t i = 0; i < v.size(); ++i) keep_stated_wording(v[i], stated[i], wording);
  }
}

}  // namespace

nlohmann::json results_as_format1(const nlohmann::json& recomputed, const nlohmann::json& stated) {
  nlohmann::json v = recomputed;
  if (!v.is_object()) return v;
  for (const char* k :
       {"verdict", "verdict_reason", "uncertainty", "tow_steer", "tow_drive", "if_excluded"}) {
    v.erase(k);
  }
  if (auto t = v.find("target"); t != v.end() && t->is_object()) {
    t->erase("provisional");
    t->erase("whole_step");
  }
  if (auto ts = v.find("tensioned"); ts != v.end() && ts->is_array()) {
    for (auto& p : *ts) {
      if (p.is_object()) p.erase("note");
    }
  }
  if (auto fs = v.find("flags"); fs != v.end() && fs->is_array()) {
    nlohmann::json kept = nlohmann::json::array();
    for (auto& f : *fs) {
      if (f.is_object() && f.value("code", "") == "rating-over") continue;
      if (f.is_object()) f.erase("rating");
      kept.push_back(f);
    }
    *fs = kept;
  }
  keep_stated_wording(v, stated, false);
  return v;
}

std::vector<std::string> compare_results(const nlohmann::json& stated,
                                         const nlohmann::json& recomputed, std::size_t max_lines) {
  std::vector<std::string> out;
  const Mode mode{stated.is_object() && !stated.contains("verdict")};
  compare(normalised(stated, "$"), normalised(recomputed, "$"), "$", out, max_lines, mode);
  return out;
}

}  // namespace sp::report
