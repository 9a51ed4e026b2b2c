// The one error type that crosses library boundaries, and the one exit-code table.
//
// Every message carries its context, outermost first, joined by ": ", e.g.
//   "session.json: passes[2].steer: expected a weight >= 0 lb, got -40"
//   "ticket B-1042, pass tensioned, drive platform: reading 4705 is not a multiple of 20"
// Code throws sp::Error; only main() catches, prints what() and exits with code().
#pragma once
#include <stdexcept>
#include <string>

namespace sp {

// Exit codes of the scaleproof binary. Values follow BSD sysexits.h where one fits, so
// scripts can tell "your data is wrong" (65) from "you called me wrong" (2).
enum class ExitCode : int {
  ok = 0,
  check_failed = 1,   // a check ran and found a problem (verify, check-store, audit errors)
  usage = 2,          // bad command line
  data_error = 65,    // EX_DATAERR: input exists but is not valid
  no_input = 66,      // EX_NOINPUT: input file or record does not exist
  internal = 70,      // EX_SOFTWARE: a bug in scaleproof
  cant_create = 73,   // EX_CANTCREAT: output exists and would be overwritten, or cannot be made
  io_error = 74,      // EX_IOERR: read/write failed
  temp_fail = 75,     // EX_TEMPFAIL: store busy beyond the timeout; try again
};

class Error : public std::runtime_error {
 public:
  Error(ExitCode code, const std::string& message) : std::runtime_error(message), code_(code) {}
  ExitCode code() const { return code_; }
  // A copy of this error with `context` prepended ("context: message").
  Error within(const std::string& context) const {
    return Error(code_, context + ": " + what());
  }

 private:
  ExitCode code_;
};

// Shorthands for the common cases.
inline Error data_error(const std::string& message) { return Error(ExitCode::data_error, message); }
inline Error usage_error(const std::string& message) { return Error(ExitCode::usage, message); }

}  // namespace sp
