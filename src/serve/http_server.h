// The console's transport: cpp-httplib (Debian's libcpp-httplib) turning HTTP into
// serve::Request and serve::Response for Console::handle. The only file that knows httplib.
//
// run_http binds host:port (port 0: a free port), calls on_ready with the port bound, and
// serves until SIGINT or SIGTERM: then it stops accepting, lets the requests in flight finish
// (the worker threads are joined) and returns. Limits: bodies over Config::max_body get 413
// before any handler runs; a connection that sends nothing for read_timeout_s, or does not
// take the answer for write_timeout_s, is closed. No file is served from disk. Throws
// sp::Error(cant_create) when the address cannot be bound.
#pragma once
#include <functional>
#include <string>

#include "serve/console.h"

namespace sp::serve {

struct ListenOptions {
  std::string host = "127.0.0.1";
  int port = 0;
  // 10 s: a browser on a weigh-station LAN sends a form in well under a second; a client
  // slower than this is holding a worker thread (common practice for small servers).
  int read_timeout_s = 10;
  int write_timeout_s = 10;
  int keep_alive_s = 5;
};

void run_http(Console& console, const ListenOptions& options,
              const std::function<void(int port)>& on_ready);

}  // namespace sp::serve
