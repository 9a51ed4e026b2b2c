#include "store/pass_rules.h"

#include <cmath>
#include <fmt/format.h>

#include "core/error.h"

namespace sp::store {

double plausible_max(WeightUnit unit) { return unit == WeightUnit::lb ? 100000.0 : 45000.0; }

void check_reading(std::string_view platform, double value, const ScaleInfo& scale,
                   WeightUnit unit) {
  auto u = to_string(unit);
  if (!std::isfinite(value) || value < 0) {
    throw data_error(fmt::format("{} platform: expected a reading >= 0 {}, got {}", platform, u,
                                 value));
  }
  double max = scale.capacity.value_or(plausible_max(unit));
  if (value > max) {
    throw data_error(fmt::format("{} platform: reading {} {} is above the {} of {} {}", platform,
                                 value, u, scale.capacity ? "scale capacity" : "plausible limit",
                                 max, u));
  }
  double d = scale.division;
  if (d > 0) {
    double n = value / d;
    if (std::fabs(n - std::round(n)) > 1e-6) {
      throw data_error(fmt::format(
          "{} platform: reading {} {} is not a multiple of the scale division {} {}", platform,
          value, u, d, u));
    }
  }
}

void check_gross(const Pass& pass, WeightUnit unit) {
  if (!pass.gross) return;
  double sum = pass.steer + pass.drive + pass.trailer.value_or(0);
  if (std::fabs(*pass.gross - sum) > 1e-9 * std::max(1.0, sum)) {
    throw data_error(fmt::format("gross: printed gross {} {} is not the sum of the platforms "
                                 "({} + {} + {} = {} {})",
                                 *pass.gross, to_string(unit), pass.steer, pass.drive,
                                 pass.trailer.value_or(0), sum, to_string(unit)));
  }
}

void check_pass(const Pass& pass, const ScaleInfo& scale, WeightUnit unit) {
  if (pass.ticket.empty()) throw data_error("ticket: expected a ticket number, got nothing");
  try {
    check_reading("steer", pass.steer, scale, unit);
    check_reading("drive", pass.drive, scale, unit);
    if (pass.kind == PassKind::unhitched) {
      if (pass.trailer && *pass.trailer != 0) {
        throw data_error(fmt::format(
            "trailer platform: expected no reading (or 0) on an unhitched pass, got {} {}",
            *pass.trailer, to_string(unit)));
      }
    } else {
      if (!pass.trailer) {
        throw data_error("trailer platform: expected a reading on a hitched or tensioned pass");
      }
      check_reading("trailer", *pass.trailer, scale, unit);
    }
    if (pass.gross) {
      if (!std::isfinite(*pass.gross) || *pass.gross < 0) {
        throw data_error(fmt::format("gross: expected a weight >= 0, got {}", *pass.gross));
      }
      check_gross(pass, unit);
    }
    if (pass.kind == PassKind::tensioned) {
      if (!pass.setting || pass.setting->empty()) {
        throw data_error("setting: expected the bar tension setting of a tensioned pass");
      }
    } else if (pass.setting) {
      throw data_error(fmt::format("setting: only tensioned passes have a bar setting, got '{}'",
                                   *pass.setting));
    }
  } catch (const Error& e) {
    throw e.within(fmt::format("ticket {}, pass {}", pass.ticket, to_string(pass.kind)));
  }
}

}  // namespace sp::store
