// Numeric flags of `rig add`, `scale add` and `pass add` are taken as text and read here, so a
// flag value that is not a number gets the validator's message and exit 65 (bad data), the
// same as the same value in a session file, a rig file or a CSV (format/validate.h), not a
// CLI11 usage error. The tables name model fields as the flags the user typed.
#pragma once
#include <optional>
#include <string>

#include "format/validate.h"

namespace sp::cli {

// nullopt when the flag was not given; else validate::parse_number's value. Throws
// "<flag>: expected a number, got \"...\"" (data_error) otherwise.
std::optional<double> number_flag(const std::optional<std::string>& text, std::string_view field,
                                  const validate::FieldNames& names);

// Model field -> flag, for validate::rig (plus "name"), validate::scale and validate::pass.
const validate::TableNames& rig_flag_names();
const validate::TableNames& scale_flag_names();
const validate::TableNames& pass_flag_names();

}  // namespace sp::cli
