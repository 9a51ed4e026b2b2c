// Fuzz target: the session-file parser (format/session_json.h).
// Properties: no crash; bad input -> sp::Error(65) naming the file; a file that parses writes
// out to text that parses again and writes out identically (lossless round trip).
#include "format/session_json.h"

#include "fuzz_common.h"

namespace sp::fuzz {

inline int session_json_one(const uint8_t* data, size_t size) {
  static const std::string kSource = "fuzz.json";
  std::string once;
  try {
    sp::Session s = sp::parse_session_json(as_text(data, size), kSource);
    once = sp::write_session_json(s);
  } catch (const sp::Error& e) {
    check_data_error(e, kSource);
    return 0;
  }
  std::string twice;
  try {
    twice = sp::write_session_json(sp::parse_session_json(once, kSource));
  } catch (const sp::Error& e) {
    violated("written session file does not parse again", e.what());
  }
  if (twice != once) violated("round trip is not lossless", once + "\n---\n" + twice);
  return 0;
}

}  // namespace sp::fuzz

SP_FUZZ_ENTRY(sp::fuzz::session_json_one)
