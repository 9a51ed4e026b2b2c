#include "serve/html.h"

#include "serve/handlers.h"

namespace sp::serve {

std::string esc(std::string_view text) {
  std::string out;
  out.reserve(text.size());
  for (char ch : text) {
    switch (ch) {
      case '&':
        out += "&amp;";
        break;
      case '<':
        out += "&lt;";
        break;
      case '>':
        out += "&gt;";
        break;
      case '"':
        out += "&quot;";
        break;
      case '\'':
        out += "&#39;";
        break;
      default:
        out.push_back(ch);
    }
  }
  return out;
}

std::string csrf_input(const Call& c) {
  return "<input type=\"hidden\" name=\"csrf\" value=\"" + esc(c.csrf) + "\">";
}

std::string verdict_line(Verdict v, const std::string& reason) {
  const std::string word(to_string(v));
  return "<p id=\"verdict\" data-verdict=\"" + word + "\" class=\"verdict verdict-" + word +
         "\"><strong>" + esc(word) + "</strong>: " + esc(reason) + "</p>\n";
}

std::string error_box(const std::string& message) {
  if (message.empty()) return "";
  return "<p class=\"error\" role=\"alert\" id=\"error\">" + esc(message) + "</p>\n";
}

std::string page(const Call& c, const std::string& title, const std::string& main_html) {
  std::string who;
  if (c.st.config.operators) {
    if (c.operator_name) {
      who = "<form class=\"signout\" method=\"post\" action=\"/signout\">" + csrf_input(c) +
            "<span>Signed in: " + esc(*c.operator_name) +
            "</span> <button type=\"submit\">Sign out</button></form>";
    } else {
      who = "<a href=\"/signin\">Sign in</a>";
    }
  }
  return "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
         "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n<title>" +
         esc(title) +
         " · scaleproof console</title>\n"
         "<link rel=\"stylesheet\" href=\"/assets/console.css\">\n</head>\n<body>\n"
         "<a class=\"skip\" href=\"#main\">Skip to content</a>\n"
         "<header class=\"bar\"><span class=\"brand\">scaleproof console</span>\n"
         "<nav aria-label=\"Main\"><a href=\"/sessions\">Sessions</a> "
         "<a href=\"/sessions/new\">Open a session</a> <a href=\"/verify\">Verify a report</a> "
         "<a href=\"/ledger\">Ledger</a></nav>" +
         who + "</header>\n<main id=\"main\" tabindex=\"-1\">\n" + main_html +
         "</main>\n<footer><p>This tool does not replace the vehicle and hitch makers' "
         "instructions, local law, or a qualified inspection.</p></footer>\n</body>\n</html>\n";
}

}  // namespace sp::serve
