#include "audit/load.h"

#include <algorithm>
#include <filesystem>
#include <map>
#include <nlohmann/json.hpp>
#include <system_error>

#include "core/error.h"
#include "engine/reconcile.h"
#include "format/session_json.h"
#include "report/cms_signature.h"
#include "report/key_files.h"
#include "report/pdf_extract.h"
#include "report/record.h"
#include "report/recompute.h"
#include "report/report_pdf.h"
#include "report/signer.h"
#include "report/verify.h"

namespace fs = std::filesystem;

namespace sp::audit {
namespace {

// A weigh-report is well under a megabyte; 256 MiB guards against reading a wrong, huge file
// (same limit as `scaleproof verify`).
constexpr std::uintmax_t kMaxInputBytes = 256u << 20;

std::string lower(std::string s) {
  std::transform(s.begin(), s.end(), s.begin(),
                 [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
  return s;
}

std::string claim_of_file(const std::string& path) {
  fs::path parent = fs::path(path).parent_path();
  return parent.empty() ? "." : parent.lexically_normal().string();
}

// Reads a whole input file for the audit, refusing absurd sizes. Throws sp::Error naming it.
std::string read_input(const std::string& path) {
  std::error_code ec;
  auto size = fs::file_size(path, ec);
  if (!ec && size > kMaxInputBytes) {
    throw data_error(path + ": larger than 256 MiB; not a weigh-report or session file");
  }
  return report::read_file_bytes(path);
}

const report::VerifyCheck* find_check(const report::VerifyResult& r, const std::string& name) {
  for (const auto& c : r.checks) {
    if (c.name == name) return &c;
  }
  return nullptr;
}

void load_one(const std::string& path, const std::string& claim,
              const std::vector<TrustedKey>& trusted, const LoadSinks& sinks) {
  const std::string ext = lower(fs::path(path).extension().string());
  std::optional<AuditItem> item;
  if (ext == ".pdf") {
    item = load_report(path, claim, trusted, sinks);
  } else if (ext == ".json") {
    item = load_session_file(path, claim, sinks);
  } else if (ext == ".sig") {
    std::string pdf = path.substr(0, path.size() - 4);
    if (!fs::exists(pdf)) sinks.skipped(path, "a detached signature without its PDF beside it");
    return;
  } else {
    sinks.skipped(path, "neither a weigh-report (.pdf) nor a session file (.json)");
    return;
  }
  if (item) sinks.item(*item);
}

}  // namespace

std::vector<TrustedKey> load_trusted_keys(const std::vector<std::string>& paths) {
  std::vector<TrustedKey> out;
  for (auto& e : report::load_trust(paths).entries)
    out.push_back(TrustedKey{e.source, e.fingerprint, e});
  return out;
}

void reconcile_item(AuditItem& item) {
  try {
    item.result = reconcile(item.session);
  } catch (const Error& e) {
    item.result.reset();
    item.reconcile_error = e.what();
  }
}

std::optional<AuditItem> load_session_file(const std::string& path, const std::string& claim,
                                           const LoadSinks& sinks) {
  AuditItem item;
  try {
    item.session = parse_session_json(read_input(path), path);
  } catch (const Error& e) {
    sinks.unreadable(Unreadable{path, e.what()});
    return std::nullopt;
  }
  item.source = path;
  item.claim = claim;
  item.kind = ItemKind::session;
  reconcile_item(item);
  return item;
}

namespace {
// The anchor the report's record names (none for a record from a session file or of format 1;
// a malformed one counts as none: the record form check has judged the record already).
AnchorFacts recorded_anchor(const std::string& pdf, const std::string& report_id) {
  AnchorFacts a;
  a.report_id = report_id;
  std::optional<std::string> text = report::find_attachment(pdf, report::kRecordAttachment);
  if (!text || report::json_depth(*text) > 64) return a;
  nlohmann::json record = nlohmann::json::parse(*text, nullptr, false);
  if (!record.is_object()) return a;
  try {
    if (auto l = report::record_ledger(record)) {
      a.recorded = true;
      a.rows = l->rows;
      a.head = l->head;
    }
  } catch (const Error&) {
    a.recorded = false;
  }
  return a;
}
}  // namespace

std::optional<AuditItem> load_report(const std::string& path, const std::string& claim,
                                     const std::vector<TrustedKey>& trusted,
                                     const LoadSinks& sinks) {
  AuditItem item;
  item.source = path;
  item.claim = claim;
  item.kind = ItemKind::report;
  try {
    const std::string pdf = read_input(path);
    report::VerifyOptions opt;  // no station key: each report is checked against its own key,
                                // then that key against the trust list
    const std::string sig_path = path + ".sig";
    const bool has_sig = fs::exists(sig_path);
    if (has_sig) opt.detached_signature = report::read_file_bytes(sig_path);
    // Recompute once, keeping the session and the result for the audit rules.
    std::optional<Session> session;
    opt.recompute = [&](const nlohmann::json& sj) {
      session = parse_session_json(sj.dump(), path + ": " + report::kRecordAttachment + ": session");
      item.session = *session;
      try {
        item.result = reconcile(*session);
      } catch (const Error& e) {
        item.reconcile_error = e.what();
        throw;
      }
      return report::results_json(*item.result);
    };
    report::VerifyResult vr = report::verify_report_bytes(pdf, opt);
    if (!vr.is_report) {
      sinks.unreadable(Unreadable{path, path + ": " + vr.not_report_reason});
      return std::nullopt;
    }
    if (!session) {
      const auto* c = find_check(vr, "results");
      sinks.unreadable(Unreadable{
          path, path + ": the embedded weigh record holds no readable session" +
                    (c ? " (" + c->detail + ")" : std::string())});
      return std::nullopt;
    }
    VerificationFacts v;
    const auto* sigc = find_check(vr, "record signature");
    const auto* form = find_check(vr, "record form");
    // A record that is not in canonical form was not written by a signer: its signature cannot
    // be relied on either.
    v.record_signature_ok = sigc && sigc->status == report::CheckStatus::passed && form &&
                            form->status == report::CheckStatus::passed;
    v.key_fingerprint = vr.fingerprint;
    v.key_trusted = std::any_of(trusted.begin(), trusted.end(), [&](const TrustedKey& k) {
      return !vr.fingerprint.empty() && k.fingerprint == vr.fingerprint;
    });
    if (v.key_trusted) {
      report::TrustList list;
      for (const auto& k : trusted) list.entries.push_back(k.entry);
      std::optional<std::string> latest;
      if (!item.session.passes.empty()) {
        std::optional<std::int64_t> best;
        for (const auto& p : item.session.passes) {
          auto t = report::iso_utc_seconds(p.weighed_at);
          if (t && (!best || *t > *best)) {
            best = t;
            latest = p.weighed_at;
          }
        }
      }
      report::TrustVerdict tv = report::check_trust(list, vr.fingerprint, vr.issued_at, latest);
      v.key_in_validity = tv.ok;
      v.key_validity_detail = tv.detail;
    }
    v.file_size = static_cast<long long>(pdf.size());
    const auto* inf = find_check(vr, "in-file signature");
    v.in_file_present = inf && inf->status != report::CheckStatus::skipped;
    v.in_file_ok = inf && inf->status == report::CheckStatus::passed;
    if (v.in_file_present && !v.in_file_ok) v.in_file_problem = inf->detail;
    if (vr.in_file && vr.in_file->holds_over_range && !vr.in_file->whole_file) {
      v.in_file_covered_end = vr.in_file->covered_end;
    }
    v.detached_present = has_sig;
    const auto* det = find_check(vr, "detached signature");
    v.detached_ok = det && det->status == report::CheckStatus::passed;
    const auto* res = find_check(vr, "results");
    v.record_matches = !item.reconcile_error && !(res && res->status == report::CheckStatus::failed);
    if (!v.record_matches && res && !item.reconcile_error) {
      // compare_results lines follow the first line of the detail, indented.
      std::string d = res->detail;
      std::size_t pos = d.find('\n');
      while (pos != std::string::npos) {
        std::size_t next = d.find('\n', pos + 1);
        std::string line = d.substr(pos + 1, next == std::string::npos ? std::string::npos : next - pos - 1);
        line.erase(0, line.find_first_not_of(' '));
        if (!line.empty()) v.mismatches.push_back(line);
        pos = next;
      }
      if (v.mismatches.empty()) v.mismatches.push_back(d);
    }
    item.verification = v;
    item.anchor = recorded_anchor(pdf, vr.report_id);
  } catch (const Error& e) {
    sinks.unreadable(Unreadable{path, e.what()});
    return std::nullopt;
  }
  return item;
}

void load_paths(const std::vector<std::string>& paths, const std::vector<TrustedKey>& trusted,
                const LoadSinks& sinks) {
  for (const auto& p : paths) {
    std::error_code ec;
    if (fs::is_directory(p, ec)) {
      const std::string claim = fs::path(p).lexically_normal().string();
      std::vector<std::string> files;
      for (auto it = fs::recursive_directory_iterator(p, ec); !ec && it != fs::recursive_directory_iterator();
           it.increment(ec)) {
        if (it->is_regular_file()) files.push_back(it->path().string());
      }
      if (ec) {
        sinks.unreadable(Unreadable{p, p + ": cannot list the folder: " + ec.message()});
        continue;
      }
      std::sort(files.begin(), files.end());
      if (files.empty()) {
        sinks.unreadable(Unreadable{p, p + ": empty folder: expected weigh-reports (.pdf) or "
                                           "session files (.json)"});
      }
      for (const auto& f : files) load_one(f, claim, trusted, sinks);
    } else if (fs::exists(p, ec)) {
      load_one(p, claim_of_file(p), trusted, sinks);
    } else {
      sinks.unreadable(Unreadable{p, p + ": no such file or folder"});
    }
  }
}

namespace {

// load_store_sessions inside the caller's read transaction.
void load_store_in_txn(store::Store& st, const std::string& store_label,
                       std::optional<long long> session_id, const LoadSinks& sinks) {
  // Inspection histories by scale code, read once: the per-session loop does no extra query.
  std::map<std::string, std::vector<Inspection>> history;
  for (const auto& sc : st.list_scales()) {
    auto& h = history[sc.info.id];
    for (const auto& i : st.inspections(sc.id)) h.push_back(Inspection{i.inspected_on, i.seal});
  }
  // One item reused for every session: assigning into it reuses its strings' and vectors'
  // buffers instead of allocating them afresh per session.
  AuditItem item;
  auto emit = [&](const Session& s) {
    item.result.reset();
    item.reconcile_error.reset();
    item.source = store_label + "#" + std::to_string(s.session_id.value_or(0));
    item.claim = store_label;
    item.kind = ItemKind::store;
    item.session = s;
    auto h = history.find(s.scale.id);
    item.inspections = h != history.end() ? h->second : std::vector<Inspection>{};
    reconcile_item(item);
    sinks.item(item);
  };
  if (session_id) {
    emit(st.load_session(*session_id));
  } else {
    st.for_each_session(emit);
  }
}

}  // namespace

void load_store_sessions(store::Store& st, const std::string& store_label,
                         std::optional<long long> session_id, const LoadSinks& sinks) {
  store::Txn txn(st, store::Txn::read);
  load_store_in_txn(st, store_label, session_id, sinks);
}

AuditResult audit_store_streamed(store::Store& st, const std::string& store_label,
                                 std::optional<long long> session_id, const AuditOptions& options,
                                 const std::vector<std::string>& trusted_keys,
                                 AuditStreamWriter& writer, std::ostream& out) {
  Auditor auditor(options);
  auditor.on_final([&](ItemAudit&& ia) { writer.add(std::move(ia)); });
  store::Txn txn(st, store::Txn::read);
  // One session cannot reuse its own tickets (duplicate-pass covers that): nothing to index.
  auditor.limit_reuse_to(session_id ? std::vector<std::string>{} : st.shared_tickets());
  LoadSinks sinks;
  sinks.item = [&](const AuditItem& item) { auditor.add(item); };
  sinks.unreadable = [](Unreadable) {};  // the store loader reports none (it throws)
  sinks.skipped = [](const std::string&, const std::string&) {};
  load_store_in_txn(st, store_label, session_id, sinks);
  AuditReport rep;
  rep.options = options;
  rep.trusted_keys = trusted_keys;
  rep.result = auditor.finish();
  writer.finish(rep, out);
  AuditResult counts = std::move(rep.result);
  counts.items.clear();
  return counts;
}

namespace {

AuditReport run_loaded(const std::vector<TrustedKey>& trusted, const AuditOptions& options,
                       const LoadObserver& observer,
                       const std::function<void(const LoadSinks&)>& load) {
  Auditor auditor(options);
  AuditReport rep;
  rep.options = options;
  for (const auto& k : trusted) rep.trusted_keys.push_back(k.fingerprint);
  LoadSinks sinks;
  sinks.item = [&](const AuditItem& item) {
    if (!observer.prepare) return auditor.add(item);
    AuditItem copy = item;
    observer.prepare(copy);
    auditor.add(copy);
  };
  sinks.unreadable = [&](Unreadable u) {
    if (observer.on_unreadable) observer.on_unreadable(u);
    rep.unreadable.push_back(std::move(u));
  };
  sinks.skipped = [&](const std::string& path, const std::string& why) {
    if (observer.on_skipped) observer.on_skipped(path, why);
  };
  load(sinks);
  rep.result = auditor.finish();
  return rep;
}

}  // namespace

AuditReport audit_paths(const std::vector<std::string>& paths,
                        const std::vector<TrustedKey>& trusted, const AuditOptions& options,
                        const LoadObserver& observer) {
  return run_loaded(trusted, options, observer,
                    [&](const LoadSinks& sinks) { load_paths(paths, trusted, sinks); });
}

AuditReport audit_store(store::Store& st, const std::string& store_label,
                        std::optional<long long> session_id, const AuditOptions& options,
                        const LoadObserver& observer) {
  return run_loaded({}, options, observer, [&](const LoadSinks& sinks) {
    load_store_sessions(st, store_label, session_id, sinks);
  });
}

}  // namespace sp::audit
