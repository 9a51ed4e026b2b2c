// Flowing page layout for the weigh-report: headings, wrapped paragraphs and ruled tables,
// top to bottom, starting a new page when the current one is full. Each page gets a footer
// with the report id and page number. All sizes in PDF points.
#pragma once
#include <string>
#include <vector>

#include "report/pdf_doc.h"
#include "report/report_text.h"

namespace sp::report {

struct Column {
  float share = 1;     // relative width
  bool right = false;  // right-aligned (numbers)
};

struct Row {
  std::vector<std::string> cells;
  bool bold = false;
  bool struck = false;  // voided: drawn grey with a line through
};

class Flow {
 public:
  Flow(PdfDocument& doc, const ReportText& text, float page_width, float page_height,
       std::string report_id);
  void heading(const std::string& title);
  void paragraph(const std::string& text, Font font = Font::regular, float grey = 0,
                 float indent = 0, float size = 0);
  void bullet(const std::string& text);
  void table(const std::vector<Column>& columns, const Row& header, const std::vector<Row>& rows);
  // Two columns: bold label, value; wraps the value.
  void fields(const std::vector<std::pair<std::string, std::string>>& rows);
  // Makes room for a box of `height`, starting a page if needed; returns the box's top y.
  float reserve(float height);
  void gap(float points) { y_ -= points; }
  // Starts a new page unless `height` points are left (keeps a heading with its picture).
  void need(float height) { ensure(height); }

  float left() const { return margin_; }
  float width() const { return width_ - 2 * margin_; }
  PdfDocument& doc() { return doc_; }
  const ReportText& text() const { return text_; }

  // Greedy word wrap of `s` to `max_width` at `size`.
  std::vector<std::string> wrap(const std::string& s, float max_width, float size, Font font);

 private:
  void new_page();
  void ensure(float height);

  PdfDocument& doc_;
  const ReportText& text_;
  float width_, height_, margin_;
  float body_, table_size_, leading_;
  std::string id_;
  int page_ = 0;
  float y_ = 0;
};

}  // namespace sp::report
