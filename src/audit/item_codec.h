// A compact binary form of one ItemAudit, for the streamed audit's temporary files
// (audit/output_stream.h): every field, so decode(encode(x)) renders byte for byte as x does
// (text, JSON and the summary PDF), with doubles kept bit for bit. Not a persistent format:
// written and read back by the same process only.
// decode_item throws sp::Error(io_error) on a truncated or malformed record.
#pragma once
#include <string>
#include <string_view>

#include "audit/audit.h"

namespace sp::audit {

// Appends the encoding of `item` to `out`.
void encode_item(const ItemAudit& item, std::string& out);
// The item encoded in `bytes` (exactly one encode_item output).
ItemAudit decode_item(std::string_view bytes);

}  // namespace sp::audit
