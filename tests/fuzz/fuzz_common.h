// Shared helpers of the fuzz targets (tests/fuzz/fuzz_*.cpp).
//
// Contract every target checks, beyond "no crash, no sanitizer report":
//   - bad input is reported only as sp::Error with ExitCode::data_error (65); any other
//     exception escapes, libFuzzer reports it as a crash (it would be exit 70 in the CLI);
//   - the message names the input (starts with the source name given to the parser).
// A target built with SP_FUZZ_NO_MAIN defines no LLVMFuzzerTestOneInput, so the same source
// can be compiled into a gcc unit test that replays the seed corpus and the regressions.
#pragma once
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <stdexcept>
#include <string>
#include <string_view>

#include "core/error.h"

namespace sp::fuzz {

// Under libFuzzer: aborts with a message, so libFuzzer saves the input as a crash.
// In a replay test (SP_FUZZ_NO_MAIN): throws, so the test names the failing file.
[[noreturn]] inline void violated(const char* what, const std::string& detail) {
#ifdef SP_FUZZ_NO_MAIN
  throw std::logic_error(std::string("fuzz contract violated: ") + what + ": " + detail);
#else
  std::fprintf(stderr, "fuzz contract violated: %s: %s\n", what, detail.c_str());
  std::abort();
#endif
}

// Checks an sp::Error thrown for bad input against the contract above.
inline void check_data_error(const sp::Error& e, std::string_view source) {
  if (e.code() != sp::ExitCode::data_error) violated("exit code is not 65", e.what());
  std::string_view msg = e.what();
  if (msg.substr(0, source.size()) != source) violated("message does not name the input", e.what());
}

inline std::string_view as_text(const uint8_t* data, size_t size) {
  return {reinterpret_cast<const char*>(data), size};
}

}  // namespace sp::fuzz

// Defines libFuzzer's entry point as a call of `fn(data, size)`, unless SP_FUZZ_NO_MAIN.
#ifdef SP_FUZZ_NO_MAIN
#define SP_FUZZ_ENTRY(fn)
#else
#define SP_FUZZ_ENTRY(fn)                                                  \
  extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) { \
    return fn(data, size);                                                 \
  }
#endif
