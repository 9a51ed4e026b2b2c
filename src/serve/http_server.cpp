#include "serve/http_server.h"

#include <httplib.h>
#include <pthread.h>
#include <signal.h>

#include <atomic>
#include <chrono>
#include <thread>

#include "core/error.h"

namespace sp::serve {

namespace {

std::string lower(std::string s) {
  for (char& ch : s) ch = static_cast<char>(std::tolower(static_cast<unsigned char>(ch)));
  return s;
}

std::map<std::string, std::string> parse_cookies(const std::string& header) {
  std::map<std::string, std::string> out;
  std::size_t from = 0;
  while (from < header.size()) {
    std::size_t end = header.find(';', from);
    if (end == std::string::npos) end = header.size();
    std::string part = header.substr(from, end - from);
    const std::size_t b = part.find_first_not_of(' ');
    if (b != std::string::npos) part = part.substr(b);
    const std::size_t eq = part.find('=');
    if (eq != std::string::npos && eq > 0) out.emplace(part.substr(0, eq), part.substr(eq + 1));
    from = end + 1;
  }
  return out;
}

Request to_request(const httplib::Request& in) {
  Request r;
  r.method = in.method;
  r.path = in.path;
  r.body = in.body;
  for (const auto& [k, v] : in.headers) r.headers[lower(k)] = v;
  if (auto c = r.headers.find("cookie"); c != r.headers.end()) r.cookies = parse_cookies(c->second);
  const std::string ctype = r.headers.count("content-type") ? r.headers.at("content-type") : "";
  // httplib puts an urlencoded body's fields into params beside the query's.
  auto& params = (in.method == "POST" && ctype.rfind("application/x-www-form-urlencoded", 0) == 0)
                     ? r.form
                     : r.query;
  for (const auto& [k, v] : in.params) params.emplace(k, v);
  for (const auto& [name, part] : in.files) {
    if (part.filename.empty()) {
      r.form.emplace(name, part.content);
    } else {
      r.files.emplace(name, UploadedFile{part.filename, part.content_type, part.content});
    }
  }
  return r;
}

void from_response(const Response& in, httplib::Response& out) {
  out.status = in.status;
  for (const auto& [k, v] : in.headers) out.set_header(k, v);
  out.set_content(in.body, in.content_type);
}

}  // namespace

void run_http(Console& console, const ListenOptions& o,
              const std::function<void(int port)>& on_ready) {
  // SIGINT and SIGTERM are taken by one thread with sigwait; every other thread (the server's
  // workers are started after this) has them blocked, so no handler runs in signal context.
  sigset_t stop_signals;
  sigemptyset(&stop_signals);
  sigaddset(&stop_signals, SIGINT);
  sigaddset(&stop_signals, SIGTERM);
  // A shell starts background jobs with SIGINT ignored, and an ignored signal never reaches
  // sigwait: the contract is that SIGINT stops the console, so take both back first.
  ::signal(SIGINT, SIG_DFL);
  ::signal(SIGTERM, SIG_DFL);
  pthread_sigmask(SIG_BLOCK, &stop_signals, nullptr);
  ::signal(SIGPIPE, SIG_IGN);  // a client that hangs up is the socket's error, not ours

  httplib::Server svr;
  svr.set_payload_max_length(console.config().max_body);
  // Responses go out in more than one write: without TCP_NODELAY, Nagle's algorithm holds the
  // second write until the client's delayed ACK (40 ms on Linux), a floor under every answer
  // (bench/README.md, "console load": desk p50 44 ms -> 1.6 ms with one client).
  svr.set_tcp_nodelay(true);
  svr.set_read_timeout(o.read_timeout_s, 0);
  svr.set_write_timeout(o.write_timeout_s, 0);
  svr.set_keep_alive_timeout(o.keep_alive_s);
  auto handler = [&console](const httplib::Request& req, httplib::Response& res) {
    from_response(console.handle(to_request(req)), res);
  };
  for (const char* pattern : {".*"}) {
    svr.Get(pattern, handler);
    svr.Post(pattern, handler);
    svr.Put(pattern, handler);
    svr.Delete(pattern, handler);
    svr.Patch(pattern, handler);
  }
  // What httplib answers itself (413 over the size limit, 400 for a malformed request) gets
  // the console's JSON error and security headers too.
  svr.set_error_handler([&console](const httplib::Request&, httplib::Response& res) {
    if (!res.body.empty()) return;
    Request probe;
    probe.path = "/api/";
    Response r = console.handle(probe);  // only for its headers
    const std::string msg =
        res.status == 413 ? "body: larger than the console takes" : "the request could not be read";
    for (const auto& [k, v] : r.headers) {
      if (k != "Set-Cookie") res.set_header(k, v);
    }
    res.set_content(std::string("{\"error\":\"") + msg +
                        "\",\"field\":" + (res.status == 413 ? "\"body\"" : "null") + "}\n",
                    "application/json");
  });

  int port = o.port;
  if (port == 0) {
    port = svr.bind_to_any_port(o.host);
    if (port <= 0)
      throw Error(ExitCode::cant_create, "--listen " + o.host + ":0: cannot bind a port");
  } else if (!svr.bind_to_port(o.host, port)) {
    throw Error(ExitCode::cant_create,
                "--listen " + o.host + ":" + std::to_string(port) + ": cannot bind (in use?)");
  }

  std::atomic<bool> done{false};
  std::thread waiter([&svr, &done, &stop_signals] {
    int sig = 0;
    sigwait(&stop_signals, &sig);
    // stop() only acts once the accept loop runs; repeat until listen_after_bind returned.
    while (!done.load()) {
      svr.stop();
      std::this_thread::sleep_for(std::chrono::milliseconds(20));
    }
  });
  on_ready(port);
  svr.listen_after_bind();
  done.store(true);
  pthread_kill(waiter.native_handle(), SIGTERM);  // wakes the waiter if no signal came
  waiter.join();
}

}  // namespace sp::serve
