#include "report/text_table.hpp"

#include "core/text.hpp"

#include <algorithm>
#include <cmath>
#include <regex>
#include <cstdio>

namespace sortie::report {

std::string fixed(double v, int digits) { return format_fixed(v, digits); }

std::size_t display_width(const std::string& s) {
  std::size_t n = 0;
  for (unsigned char c : s)
    if ((c & 0xC0) != 0x80) ++n;
  return n;
}

namespace {
std::string pad(const std::string& s, std::size_t w, bool left) {
  const std::size_t d = display_width(s);
  const std::string fill(w > d ? w - d : 0, ' ');
  return left ? s + fill : fill + s;
}
}  // namespace

namespace {
/// A number-like cell ("12.5", "-0.3", "+26.0 %", "739/800", "-"): right-aligned.
bool numeric(const std::string& s) {
  if (s.empty() || s == "-") return true;
  static const std::regex number(R"(^[+-]?[0-9.]+(e[+-][0-9]+)?(/[0-9.]+)?( ?[%A-Za-z]{1,3})?$)");
  return std::regex_match(s, number);
}
}  // namespace

namespace {
/// Lines of at most `width` display columns, broken at spaces (a longer word stays whole).
std::vector<std::string> wrap_text(const std::string& s, std::size_t width) {
  std::vector<std::string> lines;
  std::string line;
  std::size_t p = 0;
  while (p <= s.size()) {
    const auto e = std::min(s.find(' ', p), s.size());
    const std::string word = s.substr(p, e - p);
    if (!line.empty() && display_width(line) + 1 + display_width(word) > width) {
      lines.push_back(line);
      line.clear();
    }
    line += (line.empty() ? "" : " ") + word;
    p = e + 1;
  }
  if (!line.empty() || lines.empty()) lines.push_back(line);
  return lines;
}
}  // namespace

std::string TextTable::render(const std::string& indent) const {
  if (wrap_ > 0 && !header_.empty()) {
    // Continuation lines carry the rest of the last column, with the other columns empty.
    TextTable t(header_);
    for (const auto& r : rows_) {
      if (r.size() < header_.size()) {
        t.add_row(r);
        continue;
      }
      const auto parts = wrap_text(r.back(), wrap_);
      std::vector<std::string> first = r;
      first.back() = parts.front();
      t.add_row(first);
      for (std::size_t k = 1; k < parts.size(); ++k) {
        std::vector<std::string> more(header_.size(), "");
        more.back() = parts[k];
        t.add_row(more);
      }
    }
    return t.render(indent);
  }
  // Text columns are left-aligned, number columns right-aligned; the first is always text.
  std::vector<bool> left(header_.size(), false);
  left[0] = true;
  for (const auto& r : rows_)
    for (std::size_t c = 0; c < r.size() && c < left.size(); ++c)
      if (!numeric(r[c])) left[c] = true;
  std::vector<std::size_t> w(header_.size(), 0);
  for (std::size_t c = 0; c < header_.size(); ++c) w[c] = display_width(header_[c]);
  for (const auto& r : rows_)
    for (std::size_t c = 0; c < r.size() && c < w.size(); ++c) w[c] = std::max(w[c], display_width(r[c]));
  auto line = [&](const std::vector<std::string>& cells) {
    std::string out = indent;
    for (std::size_t c = 0; c < w.size(); ++c) {
      const std::string cell = c < cells.size() ? cells[c] : "";
      out += pad(cell, w[c], left[c]);
      if (c + 1 < w.size()) out += "  ";
    }
    while (!out.empty() && out.back() == ' ') out.pop_back();
    return out + "\n";
  };
  std::string out = line(header_);
  std::size_t total = 0;
  for (auto x : w) total += x;
  out += indent + std::string(total + 2 * (w.size() - 1), '-') + "\n";
  for (const auto& r : rows_) out += line(r);
  return out;
}

void TextTable::add_row(std::vector<std::string> cells) {
  for (auto& c : cells) c = printable(c);
  rows_.push_back(std::move(cells));
}

void KeyValues::add(std::string key, std::string value) { items_.emplace_back(std::move(key), printable(value)); }

std::string KeyValues::render(const std::string& indent) const {
  std::size_t w = 0;
  for (const auto& [k, v] : items_) w = std::max(w, display_width(k));
  std::string out;
  for (const auto& [k, v] : items_) out += indent + pad(k, w, true) + "  " + v + "\n";
  return out;
}

}  // namespace sortie::report
