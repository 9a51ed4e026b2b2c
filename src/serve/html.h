// HTML building blocks of the console's pages: escaping, the page shell, the verdict line.
// Every value that reaches a page goes through esc() (text and attribute values alike:
// & < > " ' are replaced). The shell links the embedded stylesheet (/assets/console.css) and no
// script, so pages work with JavaScript off and under the CSP default-src 'self'.
#pragma once
#include <string>
#include <string_view>

#include "engine/result.h"

namespace sp::serve {

struct Call;

std::string esc(std::string_view text);
// A complete page: header with navigation, <main id="main"> holding `main_html`, footer with
// the towing caution (RULES.md: it stays on every surface that shows a result).
std::string page(const Call& c, const std::string& title, const std::string& main_html);
// <p id="verdict" data-verdict="WORD" class="verdict verdict-WORD"><strong>WORD</strong>:
// reason</p>
std::string verdict_line(Verdict v, const std::string& reason);
// <input type="hidden" name="csrf" value="...">
std::string csrf_input(const Call& c);
// <p class="error" role="alert" id="error">message</p> ("" for an empty message).
std::string error_box(const std::string& message);

}  // namespace sp::serve
