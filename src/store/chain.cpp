#include "store/chain.h"

#include <cstring>

#include "core/error.h"

namespace sp::store {

std::string to_hex(const Hash& h) {
  static const char* digits = "0123456789abcdef";
  std::string s(64, '0');
  for (size_t i = 0; i < h.size(); ++i) {
    s[2 * i] = digits[h[i] >> 4];
    s[2 * i + 1] = digits[h[i] & 0xf];
  }
  return s;
}

Sha256::Sha256() {
  md_ = EVP_MD_fetch(nullptr, "SHA256", nullptr);
  ctx_ = EVP_MD_CTX_new();
  if (md_ == nullptr || ctx_ == nullptr) {
    throw Error(ExitCode::internal, "OpenSSL: SHA-256 is not available");
  }
}

Sha256::~Sha256() {
  EVP_MD_CTX_free(ctx_);
  EVP_MD_free(md_);
}

Hash Sha256::digest(const Hash& prev, std::string_view data) {
  Hash out{};
  unsigned int len = 0;
  if (EVP_DigestInit_ex2(ctx_, md_, nullptr) != 1 ||
      EVP_DigestUpdate(ctx_, prev.data(), prev.size()) != 1 ||
      EVP_DigestUpdate(ctx_, data.data(), data.size()) != 1 ||
      EVP_DigestFinal_ex(ctx_, out.data(), &len) != 1 || len != out.size()) {
    throw Error(ExitCode::internal, "OpenSSL: SHA-256 failed");
  }
  return out;
}

Hash Sha256::digest(std::string_view data) {
  Hash out{};
  unsigned int len = 0;
  if (EVP_DigestInit_ex2(ctx_, md_, nullptr) != 1 ||
      EVP_DigestUpdate(ctx_, data.data(), data.size()) != 1 ||
      EVP_DigestFinal_ex(ctx_, out.data(), &len) != 1 || len != out.size()) {
    throw Error(ExitCode::internal, "OpenSSL: SHA-256 failed");
  }
  return out;
}

namespace {
constexpr ColType I = ColType::integer;
constexpr ColType R = ColType::real;
constexpr ColType T = ColType::text;
}  // namespace

// Must match schema/*.sql column for column (tested by store_chain_test).
const std::vector<TableDesc>& chained_tables() {
  static const std::vector<TableDesc> tables = {
      {"scales", false, nullptr,
       {{"code", T}, {"name", T}, {"location", T}, {"unit", T}, {"division", R},
        {"accuracy_class", T}, {"capacity", R}, {"reading_uncertainty", R}, {"entered_by", T},
        {"entered_at", T}}},
      {"scale_inspections", false, nullptr,
       {{"scale_id", I}, {"inspected_on", T}, {"seal", T}, {"inspector", T}, {"notes", T},
        {"entered_by", T}, {"entered_at", T}}},
      {"vehicles", false, nullptr,
       {{"label", T}, {"weight_unit", T}, {"length_unit", T}, {"wheelbase", R},
        {"rear_axle_to_ball", R}, {"gvwr", R}, {"front_gawr", R}, {"rear_gawr", R}, {"gcwr", R},
        {"hitch_tongue_rating", R}, {"hitch_trailer_rating", R}, {"falr_target", R},
        {"entered_by", T}, {"entered_at", T}}},
      {"trailers", false, nullptr,
       {{"label", T}, {"weight_unit", T}, {"length_unit", T}, {"type", T}, {"ball_to_axle", R},
        {"gvwr", R}, {"axle_gawr", R}, {"entered_by", T}, {"entered_at", T}}},
      {"rigs", false, nullptr,
       {{"name", T}, {"vehicle_id", I}, {"trailer_id", I}, {"entered_by", T}, {"entered_at", T}}},
      {"sessions", false, nullptr,
       {{"ref", T}, {"rig_id", I}, {"scale_id", I}, {"station", T}, {"operator", T},
        {"owner", T}, {"notes", T}, {"length_uncertainty", R}, {"opened_by", T},
        {"opened_at", T}}},
      {"session_closings", false, nullptr,
       {{"session_id", I}, {"closed_by", T}, {"closed_at", T}}},
      {"passes", true, "ticket",
       {{"session_id", I}, {"kind", T}, {"setting", T}, {"ticket", T}, {"weighed_at", T},
        {"steer", R}, {"drive", R}, {"trailer", R}, {"gross", R}, {"scale_code", T},
        {"entered_by", T}, {"entered_at", T}}},
      {"corrections", false, nullptr,
       {{"pass_id", I}, {"action", T}, {"reason", T}, {"made_by", T}, {"made_at", T}}},
      {"issued_reports", false, nullptr,
       {{"session_id", I}, {"report_id", T}, {"pdf_sha256", T}, {"key_fingerprint", T},
        {"signed_by", T}, {"issued_at", T}}},
      // schema/002_pass_corrections.sql
      {"pass_corrections", false, nullptr,
       {{"pass_id", I}, {"kind", T}, {"setting", T}, {"weighed_at", T}, {"steer", R},
        {"drive", R}, {"trailer", R}, {"gross", R}, {"scale_code", T}, {"reason", T},
        {"made_by", T}, {"made_at", T}}},
      // schema/003_checkpoints.sql
      {"checkpoints", false, nullptr,
       {{"rows", I}, {"head", T}, {"public_key", T}, {"key_fingerprint", T}, {"signature", T},
        {"signed_by", T}, {"signed_at", T}}},
  };
  return tables;
}

const TableDesc& table_desc(std::string_view name) {
  for (const auto& t : chained_tables()) {
    if (name == t.name) return t;
  }
  throw Error(ExitCode::internal, "no chained table named " + std::string(name));
}

void Encoder::start(const TableDesc& t, long long seq, long long id) {
  size_ = kSlot;
  char* p = grow(4);
  std::memcpy(p, "SPR1", 4);
  add_text(t.name);
  add_int(seq);
  add_int(id);
  fields_ = 0;
}

}  // namespace sp::store
