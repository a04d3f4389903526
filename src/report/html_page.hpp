#pragma once
/// The frame every HTML report shares: one self-contained XHTML-clean page (inline stylesheet
/// with a print section, no script, no external resource), the verdict banner, key-figure
/// cards, tables, figures and the Cautions box. Numbers that also appear in the JSON result
/// are marked with data-key="<path in the JSON result>" so that tests can compare the two.
#include <string>
#include <vector>

namespace sortie::report::html {

/// Text escaped for element content and attribute values.
std::string esc(const std::string& s);

/// `<span data-key="key">text</span>`: a printed number tied to a JSON path ("landing.soc",
/// "rules.soc_min.actual", "phases.3.energy_Wh"). The text is escaped. A number printed without
/// its unit (in a table whose header names it) gives the unit as `unit`: data-unit="%" says
/// the JSON holds the fraction of the percentage shown.
std::string keyed(const std::string& key, const std::string& text, const std::string& unit = "");
/// The same for a number shown in another unit than the JSON's: data-scale="1000" says the
/// printed number is the JSON value times 1000 (mV for V, mΩ for Ω).
std::string keyed_scaled(const std::string& key, const std::string& text, double scale);

/// One table cell: HTML content (already escaped), right-aligned when a number.
struct Cell {
  std::string html;
  bool number = false;
  std::string css;  ///< extra class ("pass", "fail")
};
Cell text_cell(const std::string& text);
Cell number_cell(const std::string& text, const std::string& key = "", const std::string& unit = "");
Cell scaled_cell(const std::string& text, const std::string& key, double scale);
Cell html_cell(std::string html, bool number = false, std::string css = "");

class Table {
 public:
  /// Column titles, each naming its unit ("energy Wh"); numeric columns are right-aligned.
  explicit Table(std::vector<std::string> header, std::vector<bool> numeric = {})
      : header_(std::move(header)), numeric_(std::move(numeric)) {}
  void add_row(std::vector<Cell> cells, std::string row_class = "") {
    rows_.push_back({std::move(cells), std::move(row_class)});
  }
  std::string render() const;

 private:
  struct Row {
    std::vector<Cell> cells;
    std::string css;
  };
  std::vector<std::string> header_;
  std::vector<bool> numeric_;
  std::vector<Row> rows_;
};

/// A key figure: a label, the value (HTML, usually keyed()) and a smaller line under it.
struct Card {
  std::string label;
  std::string value_html;
  std::string more;
  bool alert = false;
};
std::string cards(const std::vector<Card>& items);

/// The verdict at the top: the word (GO / NO-GO) large, the sentence beside it. `line` is the
/// whole verdict sentence ("GO: ..."); it is shown whole and marked with `key` (none if empty).
std::string verdict_banner(bool go, const std::string& line, const std::string& key);

/// A plot with its caption and an optional note under it.
std::string figure(const std::string& caption, const std::string& svg, const std::string& note = "");

/// Lines of "label: value" as a definition list (setup of the run); values are text.
std::string facts(const std::vector<std::pair<std::string, std::string>>& items);
/// The same with values already in HTML (holding keyed() numbers).
std::string facts_html(const std::vector<std::pair<std::string, std::string>>& items);

/// The Cautions box every report carries.
std::string cautions();

class Page {
 public:
  /// `title` heads the page; `subtitle` says what produced it.
  Page(std::string title, std::string subtitle) : title_(std::move(title)), subtitle_(std::move(subtitle)) {}
  /// Raw HTML placed in order (a banner, a figure grid).
  void add(std::string html) { body_ += std::move(html); }
  /// A boxed section with a heading.
  void section(const std::string& heading, const std::string& html, const std::string& css = "");
  /// The whole document: doctype, head with the stylesheet, body, Cautions box, footer.
  std::string render() const;

 private:
  std::string title_, subtitle_, body_;
};

}  // namespace sortie::report::html
