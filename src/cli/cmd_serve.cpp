// `scaleproof serve [--listen HOST:PORT] [--key STATION.key] [--operators FILE]`: the station
// console in the browser (src/serve). Binds loopback by default; any other address refuses to
// start without --operators (every change then names a signed-in operator). Prints one line,
// "scaleproof console: http://HOST:PORT/", once it listens (PORT 0 picks a free port).
// SIGINT/SIGTERM: stops accepting, lets requests in flight finish, exits 0.
// Exit: 0 stopped; 2 usage (non-loopback without --operators, bad --listen); 65 a bad key or
// operators file; 66 no store; 73 the address cannot be bound.
#include <iostream>

#include "cli/commands.h"
#include "cli/store_cli.h"
#include "core/error.h"
#include "report/key_files.h"
#include "report/signer.h"
#include "serve/console.h"
#include "serve/http_server.h"

namespace sp::cli {

namespace {

struct ServeOpts {
  std::string listen = "127.0.0.1:8080", key, operators;
};

// "127.0.0.1:8080", "[::1]:0", "localhost:0".
serve::ListenOptions parse_listen(const std::string& text) {
  serve::ListenOptions o;
  const std::size_t colon = text.rfind(':');
  if (colon == std::string::npos || colon == 0 || colon + 1 == text.size()) {
    throw usage_error("--listen: expected HOST:PORT (e.g. 127.0.0.1:8080), got " + text);
  }
  o.host = text.substr(0, colon);
  if (o.host.size() > 2 && o.host.front() == '[' && o.host.back() == ']') {
    o.host = o.host.substr(1, o.host.size() - 2);
  }
  const std::string port = text.substr(colon + 1);
  int p = 0;
  for (char ch : port) {
    if (ch < '0' || ch > '9' || p > 65535)
      throw usage_error("--listen: expected a port 0 to 65535, got " + port);
    p = p * 10 + (ch - '0');
  }
  if (p > 65535) throw usage_error("--listen: expected a port 0 to 65535, got " + port);
  o.port = p;
  return o;
}

bool loopback(const std::string& host) {
  return host == "localhost" || host == "::1" || host.rfind("127.", 0) == 0;
}

}  // namespace

void register_serve(CLI::App& app, Context& ctx) {
  auto* sub = app.add_subcommand("serve", "Run the station console in the browser");
  sub->footer(
      "Examples:\n  scaleproof serve --db demo/store.db --key demo/keys/station.key\n"
      "  scaleproof serve --listen 0.0.0.0:8080 --operators station.operators");
  auto o = std::make_shared<ServeOpts>();
  sub->add_option("--listen", o->listen, "HOST:PORT to listen on (PORT 0: a free port)");
  sub->add_option("--key", o->key, "Station private key: lets the console sign reports");
  sub->add_option("--operators", o->operators,
                  "Operators file (`scaleproof operator add`): sign-in for every change");
  sub->callback([&ctx, o] {
    serve::ListenOptions lo = parse_listen(o->listen);
    if (!loopback(lo.host) && o->operators.empty()) {
      throw usage_error("serve: --listen " + o->listen +
                        " is reachable from other machines; give --operators FILE so every "
                        "change needs a signed-in operator");
    }
    serve::Config config;
    config.db_path = resolve_db_path(ctx);
    config.local_operator = who("");
    open_store(ctx);  // fails now, not at the first request, when there is no store
    config.software = std::string("scaleproof ") + SCALEPROOF_VERSION;
    if (!o->key.empty()) {
      config.signer = report::signer_from_pem(report::read_private_key_file(o->key), o->key);
    }
    if (!o->operators.empty()) {
      config.operators =
          serve::parse_operators(report::read_file_bytes(o->operators), o->operators);
    }
    serve::Console console(std::move(config));
    serve::run_http(console, lo, [&lo](int port) {
      const std::string host =
          lo.host.find(':') != std::string::npos ? "[" + lo.host + "]" : lo.host;
      std::cout << "scaleproof console: http://" << host << ":" << port << "/" << std::endl;
    });
    ctx.exit_code = 0;
  });
}

}  // namespace sp::cli
