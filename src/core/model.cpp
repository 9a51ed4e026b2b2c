#include "core/model.h"

namespace sp {

std::string_view to_string(PassKind k) {
  switch (k) {
    case PassKind::unhitched: return "unhitched";
    case PassKind::hitched: return "hitched";
    case PassKind::tensioned: return "tensioned";
  }
  return "unhitched";
}

std::string_view to_string(TrailerType t) {
  return t == TrailerType::conventional ? "conventional" : "fifth-wheel";
}

std::optional<PassKind> parse_pass_kind(std::string_view s) {
  if (s == "unhitched") return PassKind::unhitched;
  if (s == "hitched") return PassKind::hitched;
  if (s == "tensioned") return PassKind::tensioned;
  return std::nullopt;
}

std::optional<TrailerType> parse_trailer_type(std::string_view s) {
  if (s == "conventional") return TrailerType::conventional;
  if (s == "fifth-wheel") return TrailerType::fifth_wheel;
  return std::nullopt;
}

}  // namespace sp
