// The console's view of HTTP: plain structs a handler reads and returns, so every handler runs
// in a test without a socket. The transport (http_server.cpp, cpp-httplib) fills a Request from
// the wire and writes the Response back; nothing else knows about httplib.
//
// Request: `path` without the query; `query` the URL parameters; `form` the fields of an
// urlencoded or multipart body (text parts), or the top-level string/number members of a JSON
// body (see Console::handle); `files` the multipart file parts by field name; `headers` with
// lower-case names; `cookies` parsed from the Cookie header; `body` the raw body.
#pragma once
#include <map>
#include <string>
#include <utility>
#include <vector>

namespace sp::serve {

struct UploadedFile {
  std::string filename;
  std::string content_type;
  std::string content;
};

struct Request {
  std::string method = "GET";
  std::string path = "/";
  std::map<std::string, std::string> query;
  std::map<std::string, std::string> form;
  std::map<std::string, UploadedFile> files;
  std::map<std::string, std::string> headers;  // lower-case names
  std::map<std::string, std::string> cookies;
  std::string body;
};

struct Response {
  int status = 200;
  std::string content_type = "text/html; charset=utf-8";
  std::string body;
  std::vector<std::pair<std::string, std::string>> headers;  // beside Content-Type

  std::string header(const std::string& name) const {
    for (const auto& [k, v] : headers) {
      if (k == name) return v;
    }
    return "";
  }
};

}  // namespace sp::serve
