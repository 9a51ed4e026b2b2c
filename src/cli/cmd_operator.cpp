// `scaleproof operator add --file FILE --name NAME`: adds an operator who may sign in to the
// console (`serve --operators FILE`). The password is read from stdin (one line; on a terminal
// it is asked for without echo) and stored as a salted PBKDF2-HMAC-SHA256 hash (serve/auth.h).
// The file is appended to (created 0600 when missing); a name already in it is refused.
// Exit: 0 added; 65 a bad name, an empty password, or the name is already there; 74 the file
// cannot be written.
#include <fcntl.h>
#include <termios.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>
#include <iostream>

#include "cli/commands.h"
#include "cli/store_cli.h"
#include "core/error.h"
#include "report/key_files.h"
#include "serve/auth.h"

namespace sp::cli {

namespace {

std::string read_password() {
  const bool tty = stdin_is_terminal();
  termios old{};
  if (tty) {
    std::cerr << "password: " << std::flush;
    tcgetattr(STDIN_FILENO, &old);
    termios quiet = old;
    quiet.c_lflag &= ~static_cast<tcflag_t>(ECHO);
    tcsetattr(STDIN_FILENO, TCSANOW, &quiet);
  }
  std::string line;
  const bool got = static_cast<bool>(std::getline(std::cin, line));
  if (tty) {
    tcsetattr(STDIN_FILENO, TCSANOW, &old);
    std::cerr << "\n";
  }
  if (!got) throw data_error("password: expected one line on stdin");
  if (!line.empty() && line.back() == '\r') line.pop_back();
  return line;
}

}  // namespace

void register_operator(CLI::App& app, Context& ctx) {
  auto* op = app.add_subcommand("operator", "Console operators: add");
  op->footer("Example:\n  scaleproof operator add --file station.operators --name \"Ines Varga\"");
  op->require_subcommand(1);
  struct Opts {
    std::string file, name;
  };
  auto o = std::make_shared<Opts>();
  auto* add =
      op->add_subcommand("add", "Add an operator (password from stdin) to an operators file");
  add->footer("Example:\n  scaleproof operator add --file station.operators --name \"Ines Varga\"");
  add->add_option("--file", o->file, "Operators file")->required();
  add->add_option("--name", o->name, "Operator name (recorded as entered_by)")->required();
  add->callback([&ctx, o] {
    serve::check_operator_name(o->name);
    std::string existing;
    if (::access(o->file.c_str(), F_OK) == 0) {
      existing = report::read_file_bytes(o->file);
      for (const auto& e : serve::parse_operators(existing, o->file)) {
        if (e.name == o->name)
          throw data_error(o->file + ": operator " + o->name + " is already there");
      }
    }
    const std::string line = serve::operator_line(o->name, read_password()) + "\n";
    const int fd = ::open(o->file.c_str(), O_WRONLY | O_CREAT | O_APPEND | O_CLOEXEC, 0600);
    if (fd < 0) throw Error(ExitCode::io_error, o->file + ": cannot open: " + std::strerror(errno));
    std::string out = (!existing.empty() && existing.back() != '\n' ? "\n" : "") + line;
    const ssize_t n = ::write(fd, out.data(), out.size());
    const bool ok = n == static_cast<ssize_t>(out.size()) && ::fsync(fd) == 0;
    ::close(fd);
    if (!ok) throw Error(ExitCode::io_error, o->file + ": cannot write: " + std::strerror(errno));
    if (!ctx.quiet) std::cout << "operator " << o->name << " added to " << o->file << "\n";
  });
}

}  // namespace sp::cli
