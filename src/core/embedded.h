// Data files compiled into the binary (see cmake/embed.cmake).
// Contract: names are paths relative to the source folder (e.g. "001_init.sql"),
// sorted; contents are the file's bytes, unchanged.
#pragma once
#include <string_view>
#include <vector>

namespace sp::embedded {
struct File {
  std::string_view name;
  std::string_view contents;
};
// schema/*.sql, applied in name order as numbered migrations.
const std::vector<File>& schema_files();
// reports/*.json: the weigh-report's wording, cautions and layout data.
const std::vector<File>& report_files();
// The report's faces cut down to WinAnsiEncoding (cmake/fonts.cmake): DejaVuSans.ttf,
// DejaVuSans-Bold.ttf, DejaVuSansMono.ttf.
const std::vector<File>& font_files();
// src/serve/assets/*: the console's stylesheet (served at /assets/NAME).
const std::vector<File>& console_files();
}  // namespace sp::embedded
