#include "report/trust.h"

#include <toml++/toml.h>

#include <algorithm>
#include <filesystem>
#include <set>

#include "core/error.h"
#include "format/iso8601.h"
#include "report/cms_signature.h"
#include "report/key_files.h"
#include "report/signer.h"

namespace fs = std::filesystem;

namespace sp::report {
namespace {

std::optional<std::string> normal_fingerprint(const std::string& text) {
  std::string hex;
  for (char c : text) {
    if (c == ' ') continue;
    if (c >= 'A' && c <= 'F') c = static_cast<char>(c - 'A' + 'a');
    if (!((c >= '0' && c <= '9') || (c >= 'a' && c <= 'f'))) return std::nullopt;
    hex += c;
  }
  if (hex.size() != 64) return std::nullopt;
  std::string out;
  for (std::size_t i = 0; i < 64; i += 4) {
    if (i > 0) out += ' ';
    out += hex.substr(i, 4);
  }
  return out;
}

std::string where(const std::string& source, std::size_t index, const char* field) {
  return source + ": key[" + std::to_string(index) + "]." + field;
}

std::optional<std::string> time_field(const toml::table& t, const std::string& source,
                                      std::size_t index, const char* field) {
  const toml::node* n = t.get(field);
  if (n == nullptr) return std::nullopt;
  const auto* s = n->as_string();
  if (s == nullptr) {
    throw data_error(where(source, index, field) +
                     ": expected an ISO 8601 date-time string such as \"2026-01-01T00:00:00Z\"");
  }
  const std::string v = s->get();
  std::string why = format::check_iso_date_time(v);
  if (why.empty() && !iso_utc_seconds(v)) why = "expected seconds and Z or an offset";
  if (!why.empty()) throw data_error(where(source, index, field) + ": '" + v + "': " + why);
  return v;
}

std::int64_t seconds(const std::string& iso) {
  return iso_utc_seconds(iso).value_or(0);
}

TrustEntry bare_key(const std::string& path) {
  auto v = verifier_from_pem(read_file_bytes(path), path);
  TrustEntry e;
  e.source = path;
  e.fingerprint = fingerprint(v->public_key());
  e.station = fs::path(path).filename().string();
  return e;
}

bool is_pem(const std::string& text) {
  return text.rfind("-----BEGIN", 0) == 0;
}

}  // namespace

const TrustEntry* TrustList::find(const std::string& fp) const {
  for (const auto& e : entries) {
    if (e.fingerprint == fp) return &e;
  }
  return nullptr;
}

TrustList parse_trust_file(const std::string& text, const std::string& source) {
  toml::table root;
  try {
    root = toml::parse(text, source);
  } catch (const toml::parse_error& e) {
    throw data_error(source + ":" + std::to_string(e.source().begin.line) +
                     ": not a TOML trust file: " + std::string(e.description()));
  }
  for (auto&& [k, v] : root) {
    if (k.str() != "format" && k.str() != "key") {
      throw data_error(source + ": unknown key '" + std::string(k.str()) +
                       "'; expected format and [[key]] entries");
    }
  }
  const auto* format = root.get_as<std::string>("format");
  if (format == nullptr || format->get() != kTrustFormat) {
    throw data_error(source + ": format: expected \"" + kTrustFormat + "\"");
  }
  TrustList out;
  const toml::array* keys = root.get_as<toml::array>("key");
  if (keys == nullptr || keys->empty()) throw data_error(source + ": no [[key]] entry");
  std::set<std::string> seen;
  for (std::size_t i = 0; i < keys->size(); ++i) {
    const toml::table* t = keys->get(i)->as_table();
    if (t == nullptr)
      throw data_error(source + ": key[" + std::to_string(i) + "]: expected a [[key]] table");
    for (auto&& [k, v] : *t) {
      static const std::set<std::string> known = {"fingerprint", "station", "valid_from",
                                                  "valid_to", "revoked_at"};
      if (known.count(std::string(k.str())) == 0) {
        throw data_error(source + ": key[" + std::to_string(i) + "]: unknown key '" +
                         std::string(k.str()) +
                         "'; expected fingerprint, station, valid_from, valid_to, revoked_at");
      }
    }
    TrustEntry e;
    e.source = source;
    const auto* fp = t->get_as<std::string>("fingerprint");
    std::optional<std::string> norm = fp ? normal_fingerprint(fp->get()) : std::nullopt;
    if (!norm) {
      throw data_error(where(source, i, "fingerprint") +
                       ": expected the 64 hex digits `key new` prints (spaces allowed)");
    }
    e.fingerprint = *norm;
    if (!seen.insert(e.fingerprint).second) {
      throw data_error(where(source, i, "fingerprint") + ": " + e.fingerprint + " is listed twice");
    }
    const auto* st = t->get_as<std::string>("station");
    if (st == nullptr || st->get().empty())
      throw data_error(where(source, i, "station") + ": expected the station's name");
    e.station = st->get();
    e.valid_from = time_field(*t, source, i, "valid_from");
    e.valid_to = time_field(*t, source, i, "valid_to");
    e.revoked_at = time_field(*t, source, i, "revoked_at");
    if (e.valid_from && e.valid_to && seconds(*e.valid_to) <= seconds(*e.valid_from)) {
      throw data_error(where(source, i, "valid_to") + ": " + *e.valid_to +
                       " is not after valid_from " + *e.valid_from);
    }
    out.entries.push_back(std::move(e));
  }
  return out;
}

TrustList load_trust(const std::vector<std::string>& paths) {
  TrustList out;
  auto add = [&](TrustEntry e) {
    if (out.find(e.fingerprint) != nullptr) {
      throw data_error(e.source + ": key " + e.fingerprint +
                       " is already trusted by another --trust entry");
    }
    out.entries.push_back(std::move(e));
  };
  for (const auto& p : paths) {
    std::error_code ec;
    if (fs::is_directory(p, ec)) {
      std::vector<std::string> files;
      for (const auto& e : fs::directory_iterator(p)) {
        std::string ext = e.path().extension().string();
        std::transform(ext.begin(), ext.end(), ext.begin(),
                       [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
        if (e.is_regular_file() && ext == ".pem") files.push_back(e.path().string());
      }
      std::sort(files.begin(), files.end());
      if (files.empty())
        throw Error(ExitCode::no_input, "--trust " + p + ": no .pem public key in this folder");
      for (const auto& f : files) add(bare_key(f));
      continue;
    }
    const std::string text = read_file_bytes(p);
    if (is_pem(text)) {
      add(bare_key(p));
    } else {
      for (auto& e : parse_trust_file(text, p).entries) add(std::move(e));
    }
  }
  return out;
}

TrustVerdict check_trust(const TrustList& trust, const std::string& fp,
                         const std::optional<std::string>& issued_at,
                         const std::optional<std::string>& latest_weighing) {
  TrustVerdict v;
  v.entry = trust.find(fp);
  if (v.entry == nullptr) {
    v.detail = "key " + fp + " is not in the trust list";
    return v;
  }
  const TrustEntry& e = *v.entry;
  const std::string who = "key of " + e.station + " (" + e.source + ")";
  std::optional<std::string> end_name;
  std::optional<std::int64_t> end;
  if (e.revoked_at) {
    end = seconds(*e.revoked_at);
    end_name = "revoked at " + *e.revoked_at;
  }
  if (e.valid_to && (!end || seconds(*e.valid_to) < *end)) {
    end = seconds(*e.valid_to);
    end_name = "valid to " + *e.valid_to;
  }
  auto bounds = [&] {
    std::string s = "valid from " + e.valid_from.value_or("(no start)");
    s += e.valid_to ? " to " + *e.valid_to : std::string(", no end");
    if (e.revoked_at) s += ", revoked at " + *e.revoked_at;
    return s;
  };
  std::optional<std::int64_t> t = issued_at ? iso_utc_seconds(*issued_at) : std::nullopt;
  if (t) {
    if (e.revoked_at && *t >= seconds(*e.revoked_at)) {
      v.detail = "issued at " + *issued_at + ", at or after the revocation of the " + who + " at " +
                 *e.revoked_at;
    } else if (e.valid_from && *t < seconds(*e.valid_from)) {
      v.detail = "issued at " + *issued_at + ", before the " + who + " became valid (" +
                 *e.valid_from + ")";
    } else if (e.valid_to && *t >= seconds(*e.valid_to)) {
      v.detail = "issued at " + *issued_at + ", after the " + who + " ceased to be valid (" +
                 *e.valid_to + ")";
    } else {
      v.ok = true;
      v.detail = "the " + who + ", " + bounds() + "; issued at " + *issued_at + ", within";
    }
    return v;
  }
  std::optional<std::int64_t> w =
      latest_weighing ? iso_utc_seconds(*latest_weighing) : std::nullopt;
  if (end && w && *w >= *end) {
    v.detail =
        "weighed at " + *latest_weighing + ", so issued after the " + who + " was " + *end_name;
  } else if (end) {
    v.detail =
        "the report states no issue time, so it is not proven that it was issued before the " +
        who + " was " + *end_name + " (issue reports with --issued-at)";
  } else if (e.valid_from && (!w || *w < seconds(*e.valid_from))) {
    v.detail =
        "the report states no issue time, so it is not proven that it was issued after the " + who +
        " became valid (" + *e.valid_from + ")";
  } else {
    v.ok = true;
    v.detail = "the " + who + ", " + bounds() + "; no issue time stated, weighed " +
               (latest_weighing ? "at " + *latest_weighing : std::string("at an unknown time")) +
               ", within";
  }
  return v;
}

std::string trust_entry_text(const TrustEntry& e) {
  auto quote = [](const std::string& s) {
    std::string out = "\"";
    for (char c : s) {
      if (c == '"' || c == '\\') out += '\\';
      out += c;
    }
    return out + "\"";
  };
  std::string out =
      "[[key]]\nfingerprint = " + quote(e.fingerprint) + "\nstation = " + quote(e.station) + "\n";
  if (e.valid_from) out += "valid_from = " + quote(*e.valid_from) + "\n";
  if (e.valid_to) out += "valid_to = " + quote(*e.valid_to) + "\n";
  if (e.revoked_at) out += "revoked_at = " + quote(*e.revoked_at) + "\n";
  return out;
}

}  // namespace sp::report
