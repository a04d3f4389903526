#include "report/html_page.hpp"

#include <cstdio>

#include "report/svg_plot.hpp"

namespace sortie::report::html {

namespace {

// The stylesheet: screen first (a 1240 px column that suits a 1280 px screen), then print
// (A4, white paper, no boxes, no page break inside a plot or a table row). No '<' or '&' in
// it, so the page stays well-formed XML.
const char* kStyle = R"CSS(
:root { --ink: #1d2733; --muted: #5b6673; --rule: #d5dbe1; --paper: #ffffff; --back: #f1f0eb;
        --go: #1f7a4a; --nogo: #b23a48; --accent: #0b6e8a; --warn: #b07212; }
* { box-sizing: border-box; }
html { background: var(--back); }
body { margin: 0; color: var(--ink); font: 15px/1.45 "DejaVu Sans", "Liberation Sans", Arial, sans-serif; }
main { max-width: 1240px; margin: 0 auto; padding: 22px 20px 36px; }
header h1 { font-size: 23px; margin: 0 0 2px; }
header p { color: var(--muted); margin: 0 0 14px; font-size: 14px; }
section { background: var(--paper); border: 1px solid var(--rule); border-radius: 6px; padding: 14px 18px 16px; margin: 0 0 16px; }
h2 { font-size: 17px; margin: 0 0 10px; }
.verdict { display: flex; gap: 20px; align-items: center; padding: 16px 22px; border-radius: 6px; color: #ffffff; margin: 0 0 16px; }
.verdict.go { background: var(--go); }
.verdict.nogo { background: var(--nogo); }
.verdict .word { font-size: 34px; font-weight: bold; letter-spacing: 0.04em; white-space: nowrap; border: 3px solid #ffffff; border-radius: 5px; padding: 2px 14px; }
.verdict p { margin: 0; font-size: 17px; line-height: 1.4; }
.cards { display: grid; grid-template-columns: repeat(auto-fit, minmax(150px, 1fr)); gap: 10px; margin: 0 0 16px; }
.card { border-left: 4px solid var(--accent); background: #f5f8f9; padding: 7px 12px 8px; }
.card.alert { border-left-color: var(--nogo); background: #fbeff1; }
.card .label { font-size: 13px; color: var(--muted); }
.card .value { font-size: 22px; font-weight: bold; white-space: nowrap; }
.card .more { font-size: 13px; color: var(--muted); }
.scroll { overflow-x: auto; }
table { border-collapse: collapse; width: 100%; font-size: 14px; }
table.wide { font-size: 13px; }
th, td { padding: 4px 8px; border-bottom: 1px solid var(--rule); text-align: left; vertical-align: top; }
th { background: #e9eef2; font-weight: bold; font-size: 12.5px; vertical-align: bottom; }
td:first-child { white-space: nowrap; }
td.n { text-align: right; white-space: nowrap; font-variant-numeric: tabular-nums; }
th.n { text-align: right; }
th .unit { font-weight: normal; color: var(--muted); }
td.pass { color: var(--go); font-weight: bold; }
td.fail { color: var(--nogo); font-weight: bold; }
tr.fail td { background: #fbeff1; }
tr.muted td { color: var(--muted); }
figure { margin: 0 0 14px; }
figure:last-child { margin-bottom: 0; }
figcaption { font-weight: bold; margin: 0 0 4px; }
p.note { font-size: 13px; color: var(--muted); margin: 6px 0 0; }
svg.plot { display: block; width: 100%; height: auto; }
.grid3 { display: grid; grid-template-columns: repeat(3, minmax(0, 1fr)); gap: 14px; }
.grid2 { display: grid; grid-template-columns: repeat(2, minmax(0, 1fr)); gap: 14px; }
dl.facts { display: grid; grid-template-columns: max-content 1fr; gap: 3px 16px; margin: 0; }
dl.facts dt { color: var(--muted); }
dl.facts dd { margin: 0; }
ul.events { margin: 0; padding-left: 20px; }
.cautions { border: 2px solid var(--warn); background: #fff8ea; }
.cautions h2 { color: #7d5108; }
.cautions ul { margin: 0; padding-left: 20px; }
.cautions li { margin: 0 0 3px; }
footer { color: var(--muted); font-size: 13px; }
@page { size: A4; margin: 12mm; }
@media print {
  html, body { background: #ffffff; }
  body { font-size: 10pt; }
  main { max-width: none; padding: 0; }
  section { border: none; border-radius: 0; padding: 0; margin: 0 0 6mm; }
  figure, tr, .cards, .verdict, .cautions { break-inside: avoid; }
  h2 { break-after: avoid; }
  .scroll { overflow: visible; }
  table { font-size: 8pt; }
  table.wide { font-size: 7pt; }
  th, td { padding: 2px 4px; }
  td:first-child { white-space: normal; }
  svg.plot .ticks, svg.plot .levels { font-size: 17px; }
  svg.plot .axis-labels { font-size: 18px; }
  .grid3, .grid2 { gap: 4mm; }
  .verdict, .card, th, tr.fail td, .cautions { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
  .cautions { border: 1.5pt solid var(--warn); padding: 3mm 4mm; }
}
)CSS";

std::string class_attr(const std::string& css) { return css.empty() ? "" : " class=\"" + esc(css) + "\""; }

}  // namespace

std::string esc(const std::string& s) { return svg::escape(s); }

std::string keyed(const std::string& key, const std::string& text, const std::string& unit) {
  return "<span data-key=\"" + esc(key) + "\"" + (unit.empty() ? "" : " data-unit=\"" + esc(unit) + "\"") + ">" +
         esc(text) + "</span>";
}

std::string keyed_scaled(const std::string& key, const std::string& text, double scale) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%g", scale);
  return "<span data-key=\"" + esc(key) + "\" data-scale=\"" + buf + "\">" + esc(text) + "</span>";
}

Cell scaled_cell(const std::string& text, const std::string& key, double scale) {
  return {keyed_scaled(key, text, scale), true, ""};
}

Cell text_cell(const std::string& text) { return {esc(text), false, ""}; }
Cell number_cell(const std::string& text, const std::string& key, const std::string& unit) {
  return {key.empty() ? esc(text) : keyed(key, text, unit), true, ""};
}
Cell html_cell(std::string html, bool number, std::string css) { return {std::move(html), number, std::move(css)}; }

std::string Table::render() const {
  std::vector<bool> numeric = numeric_;
  numeric.resize(header_.size(), false);
  for (const auto& r : rows_)
    for (std::size_t c = 0; c < r.cells.size() && c < numeric.size(); ++c)
      if (r.cells[c].number) numeric[c] = true;
  std::string o = std::string("<div class=\"scroll\"><table") + (header_.size() > 8 ? " class=\"wide\"" : "") +
                  ">\n<thead><tr>";
  for (std::size_t c = 0; c < header_.size(); ++c) {
    // A number column's title ends in its unit: the unit goes on a line of its own.
    const auto& h = header_[c];
    const auto space = h.rfind(' ');
    if (numeric[c] && space != std::string::npos)
      o += "<th class=\"n\">" + esc(h.substr(0, space)) + "<br/><span class=\"unit\">" + esc(h.substr(space + 1)) +
           "</span></th>";
    else
      o += "<th" + class_attr(numeric[c] ? "n" : "") + ">" + esc(h) + "</th>";
  }
  o += "</tr></thead>\n<tbody>\n";
  for (const auto& r : rows_) {
    o += "<tr" + class_attr(r.css) + ">";
    for (std::size_t c = 0; c < r.cells.size(); ++c) {
      const auto& cell = r.cells[c];
      std::string css = cell.number ? "n" : "";
      if (!cell.css.empty()) css += (css.empty() ? "" : " ") + cell.css;
      o += "<td" + class_attr(css) + ">" + cell.html + "</td>";
    }
    o += "</tr>\n";
  }
  return o + "</tbody>\n</table></div>\n";
}

std::string cards(const std::vector<Card>& items) {
  std::string o = "<div class=\"cards\">\n";
  for (const auto& c : items) {
    o += std::string("<div class=\"card") + (c.alert ? " alert" : "") + "\"><div class=\"label\">" + esc(c.label) +
         "</div><div class=\"value\">" + c.value_html + "</div>";
    if (!c.more.empty()) o += "<div class=\"more\">" + esc(c.more) + "</div>";
    o += "</div>\n";
  }
  return o + "</div>\n";
}

std::string verdict_banner(bool go, const std::string& line, const std::string& key) {
  // The sentence is shown whole (so it equals the JSON verdict_text); its lead word is bold.
  const auto colon = line.find(": ");
  std::string sentence;
  if (colon != std::string::npos)
    sentence = "<span class=\"lead\">" + esc(line.substr(0, colon + 1)) + "</span>" + esc(line.substr(colon + 1));
  else
    sentence = esc(line);
  return std::string("<div class=\"verdict ") + (go ? "go" : "nogo") + "\"><div class=\"word\">" +
         (go ? "GO" : "NO-GO") + "</div><p" + (key.empty() ? "" : " data-key=\"" + esc(key) + "\"") + ">" + sentence +
         "</p></div>\n";
}

std::string figure(const std::string& caption, const std::string& svg, const std::string& note) {
  std::string o = "<figure>\n<figcaption>" + esc(caption) + "</figcaption>\n" + svg;
  if (!note.empty()) o += "<p class=\"note\">" + esc(note) + "</p>\n";
  return o + "</figure>\n";
}

std::string facts_html(const std::vector<std::pair<std::string, std::string>>& items) {
  std::string o = "<dl class=\"facts\">\n";
  for (const auto& [k, v] : items) o += "<dt>" + esc(k) + "</dt><dd>" + v + "</dd>\n";
  return o + "</dl>\n";
}

std::string facts(const std::vector<std::pair<std::string, std::string>>& items) {
  auto escaped = items;
  for (auto& kv : escaped) kv.second = esc(kv.second);
  return facts_html(escaped);
}

std::string cautions() {
  return "<section class=\"cautions\">\n<h2>Cautions</h2>\n<ul>\n"
         "<li>This report is an estimate computed from models of the aircraft, the drive and the pack. It is not a "
         "certificate of airworthiness and not a clearance to fly. Real packs, propellers and air differ from their "
         "models: check the figures against your own flights.</li>\n"
         "<li>Lithium packs can burn. Charge them only with a charger set to their chemistry and cell count, on a "
         "fire-proof surface, and never leave them charging unwatched. Store and carry them part-charged in a "
         "fire-resistant container. Retire a pack that is swollen, dented, hot or smells.</li>\n"
         "<li>Keep the reserve. Flying a pack below its reserve or its cutoff voltage over-discharges the cells: it "
         "ages them, can damage them for good, and leaves no margin for wind, cold or a go-around. Do not recharge a "
         "pack that was run flat without checking every cell.</li>\n"
         "<li>Cold packs, old packs and packs not fully charged give less than the figures here.</li>\n"
         "<li>Follow the aviation rules where you fly and the limits that the makers of the aircraft, the pack, the "
         "motors and the ESCs set, wherever they are stricter than this report.</li>\n"
         "</ul>\n</section>\n";
}

void Page::section(const std::string& heading, const std::string& html, const std::string& css) {
  body_ += "<section" + class_attr(css) + ">\n";
  if (!heading.empty()) body_ += "<h2>" + esc(heading) + "</h2>\n";
  body_ += html + "</section>\n";
}

std::string Page::render() const {
  std::string o = "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\"/>\n";
  o += "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\"/>\n";
  o += "<title>" + esc(title_) + "</title>\n<style>" + kStyle + "</style>\n</head>\n<body>\n<main>\n";
  o += "<header><h1>" + esc(title_) + "</h1><p>" + esc(subtitle_) + "</p></header>\n";
  o += body_;
  o += cautions();
  o += "<footer><p>Made by sortie " + esc(SORTIE_VERSION) +
       ". An estimate from models, not a clearance to fly.</p></footer>\n";
  return o + "</main>\n</body>\n</html>\n";
}

}  // namespace sortie::report::html
