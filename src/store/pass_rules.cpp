#include "store/pass_rules.h"

#include <fmt/format.h>

#include "core/error.h"
#include "format/validate.h"

namespace sp::store {

namespace {
// The store names fields by their model names ("steer"); callers add "ticket ..., pass ...".
// (An empty prefix is held in the string itself: nothing is allocated.)
validate::PrefixNames bare_names() {
  return validate::PrefixNames("");
}
}  // namespace

double plausible_max(WeightUnit unit) {
  Units u;
  u.weight = unit;
  return validate::range(validate::Quantity::reading, u).hi;
}

void check_reading(std::string_view platform, double value, const ScaleInfo& scale,
                   WeightUnit unit) {
  Units u;
  u.weight = unit;
  validate::number(value, validate::Quantity::reading, u, platform, bare_names());
  Pass p;
  p.steer = value;
  const validate::TableNames names({{"steer", platform}});
  validate::pass_on_scale(p, scale, unit, names);
}

void check_gross(const Pass& pass, WeightUnit unit) {
  if (!pass.gross) return;
  ScaleInfo any;  // gross = sum needs no scale data
  validate::pass_on_scale(pass, any, unit, bare_names());
}

void check_pass(const Pass& pass, const ScaleInfo& scale, WeightUnit unit) {
  if (pass.ticket.empty()) throw data_error("ticket: expected a ticket number, got nothing");
  // The ticket goes into the context of every other message, so it is judged first, alone.
  validate::text(pass.ticket, validate::Text::ticket, "ticket", bare_names());
  try {
    validate::pass(pass, unit, bare_names());
    validate::pass_on_scale(pass, scale, unit, bare_names());
  } catch (const Error& e) {
    throw e.within(fmt::format("ticket {}, pass {}", pass.ticket, to_string(pass.kind)));
  }
}

}  // namespace sp::store
