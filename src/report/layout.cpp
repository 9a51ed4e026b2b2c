#include "report/layout.h"

#include <algorithm>

namespace sp::report {

Flow::Flow(PdfDocument& doc, const ReportText& text, float page_width, float page_height,
           std::string report_id)
    : doc_(doc),
      text_(text),
      width_(page_width),
      height_(page_height),
      margin_(static_cast<float>(text.number("margin"))),
      body_(static_cast<float>(text.number("sizes.body"))),
      table_size_(static_cast<float>(text.number("sizes.table"))),
      leading_(static_cast<float>(text.number("leading"))),
      id_(std::move(report_id)) {
  new_page();
}

void Flow::new_page() {
  doc_.new_page(width_, height_);
  ++page_;
  float small = static_cast<float>(text_.number("sizes.small"));
  std::string footer = fill(text_.get("footer"), {{"id", id_}, {"page", std::to_string(page_)}});
  doc_.line(margin_, margin_ - 10, width_ - margin_, margin_ - 10, 0.4f,
            static_cast<float>(text_.number("greys.rule")));
  doc_.text(margin_, margin_ - 20, footer, small, Font::regular,
            static_cast<float>(text_.number("greys.muted")));
  y_ = height_ - margin_;
}

void Flow::ensure(float height) {
  if (y_ - height < margin_) new_page();
}

float Flow::reserve(float height) {
  ensure(height);
  float top = y_;
  y_ -= height;
  return top;
}

std::vector<std::string> Flow::wrap(const std::string& s, float max_width, float size, Font font) {
  std::vector<std::string> lines;
  std::string line, word;
  auto flush_word = [&]() {
    if (word.empty()) return;
    std::string candidate = line.empty() ? word : line + " " + word;
    if (!line.empty() && doc_.text_width(candidate, size, font) > max_width) {
      lines.push_back(line);
      line = word;
    } else {
      line = candidate;
    }
    word.clear();
  };
  for (char c : s) {
    if (c == ' ' || c == '\n') {
      flush_word();
      if (c == '\n') {
        lines.push_back(line);
        line.clear();
      }
    } else {
      word += c;
    }
  }
  flush_word();
  if (!line.empty() || lines.empty()) lines.push_back(line);
  return lines;
}

void Flow::heading(const std::string& title) {
  float size = static_cast<float>(text_.number("sizes.heading"));
  ensure(size * 7);  // keep a heading with the first lines of what follows (no orphans)
  y_ -= size * 0.8f;
  doc_.text(margin_, y_ - size, title, size, Font::bold);
  y_ -= size * 1.3f;
  doc_.line(margin_, y_, width_ - margin_, y_, 0.8f);
  y_ -= size * 0.6f;
}

void Flow::paragraph(const std::string& s, Font font, float grey, float indent, float size) {
  if (size <= 0) size = body_;
  float lead = size * leading_;
  for (const auto& l : wrap(s, width() - indent, size, font)) {
    ensure(lead);
    doc_.text(margin_ + indent, y_ - size, l, size, font, grey);
    y_ -= lead;
  }
  y_ -= size * 0.4f;
}

void Flow::bullet(const std::string& s) {
  float lead = body_ * leading_;
  ensure(lead);
  doc_.text(margin_ + 2, y_ - body_, "\u2022", body_);
  paragraph(s, Font::regular, 0, 12);
}

void Flow::table(const std::vector<Column>& columns, const Row& header, const std::vector<Row>& rows) {
  float total = 0;
  for (const auto& c : columns) total += c.share;
  std::vector<float> x(columns.size() + 1, margin_);
  for (std::size_t i = 0; i < columns.size(); ++i) x[i + 1] = x[i] + width() * columns[i].share / total;
  const float pad = 3, size = table_size_, lead = size * leading_;
  const float rule = static_cast<float>(text_.number("greys.rule"));
  const float band = static_cast<float>(text_.number("greys.band"));
  const float void_grey = static_cast<float>(text_.number("greys.void"));

  auto layout_row = [&](const Row& row, bool is_header, std::vector<std::vector<std::string>>& cells) {
    std::size_t lines = 1;
    Font font = row.bold || is_header ? Font::bold : Font::regular;
    cells.clear();
    for (std::size_t i = 0; i < columns.size(); ++i) {
      std::string cell = i < row.cells.size() ? row.cells[i] : "";
      cells.push_back(wrap(cell, x[i + 1] - x[i] - 2 * pad, size, font));
      lines = std::max(lines, cells.back().size());
    }
    return static_cast<float>(lines) * lead + 2;
  };
  auto paint_row = [&](const Row& row, bool is_header) {
    std::vector<std::vector<std::string>> cells;
    float h = layout_row(row, is_header, cells);
    Font font = row.bold || is_header ? Font::bold : Font::regular;
    if (is_header) doc_.rect(margin_, y_ - h, width(), h, 0, band);
    float grey = row.struck ? void_grey : 0;
    for (std::size_t i = 0; i < columns.size(); ++i) {
      float ty = y_ - size - 1;
      for (const auto& l : cells[i]) {
        float tw = doc_.text_width(l, size, font);
        float tx = columns[i].right ? x[i + 1] - pad - tw : x[i] + pad;
        doc_.text(tx, ty, l, size, font, grey);
        if (row.struck && !l.empty()) {
          float mid = ty + size * 0.3f;
          doc_.line(tx, mid, tx + tw, mid, 0.6f, grey);
        }
        ty -= lead;
      }
    }
    y_ -= h;
    doc_.line(margin_, y_, width_ - margin_, y_, 0.3f, rule);
  };
  auto draw_row = [&](const Row& row) {
    std::vector<std::vector<std::string>> cells;
    float h = layout_row(row, false, cells);
    if (y_ - h < margin_) {
      new_page();
      paint_row(header, true);  // repeat the header so the columns stay readable
    }
    paint_row(row, false);
  };
  ensure(lead * 3);
  paint_row(header, true);
  for (const auto& r : rows) draw_row(r);
  y_ -= body_ * 0.8f;
}

void Flow::fields(const std::vector<std::pair<std::string, std::string>>& rows) {
  const float size = body_, lead = size * leading_;
  // Label column as wide as the widest label (bold), within 18-40 % of the text width.
  float widest = 0;
  for (const auto& row : rows) widest = std::max(widest, doc_.text_width(row.first, size, Font::bold));
  const float label_w = std::clamp(widest + 12, width() * 0.18f, width() * 0.40f);
  for (const auto& [label, value] : rows) {
    auto lines = wrap(value, width() - label_w, size, Font::regular);
    ensure(lead * static_cast<float>(lines.size()));
    doc_.text(margin_, y_ - size, label, size, Font::bold);
    for (const auto& l : lines) {
      doc_.text(margin_ + label_w, y_ - size, l, size, Font::regular);
      y_ -= lead;
    }
  }
  y_ -= size * 0.5f;
}

}  // namespace sp::report
